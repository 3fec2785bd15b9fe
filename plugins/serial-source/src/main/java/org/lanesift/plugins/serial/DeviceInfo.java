package org.lanesift.plugins.serial;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/**
 * What a device says about itself in its IDENT frame (docs/device-stream.md, "IDENT payload").
 *
 * @param model        model name, at most 64 UTF-8 bytes
 * @param firmware     firmware version text, at most 64 UTF-8 bytes
 * @param channels     number of logic channels, 1 to 8
 * @param sampleFormat sample format code; {@link #FORMAT_LOGIC8} is the only one defined
 * @param ratesHz      supported sample rates in Hz, 1 to 32 entries
 */
public record DeviceInfo(String model, String firmware, int channels, int sampleFormat, long[] ratesHz) {
    /** One byte per sample time, bit k = channel k. */
    public static final int FORMAT_LOGIC8 = 1;

    /**
     * Encodes the IDENT payload.
     *
     * @return payload bytes
     */
    public byte[] encode() {
        byte[] m = model.getBytes(StandardCharsets.UTF_8);
        byte[] f = firmware.getBytes(StandardCharsets.UTF_8);
        if (m.length > 64 || f.length > 64 || ratesHz.length < 1 || ratesHz.length > 32) {
            throw new IllegalArgumentException("device info too large: model/firmware at most 64 bytes, 1..32 rates");
        }
        byte[] out = new byte[1 + m.length + 1 + f.length + 3 + 4 * ratesHz.length];
        int p = 0;
        out[p++] = (byte) m.length;
        System.arraycopy(m, 0, out, p, m.length);
        p += m.length;
        out[p++] = (byte) f.length;
        System.arraycopy(f, 0, out, p, f.length);
        p += f.length;
        out[p++] = (byte) channels;
        out[p++] = (byte) sampleFormat;
        out[p++] = (byte) ratesHz.length;
        for (long r : ratesHz) {
            Framing.putU32(out, p, (int) r);
            p += 4;
        }
        return out;
    }

    /**
     * Decodes an IDENT payload, checking every length against the payload.
     *
     * @param b   buffer
     * @param off payload start
     * @param len payload length
     * @return the info
     * @throws DeviceException naming the field that is out of bounds
     */
    public static DeviceInfo decode(byte[] b, int off, int len) {
        int p = off;
        int end = off + len;
        int ml = need(b, p++, end, "model length");
        if (ml > 64 || p + ml > end) {
            throw new DeviceException("IDENT payload: model length " + ml + " exceeds the payload or 64 bytes");
        }
        String model = new String(b, p, ml, StandardCharsets.UTF_8);
        p += ml;
        int fl = need(b, p++, end, "firmware length");
        if (fl > 64 || p + fl > end) {
            throw new DeviceException("IDENT payload: firmware length " + fl + " exceeds the payload or 64 bytes");
        }
        String fw = new String(b, p, fl, StandardCharsets.UTF_8);
        p += fl;
        int ch = need(b, p++, end, "channel count");
        int fmt = need(b, p++, end, "sample format");
        int nr = need(b, p++, end, "rate count");
        if (ch < 1 || ch > 8) {
            throw new DeviceException("IDENT payload: channel count " + ch + ", expected 1 to 8");
        }
        if (nr < 1 || nr > 32 || p + 4 * nr != end) {
            throw new DeviceException("IDENT payload: rate count " + nr + " does not match the " + (end - p) + " bytes left (expected 1 to 32 rates of 4 bytes)");
        }
        long[] rates = new long[nr];
        for (int i = 0; i < nr; i++) {
            rates[i] = Framing.u32(b, p) & 0xFFFFFFFFL;
            p += 4;
        }
        return new DeviceInfo(model, fw, ch, fmt, rates);
    }

    private static int need(byte[] b, int p, int end, String what) {
        if (p >= end) {
            throw new DeviceException("IDENT payload ends before the " + what);
        }
        return b[p] & 0xFF;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof DeviceInfo d && d.model.equals(model) && d.firmware.equals(firmware) && d.channels == channels
                && d.sampleFormat == sampleFormat && Arrays.equals(d.ratesHz, ratesHz);
    }

    @Override
    public int hashCode() {
        return model.hashCode() * 31 + Arrays.hashCode(ratesHz);
    }

    @Override
    public String toString() {
        return model + " fw " + firmware + ", " + channels + " ch, format " + sampleFormat + ", rates " + Arrays.toString(ratesHz) + " Hz";
    }
}
