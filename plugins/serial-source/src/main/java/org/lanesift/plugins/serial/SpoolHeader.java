package org.lanesift.plugins.serial;

import java.io.IOException;
import java.nio.file.Path;
import java.util.Properties;

/**
 * What a spool holds: framed or raw stream, sample rate and format, and the device's identity
 * ({@code spool.properties}, docs/spool.md).
 *
 * @param framed   true for the framed device stream, false for raw sample bytes
 * @param rateHz   sample rate, Hz
 * @param channels logic channels, 1 to 8
 * @param model    device model, or empty
 * @param firmware firmware version, or empty
 */
public record SpoolHeader(boolean framed, double rateHz, int channels, String model, String firmware) {
    /**
     * Checks the values.
     *
     * @param framed framed or raw
     * @param rateHz sample rate, Hz
     * @param channels channel count
     * @param model model
     * @param firmware firmware
     */
    public SpoolHeader {
        if (!(rateHz > 0) || !Double.isFinite(rateHz)) {
            throw new DeviceException("sample rate must be positive, got " + rateHz + " Hz");
        }
        if (channels < 1 || channels > 8) {
            throw new DeviceException("channel count must be 1 to 8, got " + channels);
        }
    }

    void write(Path dir) throws IOException {
        write(dir, false);
    }

    /**
     * Writes the header; a provisional one (before the device has said its rate and channels)
     * carries {@code provisional=true}, and a spool follower waits for the final one.
     */
    void write(Path dir, boolean provisional) throws IOException {
        Properties p = new Properties();
        if (provisional) {
            p.setProperty("provisional", "true");
        }
        p.setProperty("version", "1");
        p.setProperty("mode", framed ? "framed" : "raw");
        p.setProperty("format", "logic8");
        p.setProperty("rateHz", Double.toString(rateHz));
        p.setProperty("channels", Integer.toString(channels));
        p.setProperty("model", model);
        p.setProperty("firmware", firmware);
        SpoolFiles.writeAtomically(dir.resolve(SpoolFiles.HEADER), p);
    }

    /** Whether the header in {@code dir} is still the provisional one written before the identification exchange. */
    static boolean isProvisional(Path dir) throws IOException {
        return "true".equals(SpoolFiles.read(dir.resolve(SpoolFiles.HEADER)).getProperty("provisional"));
    }

    static SpoolHeader read(Path dir) throws IOException {
        Path f = dir.resolve(SpoolFiles.HEADER);
        Properties p = SpoolFiles.read(f);
        String mode = p.getProperty("mode", "");
        if (!mode.equals("framed") && !mode.equals("raw")) {
            throw new DeviceException(f + ": field 'mode' must be 'framed' or 'raw', got '" + mode + "'");
        }
        if (!"logic8".equals(p.getProperty("format"))) {
            throw new DeviceException(f + ": field 'format' must be 'logic8', got '" + p.getProperty("format") + "'");
        }
        double rate;
        int ch;
        try {
            rate = Double.parseDouble(p.getProperty("rateHz", ""));
            ch = Integer.parseInt(p.getProperty("channels", ""));
        } catch (NumberFormatException e) {
            throw new DeviceException(f + ": fields 'rateHz' and 'channels' must be numbers");
        }
        try {
            return new SpoolHeader(mode.equals("framed"), rate, ch, p.getProperty("model", ""), p.getProperty("firmware", ""));
        } catch (DeviceException e) {
            throw new DeviceException(f + ": " + e.getMessage());
        }
    }
}
