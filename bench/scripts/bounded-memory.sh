#!/usr/bin/env bash
# Bounded-memory check (not a unit test): decodes a generated pixel-link capture of at least
# 2 GB from disk with a 256 MB heap and reports the time and the peak heap.
# Usage: bench/scripts/bounded-memory.sh [GIGABYTES] [WORKDIR]
set -euo pipefail
cd "$(dirname "$0")/../.."
GB="${1:-2.1}"
WORK="${2:-$(mktemp -d /tmp/lanesift-bounded.XXXXXX)}"
mkdir -p "$WORK"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
JAR=dist/target/lanesift.jar
java -cp "$JAR" org.lanesift.examples.demo.LongCapture "$WORK/long.bin" "$GB"
cat > "$WORK/long-decode.json" <<JSON
{
  "description": "bounded-memory check: the demo pixel link decoded from a long raw capture",
  "nodes": [
    {"id": "cap", "plugin": "raw", "options": {"file": "long.bin"}},
    {"id": "legs", "plugin": "deskew", "options": {"kind": "analog", "channels": 8, "offsets": [0, -30, 0, 40, 0, -55, 0, -25]}},
    {"id": "rx-CLK", "plugin": "differential", "options": {"name": "CLK"}},
    {"id": "rx-D0", "plugin": "differential", "options": {"name": "D0"}},
    {"id": "rx-D1", "plugin": "differential", "options": {"name": "D1"}},
    {"id": "rx-D2", "plugin": "differential", "options": {"name": "D2"}},
    {"id": "lanes", "plugin": "deskew", "options": {"kind": "edges", "channels": 4, "offsets": [0, -120, 80, -250]}},
    {"id": "sampler", "plugin": "dual-edge", "options": {"mode": "multiplied", "slots": 7, "lanes": 3}},
    {"id": "panel", "plugin": "pixel-link", "options": {"mapping": "bits-18", "pictures": "none", "detail": "anomalies"}}
  ],
  "wires": [
    {"from": "cap.CLK_P", "to": "legs.in0"}, {"from": "cap.CLK_N", "to": "legs.in1"},
    {"from": "cap.D0_P", "to": "legs.in2"}, {"from": "cap.D0_N", "to": "legs.in3"},
    {"from": "cap.D1_P", "to": "legs.in4"}, {"from": "cap.D1_N", "to": "legs.in5"},
    {"from": "cap.D2_P", "to": "legs.in6"}, {"from": "cap.D2_N", "to": "legs.in7"},
    {"from": "legs.out0", "to": "rx-CLK.p"}, {"from": "legs.out1", "to": "rx-CLK.n"},
    {"from": "legs.out2", "to": "rx-D0.p"}, {"from": "legs.out3", "to": "rx-D0.n"},
    {"from": "legs.out4", "to": "rx-D1.p"}, {"from": "legs.out5", "to": "rx-D1.n"},
    {"from": "legs.out6", "to": "rx-D2.p"}, {"from": "legs.out7", "to": "rx-D2.n"},
    {"from": "rx-CLK.edges", "to": "lanes.in0"}, {"from": "rx-D0.edges", "to": "lanes.in1"},
    {"from": "rx-D1.edges", "to": "lanes.in2"}, {"from": "rx-D2.edges", "to": "lanes.in3"},
    {"from": "lanes.out0", "to": "sampler.clock"}, {"from": "lanes.out1", "to": "sampler.lane0"},
    {"from": "lanes.out2", "to": "sampler.lane1"}, {"from": "lanes.out3", "to": "sampler.lane2"},
    {"from": "sampler.bits0", "to": "panel.lane0"}, {"from": "sampler.bits1", "to": "panel.lane1"},
    {"from": "sampler.bits2", "to": "panel.lane2"}
  ]
}
JSON
echo "decoding $(du -h "$WORK/long.bin" | cut -f1) with -Xmx256m ..."
start=$(date +%s.%N)
/usr/bin/env time -v java -Xmx256m -Xlog:gc:file="$WORK/gc.log" -jar "$JAR" --quiet run "$WORK/long-decode.json" --out "$WORK/out" \
  2> "$WORK/time.txt" || { cat "$WORK/time.txt"; exit 1; }
end=$(date +%s.%N)
peak=$(grep -oE '[0-9]+M->[0-9]+M' "$WORK/gc.log" | sed -E 's/M->.*//' | sort -n | tail -1)
rss=$(grep 'Maximum resident' "$WORK/time.txt" | awk '{print $NF}')
frames=$(ls "$WORK/out" | grep -c 'panel-frame-.*\.png' || true)
printf 'decoded %s frames in %.1f s; peak heap before a collection %s MB (limit 256 MB); max RSS %s kB\n' \
  "$frames" "$(echo "$end - $start" | bc)" "${peak:-?}" "${rss:-?}"
