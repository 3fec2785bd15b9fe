package org.lanesift.plugins.packetlink;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.Consumer;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Frame;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;

/**
 * Rebuilds pictures from packets, in both ways a host feeds a panel:
 *
 * <ul>
 * <li><b>Video mode</b>: every line starts with a vertical-sync start, vertical-sync end or
 * horizontal-sync start packet; lines carrying a packed pixel stream packet (16-bit RGB565,
 * 18-bit RGB666 packed or loose, 24-bit RGB888) are the active lines. A frame runs from one
 * vertical-sync start to the next.</li>
 * <li><b>Command mode</b>: the address window (set_column_address, set_page_address) and the
 * pixel format (set_pixel_format) set where and how write_memory_start / write_memory_continue
 * payloads land in a frame memory; each write_memory_start after pixels were written closes a
 * frame.</li>
 * </ul>
 *
 * <p>Pixel byte orders (MIPI DSI / DCS, from memory): video 16-bit is a little-endian word with red
 * in bits 4:0, green 10:5, blue 15:11 (red first on the wire); 18-bit packed is 18 bits per pixel,
 * red first, least significant bit first; 18-bit loose and command-mode 18-bit put each colour in
 * bits 7:2 of its own byte, red first; 24-bit is red, green, blue bytes; command-mode 16-bit is
 * big-endian RGB565 (red in bits 15:11). Frames larger than {@code maxPixels} are refused with an
 * error annotation, never allocated.
 */
final class FrameAssembler {
    /** One frame's timing row. */
    static final class Timing {
        long index;
        String mode;
        long startFs;
        long endFs;
        long nextStartFs = -1;
        int width;
        int height;
        int lines;
        int vsyncLines = -1;
        int backPorchLines = -1;
        int frontPorchLines = -1;
        double linePeriodFs = Double.NaN;
        double hsyncFs = Double.NaN;
        double pixelPacketFs = Double.NaN;
        int[] window;
        boolean suspect;
    }

    private final String channel;
    private final long maxPixels;
    private final Consumer<Frame> frames;
    private final Consumer<Annotation> notes;
    final List<Timing> timings = new ArrayList<>();
    private long frameIndex;

    // video mode
    private boolean videoOpen;
    private boolean videoPartial;
    private long videoStartFs;
    private int lines;
    private int vseLine = -1;
    private int firstActive = -1;
    private int lastActive = -1;
    private final List<int[]> rows = new ArrayList<>();
    private long rowsPixels;
    private long prevLineFs = -1;
    private double linePeriodSum;
    private int linePeriodN;
    private long hssFs = -1;
    private double hsyncSum;
    private int hsyncN;
    private double pixelSum;
    private int pixelN;
    private boolean videoSuspect;
    private boolean widthWarned;
    private long lastVideoFs;

    // command mode
    private int cs;
    private int ce = -1;
    private int ps;
    private int pe = -1;
    private int bpp = 24;
    private int[] fb = new int[0];
    private int fbW;
    private int fbH;
    private int x;
    private int y;
    private boolean written;
    private boolean cmdSuspect;
    private long cmdStartFs;
    private long cmdLastFs;
    private final byte[] carry = new byte[3];
    private int carryN;
    private boolean windowWarned;

    FrameAssembler(String channel, long maxPixels, Consumer<Frame> frames, Consumer<Annotation> notes) {
        this.channel = channel;
        this.maxPixels = maxPixels;
        this.frames = frames;
        this.notes = notes;
    }

    // ------------------------------------------------------------------ video mode

    void sync(int dt, long startFs, long endFs) {
        lastVideoFs = endFs;
        if (dt == DataTypes.VSYNC_START) {
            if (videoOpen) {
                closeVideo(startFs, false);
            }
            videoOpen = true;
            videoPartial = false;
            videoStartFs = startFs;
            lines = 0;
            vseLine = -1;
            firstActive = -1;
            lastActive = -1;
            rows.clear();
            rowsPixels = 0;
            videoSuspect = false;
            prevLineFs = -1;
            linePeriodSum = 0;
            linePeriodN = 0;
            hsyncSum = 0;
            hsyncN = 0;
            pixelSum = 0;
            pixelN = 0;
        }
        if (dt == DataTypes.VSYNC_START || dt == DataTypes.VSYNC_END || dt == DataTypes.HSYNC_START) {
            if (!videoOpen) {
                return;
            }
            if (dt == DataTypes.VSYNC_END) {
                vseLine = lines;
            }
            lines++;
            if (prevLineFs >= 0) {
                linePeriodSum += startFs - prevLineFs;
                linePeriodN++;
            }
            prevLineFs = startFs;
            hssFs = startFs;
        } else if (dt == DataTypes.HSYNC_END && hssFs >= 0 && videoOpen) {
            hsyncSum += startFs - hssFs;
            hsyncN++;
        }
    }

