#!/usr/bin/env python3
"""Writes the capture of bench/scripts/vs-script.sh: a 100 MHz double-edge link, one clock pair
and three data pairs, probed leg by leg (8 legs), as interleaved float32 volts at 2.5 GS/s with
its raw sidecar (docs/capture-raw.md). Data changes halfway between clock edges (centre-aligned,
one bit per clock edge); random bits, 0.35 V differential swing around 1.2 V common mode
(LVDS-like, TIA/EIA-644 from memory), 0.1 UI linear edges and 3 mV of noise per leg.
Invented stimulus for a speed comparison only.

FORMAT (default float32le) writes the same volts as a digitizer's codes instead, with the gain
and offset in the sidecar (volts = code * gain + offset, docs/capture-raw.md): int16le, 0.1 mV a
code around 1.2 V (a 16-bit digitizer's range of +-3.3 V); uint8, 2.5 mV a code from 0.88 V (an
8-bit scope's screen of 0.64 V). Codes are rounded to the nearest and clipped to the format's range.

Usage: ddr-capture.py FILE SAMPLES_PER_CHANNEL [FORMAT]
"""
import json
import sys

import numpy as np

RATE_HZ = 2.5e9
UI_S = 5e-9            # one bit per clock edge of a 100 MHz clock
CLOCK_PHASE_UI = 0.3   # clock edges at (k + 0.3) UI, data edges half a UI later
SWING_V = 0.35
COMMON_V = 1.2
RAMP_UI = 0.1
NOISE_V = 0.003
CHUNK = 1 << 20
NAMES = ["clk_p", "clk_n", "d0_p", "d0_n", "d1_p", "d1_n", "d2_p", "d2_n"]
# format: (numpy type, volts per code, volts at code 0, lowest code, highest code); None: volts as they are
FORMATS = {
    "float32le": ("<f4", None, None, None, None),
    "int16le": ("<i2", 1e-4, 1.2, -32768, 32767),
    "uint8": ("u1", 2.5e-3, 0.88, 0, 255),
}


def levels(u, bits):
    """Differential volts at positions u (in UI, transitions at integers) of a bit sequence."""
    k = np.floor(u).astype(np.int64)
    f = u - k
    cur = bits[k]
    prev = bits[k - 1]
    nxt = bits[k + 1]
    h = RAMP_UI / 2
    v = cur.astype(np.float64)
    lo = f < h
    v[lo] = prev[lo] + (cur[lo] - prev[lo]) * ((f[lo] + h) / RAMP_UI)
    hi = f > 1 - h
    v[hi] = cur[hi] + (nxt[hi] - cur[hi]) * ((f[hi] - (1 - h)) / RAMP_UI)
    return (2 * v - 1) * (SWING_V / 2)


def main():
    path, n = sys.argv[1], int(sys.argv[2])
    fmt = sys.argv[3] if len(sys.argv) > 3 else "float32le"
    if fmt not in FORMATS:
        print("ddr-capture.py: FORMAT '%s' is not one of %s" % (fmt, ", ".join(FORMATS)), file=sys.stderr)
        sys.exit(2)
    dtype, gain, offset, lo, hi = FORMATS[fmt]
    rnd = np.random.default_rng(20261203)
    uis = int(n / RATE_HZ / UI_S) + 4
    clock = np.arange(uis + 2) % 2
    data = [rnd.integers(0, 2, uis + 2) for _ in range(3)]
    with open(path, "wb") as w:
        for start in range(0, n, CHUNK):
            t = np.arange(start, min(n, start + CHUNK)) / RATE_HZ
            frame = np.empty((len(t), 8), dtype=np.float32)
            pairs = [levels(t / UI_S - CLOCK_PHASE_UI + 1, clock)]
            pairs += [levels(t / UI_S - CLOCK_PHASE_UI - 0.5 + 1, d) for d in data]
            for j, d in enumerate(pairs):
                frame[:, 2 * j] = COMMON_V + d / 2 + rnd.normal(0, NOISE_V, len(t))
                frame[:, 2 * j + 1] = COMMON_V - d / 2 + rnd.normal(0, NOISE_V, len(t))
            if gain is None:
                w.write(frame.astype(dtype).tobytes())
            else:
                codes = np.clip(np.rint((frame.astype(np.float64) - offset) / gain), lo, hi)
                w.write(codes.astype(dtype).tobytes())
    channels = [{"name": c} if gain is None else {"name": c, "gain": gain, "offset": offset} for c in NAMES]
    with open(path + ".json", "w") as s:
        json.dump({"rateHz": RATE_HZ, "format": fmt, "channels": channels}, s, indent=1)


if __name__ == "__main__":
    main()
