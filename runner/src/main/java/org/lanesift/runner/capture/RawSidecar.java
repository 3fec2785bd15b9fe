package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import org.lanesift.time.Femtos;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import org.lanesift.json.JsonParseException;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;

/**
 * The JSON sidecar of a raw binary capture, checked field by field (see docs/capture-raw.md). The
 * text is read by the project's one JSON reader ({@link JsonReader}), with its limits.
 */
final class RawSidecar {
    static final int MAX_CHANNELS = 1024;
    private static final Set<String> FIELDS = Set.of("rateHz", "format", "channels", "startTimeS", "markClipped");
    private static final Set<String> CHANNEL_FIELDS = Set.of("name", "gain", "offset");

    enum Format {
        UINT8("uint8", 1), INT8("int8", 1), INT16LE("int16le", 2), INT16BE("int16be", 2), FLOAT32LE("float32le", 4);

        final String text;
        final int bytes;

        Format(String text, int bytes) {
            this.text = text;
            this.bytes = bytes;
        }
    }

    Path path;
    double rateHz;
    Format format;
    String[] names;
    double[] gain;
    double[] offset;
    double startTimeS;
    boolean markClipped = true;

    static RawSidecar read(Path sidecar) {
        RawSidecar s = new RawSidecar();
        s.path = sidecar;
        JsonValue root;
        CaptureFormatException.requireRegular(sidecar);
        try {
            root = JsonReader.read(sidecar, String.valueOf(sidecar.getFileName() == null ? sidecar : sidecar.getFileName()));
        } catch (JsonParseException e) {
            throw new CaptureFormatException(sidecar, e);
        } catch (NoSuchFileException e) {
            throw new CaptureFormatException(sidecar, 0, "sidecar not found; a raw capture needs a JSON sidecar with rateHz, format"
                    + " and channels (option 'sidecar' names another path)");
        } catch (IOException e) {
            throw new CaptureFormatException(sidecar, 0, "cannot read: " + e.getMessage(), e);
        }
        if (!root.isObject()) {
            throw s.bad("", "expected a JSON object");
        }
        for (String f : root.members().keySet()) {
            if (!FIELDS.contains(f)) {
                throw s.bad("/" + f, "unknown field; expected one of rateHz, format, channels, startTimeS, markClipped");
            }
        }
        JsonValue rate = root.get("rateHz");
        if (rate == null || !rate.isNumber()) {
            throw s.bad("/rateHz", "expected a positive number of samples per second" + (rate == null ? ", missing" : ", found " + rate.describe()));
        }
        s.rateHz = rate.asDouble();
        if (!(s.rateHz > 0) || !Double.isFinite(s.rateHz)) {
            throw s.bad("/rateHz", "expected a positive number of samples per second, found " + rate);
        }
        if (s.rateHz > Femtos.MAX_RATE_HZ) {
            throw s.bad("/rateHz", "found " + rate + ", a sample period below 1 fs (the time base's step); expected at most 1e15"
                    + " samples per second");
        }
        JsonValue fmt = root.get("format");
        if (fmt == null || !fmt.isString()) {
            throw s.bad("/format", "expected one of uint8, int8, int16le, int16be, float32le" + (fmt == null ? ", missing" : ", found " + fmt));
        }
        for (Format f : Format.values()) {
            if (f.text.equals(fmt.asString())) {
                s.format = f;
            }
        }
        if (s.format == null) {
            throw s.bad("/format", "unknown format " + fmt + "; expected one of uint8, int8, int16le, int16be, float32le");
        }
        JsonValue start = root.get("startTimeS");
        if (start != null) {
            if (!start.isNumber() || !Double.isFinite(start.asDouble()) || Math.abs(start.asDouble()) > 1e3) {
                throw s.bad("/startTimeS", "expected a number of seconds within +/-1000, found " + start);
            }
            s.startTimeS = start.asDouble();
        }
        JsonValue mc = root.get("markClipped");
        if (mc != null) {
            if (!mc.isBoolean()) {
                throw s.bad("/markClipped", "expected true or false, found " + mc);
            }
            s.markClipped = mc.asBoolean();
        }
        JsonValue chs = root.get("channels");
        if (chs == null || !chs.isArray() || chs.elements().isEmpty()) {
            throw s.bad("/channels", "expected a non-empty array of {name, gain, offset}" + (chs == null ? ", missing" : ""));
        }
        if (chs.elements().size() > MAX_CHANNELS) {
            throw s.bad("/channels", chs.elements().size() + " channels; at most " + MAX_CHANNELS + " are supported");
        }
        int n = chs.elements().size();
        s.names = new String[n];
        s.gain = new double[n];
        s.offset = new double[n];
        List<String> raw = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            JsonValue c = chs.elements().get(i);
            String p = "/channels/" + i;
            if (!c.isObject()) {
                throw s.bad(p, "expected an object {name, gain, offset}");
            }
            for (String f : c.members().keySet()) {
                if (!CHANNEL_FIELDS.contains(f)) {
                    throw s.bad(p + "/" + f, "unknown field; expected name, gain, offset");
                }
            }
            JsonValue name = c.get("name");
            if (name == null || !name.isString() || name.asString().isBlank()) {
                throw s.bad(p + "/name", "expected a channel name");
            }
            raw.add(name.asString());
            s.gain[i] = number(s, c, p, "gain", 1);
            s.offset[i] = number(s, c, p, "offset", 0);
            if (s.gain[i] == 0) {
                throw s.bad(p + "/gain", "expected a non-zero number of volts per code");
            }
            // every code of the format must give a finite voltage in the float samples
            double maxCode = s.format == Format.FLOAT32LE ? 1 : 32768;
            if (Math.abs(s.gain[i]) < 1e-30 || Math.abs(s.gain[i]) * maxCode > 1e30) {
                throw s.bad(p + "/gain", "found " + s.gain[i] + "; expected volts per code between 1e-30 and " + (1e30 / maxCode)
                        + " in magnitude");
            }
            if (Math.abs(s.offset[i]) > 1e30) {
                throw s.bad(p + "/offset", "found " + s.offset[i] + "; expected volts within +/-1e30");
            }
        }
        s.names = Names.ports(raw).toArray(String[]::new);
        return s;
    }

    private static double number(RawSidecar s, JsonValue c, String p, String f, double def) {
        JsonValue v = c.get(f);
        if (v == null) {
            return def;
        }
        if (!v.isNumber() || !Double.isFinite(v.asDouble())) {
            throw s.bad(p + "/" + f, "expected a finite number, found " + v);
        }
        return v.asDouble();
    }

    private CaptureFormatException bad(String pointer, String msg) {
        return new CaptureFormatException(path, 0, (pointer.isEmpty() ? "at the top level" : pointer) + ": " + msg);
    }

    int frameBytes() {
        return names.length * format.bytes;
    }
}