    void pixels(int dt, byte[] d, int off, int len, long startFs, long endFs, boolean suspect) {
        lastVideoFs = endFs;
        if (!videoOpen) {
            videoOpen = true;
            videoPartial = true;
            videoStartFs = startFs;
        }
        int[] row = decodeVideo(dt, d, off, len);
        if (rowsPixels + row.length > maxPixels) {
            notes.accept(Annotation.on("frames", "frame-too-large").span(startFs, endFs).severity(Severity.ERROR)
                    .label("frame exceeds " + maxPixels + " pixels; line dropped").build());
            return;
        }
        rows.add(row);
        rowsPixels += row.length;
        if (firstActive < 0) {
            firstActive = lines;
        }
        lastActive = lines;
        pixelSum += endFs - startFs;
        pixelN++;
        videoSuspect |= suspect;
    }

    static int[] decodeVideo(int dt, byte[] d, int off, int len) {
        switch (dt) {
            case DataTypes.PIXELS_16 -> {
                int n = len / 2;
                int[] px = new int[n];
                for (int i = 0; i < n; i++) {
                    int w = (d[off + 2 * i] & 0xFF) | (d[off + 2 * i + 1] & 0xFF) << 8;
                    px[i] = rgb565(w & 31, w >> 5 & 63, w >> 11 & 31);
                }
                return px;
            }
            case DataTypes.PIXELS_18 -> {
                int n = len * 8 / 18;
                int[] px = new int[n];
                for (int i = 0; i < n; i++) {
                    int bit = i * 18;
                    long v = 0;
                    for (int k = 0; k < 4 && (bit >> 3) + k < len; k++) {
                        v |= (long) (d[off + (bit >> 3) + k] & 0xFF) << (8 * k);
                    }
                    v >>>= bit & 7;
                    px[i] = rgb666((int) (v & 63), (int) (v >> 6 & 63), (int) (v >> 12 & 63));
                }
                return px;
            }
            case DataTypes.PIXELS_18_LOOSE -> {
                int n = len / 3;
                int[] px = new int[n];
                for (int i = 0; i < n; i++) {
                    px[i] = rgb666((d[off + 3 * i] & 0xFF) >> 2, (d[off + 3 * i + 1] & 0xFF) >> 2, (d[off + 3 * i + 2] & 0xFF) >> 2);
                }
                return px;
            }
            default -> {
                int n = len / 3;
                int[] px = new int[n];
                for (int i = 0; i < n; i++) {
                    px[i] = (d[off + 3 * i] & 0xFF) << 16 | (d[off + 3 * i + 1] & 0xFF) << 8 | (d[off + 3 * i + 2] & 0xFF);
                }
                return px;
            }
        }
    }

    static int rgb565(int r, int g, int b) {
        return ((r << 3) | (r >> 2)) << 16 | ((g << 2) | (g >> 4)) << 8 | ((b << 3) | (b >> 2));
    }

    static int rgb666(int r, int g, int b) {
        return ((r << 2) | (r >> 4)) << 16 | ((g << 2) | (g >> 4)) << 8 | ((b << 2) | (b >> 4));
    }

    private void closeVideo(long nextStartFs, boolean atEnd) {
        videoOpen = false;
        if (rows.isEmpty()) {
            return;
        }
        int w = 0;
        for (int[] r : rows) {
            w = Math.max(w, r.length);
        }
        int h = rows.size();
        int[] rgb = new int[w * h];
        boolean uneven = false;
        for (int r = 0; r < h; r++) {
            int[] row = rows.get(r);
            uneven |= row.length != w;
            System.arraycopy(row, 0, rgb, r * w, row.length);
        }
        if (uneven && !widthWarned) {
            widthWarned = true;
            notes.accept(Annotation.on("frames", "line-length-uneven").span(videoStartFs, nextStartFs).severity(Severity.WARNING)
                    .label("pixel lines of unequal length; short lines padded black").build());
        }
        Timing t = new Timing();
        t.index = frameIndex;
        t.mode = "video";
        t.startFs = videoStartFs;
        t.endFs = atEnd ? lastVideoFs : nextStartFs;
        t.nextStartFs = atEnd ? -1 : nextStartFs;
        t.width = w;
        t.height = h;
        t.lines = lines;
        if (vseLine >= 0) {
            t.vsyncLines = vseLine;
            if (firstActive >= 0) {
                t.backPorchLines = firstActive - 1 - vseLine;
            }
        }
        if (lastActive >= 0 && !atEnd) {
            t.frontPorchLines = lines - lastActive;
        }
        t.linePeriodFs = linePeriodN > 0 ? linePeriodSum / linePeriodN : Double.NaN;
        t.hsyncFs = hsyncN > 0 ? hsyncSum / hsyncN : Double.NaN;
        t.pixelPacketFs = pixelN > 0 ? pixelSum / pixelN : Double.NaN;
        t.suspect = videoSuspect;
        emit(new Frame(channel, t.startFs, t.endFs, frameIndex, w, h, rgb, videoPartial || atEnd, videoSuspect), t);
    }

