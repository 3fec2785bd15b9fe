#!/usr/bin/env python3
"""The script a practitioner would write for the capture of ddr-capture.py: read the interleaved
legs (float32 volts, or codes scaled by the sidecar's gain and offset), take the difference of
each pair, find the clock's zero crossings (both edges), interpolate each crossing's time and
each data lane's value there, and count bits and ones.
Prints "bits N ones M". Usage: ddr-numpy.py FILE"""
import json
import sys

import numpy as np

side = json.load(open(sys.argv[1] + ".json"))
kind = {"float32le": "<f4", "int16le": "<i2", "uint8": "u1"}[side["format"]]
x = np.fromfile(sys.argv[1], dtype=kind).reshape(-1, 8)
if kind != "<f4":                                 # volts = code * gain + offset, per channel
    gain = np.array([c.get("gain", 1.0) for c in side["channels"]], dtype=np.float32)
    offset = np.array([c.get("offset", 0.0) for c in side["channels"]], dtype=np.float32)
    x = x * gain + offset
clk = x[:, 0] - x[:, 1]
hi = clk > 0
i = np.flatnonzero(hi[1:] != hi[:-1])            # crossing between sample i and i + 1
frac = clk[i] / (clk[i] - clk[i + 1])            # where, linearly interpolated
bits = ones = 0
for lane in range(3):
    d = x[:, 2 + 2 * lane] - x[:, 3 + 2 * lane]
    v = d[i] + frac * (d[i + 1] - d[i])          # the lane's value at the clock crossing
    bits += len(v)
    ones += int(np.count_nonzero(v > 0))
print("bits", bits, "ones", ones)
