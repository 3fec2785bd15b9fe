#!/usr/bin/env bash
# What the outputs cost (not a unit test): one DDR chain (raw float32 legs -> 4 x differential with a
# fixed threshold -> dual-edge, 3 data lanes) over a generated capture, run with the default outputs,
# with --outputs none and with the packed binary bits (--outputs binary,artifacts,annotations), in
# ROUNDS interleaved rounds; prints each wall time (JVM start included) and the ratios within each round.
# The capture: 8 interleaved float32 legs (CLK, D0, D1, D2; P then N) at 2.5 GS/s, a 100 MHz clock,
# random data on both clock edges, invented for this benchmark.
# Usage: bench/scripts/ddr-outputs.sh [MEGABYTES] [ROUNDS] [WORKDIR]    (needs python3-numpy)
set -euo pipefail
cd "$(dirname "$0")/../.."
MB="${1:-320}"
ROUNDS="${2:-3}"
WORK="${3:-$(mktemp -d /tmp/lanesift-ddr-outputs.XXXXXX)}"
mkdir -p "$WORK"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
JAR=dist/target/lanesift.jar
if [ ! -f "$WORK/ddr.bin" ]; then
python3 - "$WORK/ddr.bin" "$MB" <<'EOF'
import json, sys
import numpy as np
path, mb = sys.argv[1], float(sys.argv[2])
rate, period = 2.5e9, 10e-9                   # 2.5 GS/s, 100 MHz clock: 25 samples per clock, a bit every 12.5 samples
frames = int(mb * 1e6 / 32)
rng = np.random.default_rng(7)
block = 1 << 20
with open(path, "wb") as f:
    for start in range(0, frames, block):
        n = min(block, frames - start)
        t = (np.arange(start, start + n) / rate)
        clk = np.tanh(8 * np.sin(2 * np.pi * t / period))
        legs = [clk]
        for lane in range(3):
            # one bit per half period, centred on the clock edges (data changes a quarter period before them)
            idx = np.floor((t + period / 4) / (period / 2)).astype(np.uint64)
            h = (idx + np.uint64(lane + 1)) * np.uint64(0x9E3779B97F4A7C15)   # a multiplicative hash: random-looking bits
            h ^= h >> np.uint64(29)
            h *= np.uint64(0xBF58476D1CE4E5B9)
            bits = (h >> np.uint64(63)).astype(np.int64)
            legs.append(np.where(bits == 1, 1.0, -1.0))
        out = np.empty((n, 8), dtype="<f4")
        for i, d in enumerate(legs):
            noise = rng.normal(0, 0.01, n)
            out[:, 2 * i] = 1.2 + 0.175 * d + noise
            out[:, 2 * i + 1] = 1.2 - 0.175 * d - noise
        f.write(out.tobytes())
side = {"rateHz": rate, "format": "float32le",
        "channels": [{"name": n} for n in ["CLK_P", "CLK_N", "D0_P", "D0_N", "D1_P", "D1_N", "D2_P", "D2_N"]]}
json.dump(side, open(path + ".json", "w"), indent=1)
EOF
fi
cat > "$WORK/ddr.json" <<'EOF'
{
  "description": "output cost benchmark: raw float32 legs, fixed-threshold receivers, DDR sampling of 3 lanes",
  "nodes": [
    {"id": "cap", "plugin": "raw", "options": {"file": "ddr.bin"}},
    {"id": "rx-CLK", "plugin": "differential", "options": {"thresholdVolts": 0, "hysteresisVolts": 0.05, "levelReport": false}},
    {"id": "rx-D0", "plugin": "differential", "options": {"thresholdVolts": 0, "hysteresisVolts": 0.05, "levelReport": false}},
    {"id": "rx-D1", "plugin": "differential", "options": {"thresholdVolts": 0, "hysteresisVolts": 0.05, "levelReport": false}},
    {"id": "rx-D2", "plugin": "differential", "options": {"thresholdVolts": 0, "hysteresisVolts": 0.05, "levelReport": false}},
    {"id": "ddr", "plugin": "dual-edge", "options": {"mode": "ddr", "lanes": 3}}
  ],
  "wires": [
    {"from": "cap.CLK_P", "to": "rx-CLK.p"}, {"from": "cap.CLK_N", "to": "rx-CLK.n"},
    {"from": "cap.D0_P", "to": "rx-D0.p"}, {"from": "cap.D0_N", "to": "rx-D0.n"},
    {"from": "cap.D1_P", "to": "rx-D1.p"}, {"from": "cap.D1_N", "to": "rx-D1.n"},
    {"from": "cap.D2_P", "to": "rx-D2.p"}, {"from": "cap.D2_N", "to": "rx-D2.n"},
    {"from": "rx-CLK.edges", "to": "ddr.clock"},
    {"from": "rx-D0.edges", "to": "ddr.lane0"}, {"from": "rx-D1.edges", "to": "ddr.lane1"}, {"from": "rx-D2.edges", "to": "ddr.lane2"}
  ]
}
EOF
timed() { # name, extra args... ; prints wall seconds, and keeps the CPU seconds (user + system) in $WORK/$name.cpu
  local name="$1"; shift
  rm -rf "$WORK/$name"
  local start end
  start=$(date +%s.%N)
  /usr/bin/env time -f '%U %S' -o "$WORK/$name.time" java -jar "$JAR" --quiet run "$WORK/ddr.json" --out "$WORK/$name" "$@" \
    2> "$WORK/$name.err" || { cat "$WORK/$name.err" >&2; exit 1; }
  end=$(date +%s.%N)
  awk '{print $1 + $2}' "$WORK/$name.time" > "$WORK/$name.cpu"
  echo "$end - $start" | bc
}
cpu() { cat "$WORK/$1.cpu"; }
echo "capture $(du -h "$WORK/ddr.bin" | cut -f1), load before: $(cut -d' ' -f1-3 /proc/loadavg)"
for r in $(seq 1 "$ROUNDS"); do
  d=$(timed default)
  n=$(timed none --outputs none)
  b=$(timed binary --outputs binary,artifacts,annotations)
  a=$(timed byproducts --outputs standard,by-products)
  printf 'round %d wall: default %.2f s, none %.2f s, binary %.2f s, standard+by-products %.2f s; none/default %.2f, binary/default %.2f, default/with-by-products %.2f\n' \
    "$r" "$d" "$n" "$b" "$a" "$(echo "$n / $d" | bc -l)" "$(echo "$b / $d" | bc -l)" "$(echo "$d / $a" | bc -l)"
  printf 'round %d CPU:  default %.2f s, none %.2f s, binary %.2f s, standard+by-products %.2f s; none/default %.2f, binary/default %.2f, default/with-by-products %.2f\n' \
    "$r" "$(cpu default)" "$(cpu none)" "$(cpu binary)" "$(cpu byproducts)" "$(echo "$(cpu none) / $(cpu default)" | bc -l)" \
    "$(echo "$(cpu binary) / $(cpu default)" | bc -l)" "$(echo "$(cpu default) / $(cpu byproducts)" | bc -l)"
done
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)"
ls -la "$WORK/default" "$WORK/binary" | grep -v '^total'