    // ------------------------------------------------------------------ command mode

    void command(int cmd, byte[] p, int off, int n, long startFs, long endFs, boolean suspect) {
        switch (cmd) {
            case DcsCommands.COLUMN_ADDRESS -> {
                if (n >= 4) {
                    cs = (p[off] & 0xFF) << 8 | (p[off + 1] & 0xFF);
                    ce = (p[off + 2] & 0xFF) << 8 | (p[off + 3] & 0xFF);
                }
            }
            case DcsCommands.PAGE_ADDRESS -> {
                if (n >= 4) {
                    ps = (p[off] & 0xFF) << 8 | (p[off + 1] & 0xFF);
                    pe = (p[off + 2] & 0xFF) << 8 | (p[off + 3] & 0xFF);
                }
            }
            case DcsCommands.PIXEL_FORMAT -> {
                if (n >= 1 && DcsCommands.bitsPerPixel(p[off]) != 0) {
                    bpp = DcsCommands.bitsPerPixel(p[off]);
                }
            }
            case DcsCommands.MEMORY_WRITE -> {
                if (written) {
                    closeCommand(startFs, false);
                }
                if (!window(startFs)) {
                    return;
                }
                x = cs;
                y = ps;
                carryN = 0;
                cmdStartFs = startFs;
                write(p, off, n, endFs, suspect);
            }
            case DcsCommands.MEMORY_WRITE_CONTINUE -> {
                if (!written && fbW == 0) {
                    if (!window(startFs)) {
                        return;
                    }
                    x = cs;
                    y = ps;
                    cmdStartFs = startFs;
                }
                write(p, off, n, endFs, suspect);
            }
            default -> {
            }
        }
    }

    private boolean window(long atFs) {
        if (ce < cs || pe < ps) {
            if (!windowWarned) {
                windowWarned = true;
                notes.accept(Annotation.on("frames", "memory-window-unknown").span(atFs, atFs).severity(Severity.WARNING)
                        .label("memory write without a valid column/page address window; pixels not placed").build());
            }
            return false;
        }
        int w = Math.max(fbW, ce + 1);
        int h = Math.max(fbH, pe + 1);
        if ((long) w * h > maxPixels) {
            notes.accept(Annotation.on("frames", "frame-too-large").span(atFs, atFs).severity(Severity.ERROR)
                    .label("address window " + (ce + 1) + " x " + (pe + 1) + " exceeds " + maxPixels + " pixels").build());
            return false;
        }
        if (w != fbW || h != fbH) {
            int[] n = new int[w * h];
            for (int r = 0; r < fbH; r++) {
                System.arraycopy(fb, r * fbW, n, r * w, fbW);
            }
            fb = n;
            fbW = w;
            fbH = h;
        }
        return true;
    }

    private void write(byte[] p, int off, int n, long endFs, boolean suspect) {
        if (fbW == 0) {
            return;
        }
        int bpp8 = bpp == 16 ? 2 : 3;
        int i = off;
        int end = off + n;
        while (i < end || carryN == bpp8) {
            if (carryN < bpp8) {
                carry[carryN++] = p[i++];
                if (carryN < bpp8) {
                    continue;
                }
            }
            int rgb;
            if (bpp == 16) {
                int w = (carry[0] & 0xFF) << 8 | (carry[1] & 0xFF);
                rgb = rgb565(w >> 11 & 31, w >> 5 & 63, w & 31);
            } else if (bpp == 18) {
                rgb = rgb666((carry[0] & 0xFF) >> 2, (carry[1] & 0xFF) >> 2, (carry[2] & 0xFF) >> 2);
            } else {
                rgb = (carry[0] & 0xFF) << 16 | (carry[1] & 0xFF) << 8 | (carry[2] & 0xFF);
            }
            carryN = 0;
            fb[y * fbW + x] = rgb;
            written = true;
            if (++x > ce) {
                x = cs;
                if (++y > pe) {
                    y = ps;
                }
            }
        }
        cmdLastFs = endFs;
        cmdSuspect |= suspect;
    }

