package org.lanesift.runner.capture;

import java.util.HashMap;
import java.util.Map;

/**
 * Identifier codes to variables. A code of up to 9 printable characters is looked up by its
 * base-95 value, straight from the token bytes, so a value change allocates no string.
 */
final class VcdCodes {
    private final Map<Long, VcdSignal> shortCodes = new HashMap<>();
    private final Map<String, VcdSignal> longCodes = new HashMap<>();

    void put(String code, VcdSignal s) {
        long key = key(code);
        if (key >= 0) {
            shortCodes.put(key, s);
        } else {
            longCodes.put(code, s);
        }
    }

    /** The variable declared with this code, or null. */
    VcdSignal find(String code) {
        long k = key(code);
        return k >= 0 ? shortCodes.get(k) : longCodes.get(code);
    }

    /**
     * The variable whose code is the current token from byte {@code from} on.
     *
     * @throws CaptureFormatException naming the line when no such code was declared
     */
    VcdSignal find(VcdTokens tk, int from) {
        int n = tk.tokLen - from;
        VcdSignal s;
        if (n <= 9 && n > 0) {
            long k = 0;
            for (int i = from; i < tk.tokLen; i++) {
                k = k * 95 + ((tk.tok[i] & 0xff) - 32);
            }
            s = shortCodes.get(k);
        } else {
            s = n <= 0 ? null : longCodes.get(tk.text(from));
        }
        if (s == null) {
            throw tk.error("unknown identifier code '" + (n <= 0 ? "" : tk.text(from)) + "'; expected one declared with $var");
        }
        return s;
    }

    /** Base-95 key of a code of up to 9 printable characters, or -1. */
    private static long key(CharSequence code) {
        if (code.length() > 9) {
            return -1;
        }
        long k = 0;
        for (int i = 0; i < code.length(); i++) {
            k = k * 95 + (code.charAt(i) - 32);
        }
        return k;
    }
}
