#!/usr/bin/env python3
"""Writes the capture of bench/scripts/vs-script.sh: a 100 MHz double-edge link, one clock pair
and three data pairs, probed leg by leg (8 legs), as interleaved float32 volts at 2.5 GS/s with
its raw sidecar (docs/capture-raw.md). Data changes halfway between clock edges (centre-aligned,
one bit per clock edge); random bits, 0.35 V differential swing around 1.2 V common mode
(LVDS-like, TIA/EIA-644 from memory), 0.1 UI linear edges and 3 mV of noise per leg.
Invented stimulus for a speed comparison only.

Usage: ddr-capture.py FILE SAMPLES_PER_CHANNEL
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
            w.write(frame.astype("<f4").tobytes())
    with open(path + ".json", "w") as s:
        json.dump({"rateHz": RATE_HZ, "format": "float32le",
                   "channels": [{"name": c} for c in NAMES]}, s, indent=1)


if __name__ == "__main__":
    main()