    private void closeCommand(long nextStartFs, boolean atEnd) {
        written = false;
        Timing t = new Timing();
        t.index = frameIndex;
        t.mode = "command";
        t.startFs = cmdStartFs;
        t.endFs = cmdLastFs;
        t.nextStartFs = atEnd ? -1 : nextStartFs;
        t.width = fbW;
        t.height = fbH;
        t.window = new int[] {cs, ce, ps, pe};
        t.suspect = cmdSuspect;
        emit(new Frame(channel, cmdStartFs, Math.max(cmdStartFs, cmdLastFs), frameIndex, fbW, fbH, Arrays.copyOf(fb, fb.length), false, cmdSuspect), t);
        cmdSuspect = false;
    }

    private void emit(Frame f, Timing t) {
        timings.add(t);
        frameIndex++;
        notes.accept(Annotation.on("frames", "frame").span(f.startFs(), f.endFs()).label(t.mode + " frame " + f.index() + ", " + f.width() + " x " + f.height())
                .severity(f.suspect() ? Severity.WARNING : Severity.INFO)
                .field("index", Field.integer(f.index(), "")).field("width", Field.integer(f.width(), "px"))
                .field("height", Field.integer(f.height(), "px")).field("mode", Field.enumValue(t.mode)).build());
        frames.accept(f);
    }

    void finish() {
        if (videoOpen) {
            closeVideo(lastVideoFs, true);
        }
        if (written) {
            closeCommand(-1, true);
        }
    }

    byte[] timingJson(String id) {
        JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull();
        j.beginObject().field("format", "lanesift-packet-timing/1").field("instance", id).name("frames").beginArray();
        double periodSum = 0;
        int periodN = 0;
        for (Timing t : timings) {
            j.beginObjectInline().field("index", t.index).field("mode", t.mode).field("startS", t.startFs * 1e-15)
                    .field("endS", t.endFs * 1e-15).name("periodS");
            if (t.nextStartFs < 0) {
                j.nullValue();
            } else {
                j.value((t.nextStartFs - t.startFs) * 1e-15);
            }
            j.field("width", t.width).field("height", t.height);
            if (t.mode.equals("video")) {
                j.field("linesTotal", t.lines);
                orNull(j, "vsyncLines", t.vsyncLines);
                orNull(j, "backPorchLines", t.backPorchLines);
                j.field("activeLines", t.height);
                orNull(j, "frontPorchLines", t.frontPorchLines);
                j.field("linePeriodS", t.linePeriodFs * 1e-15).field("hsyncS", t.hsyncFs * 1e-15)
                        .field("pixelPacketS", t.pixelPacketFs * 1e-15);
            } else {
                j.field("writeDurationS", (t.endFs - t.startFs) * 1e-15).name("window").beginObjectInline()
                        .field("columnStart", t.window[0]).field("columnEnd", t.window[1])
                        .field("pageStart", t.window[2]).field("pageEnd", t.window[3]).endObject();
            }
            j.field("suspect", t.suspect).endObject();
            if (t.nextStartFs >= 0) {
                periodSum += t.nextStartFs - t.startFs;
                periodN++;
            }
        }
        j.endArray().name("summary").beginObjectInline().field("frames", timings.size());
        Sourced.of(periodN == 0 ? Double.NaN : periodSum / periodN * 1e-15, "s", Source.measured("mean start-to-start time of"
                + " consecutive frames")).field(j, "meanFramePeriodS");
        Sourced.of(periodN == 0 ? Double.NaN : 1e15 * periodN / periodSum, "Hz", Source.derived("1 / mean frame period"))
                .field(j, "frameRateHz");
        j.endObject().endObject();
        return (j.finish() + "\n").getBytes(StandardCharsets.UTF_8);
    }

    /** A count that is negative when unknown: null then. */
    private static void orNull(JsonWriter j, String name, int v) {
        j.name(name);
        if (v < 0) {
            j.nullValue();
        } else {
            j.value(v);
        }
    }
}
