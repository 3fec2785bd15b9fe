#!/usr/bin/env bash
# Lanesift against the script a practitioner would write (issue 19; a benchmark, not a unit test).
# One capture: 8 interleaved float32 legs at 2.5 GS/s, a 100 MHz double-edge link with a clock
# pair and 3 data pairs (ddr-capture.py; SIZE samples per channel, default 30 M = 960 MB). The
# same job done two ways, alternately RUNS times (numpy, lanesift, numpy, lanesift, ...) so that a
# load change on the machine hits both alike:
#   - ddr-numpy.py: read, difference of each pair, clock zero crossings (both edges), data value
#     interpolated at each crossing, count bits and ones (numpy from Debian's python3-numpy);
#   - lanesift run of the equivalent chain, started as a user starts it (the ./lanesift launcher, so
#     with its JVM options; LANESIFT_JAVA_OPTS adds more): raw -> 4 x differential (threshold 0 V) -> dual-edge
#     (both edges, 3 lanes), every output written as run writes it; bits and ones counted from
#     its rx-bits*-bits.csv afterwards (not timed).
# Each run must give the same bit count and ones count (the script stops otherwise). Wall times
# include the start of python or of the JVM; CPU seconds (user + system, /usr/bin/time) are the
# steadier figure on a shared machine. Prints each run's times and ratios, min/median/max
# of both, and a plain Java sequential read and sum of the same file (ReadSum.java, the read
# loop's time, JVM start excluded) as the memory-speed yardstick.
# The chain is ddr-chain.json; dist VsScriptTest checks on a small capture that both
# sides give the same counts.
# Usage: bench/scripts/vs-script.sh [RUNS (default 5)] [SIZE (samples per channel, default 30000000)]
#        KEEP=1 keeps the work folder; CAP=FILE reuses a capture written by ddr-capture.py (its sidecar
#        beside it) instead of writing one; OUTPUTS=binary runs lanesift with --outputs binary,artifacts,annotations
#        (packed .bits files instead of the bits CSV and the VCD, docs/bits-binary.md; bits and ones
#        are then counted from the .bits files, not timed).
#        CHAIN=diff runs ddr-diff-chain.json instead: the raw source takes each pair's difference
#        straight from the frames (docs/capture-raw.md, "Leg differences"; no common-mode figures).
#        FORMAT=int16le or FORMAT=uint8 writes the capture as a digitizer's codes with gain and offset
#        in the sidecar (ddr-capture.py) instead of float32 volts; both sides then scale the codes.
set -euo pipefail
cd "$(dirname "$0")/../.."
source bench/scripts/python.sh
ROOT="$PWD"
RUNS="${1:-5}"
SIZE="${2:-30000000}"
need_numpy
echo "numpy $("$PY" -c 'import numpy; print(numpy.__version__)') under $PY" >&2
WORK="$(mktemp -d /tmp/lanesift-vs-script.XXXXXX)"
[ "${KEEP:-0}" = 1 ] || trap 'rm -rf "$WORK"' EXIT
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
if [ -n "${CAP:-}" ]; then
  [ -f "$CAP" ] && [ -f "$CAP.json" ] || { echo "$CAP or its sidecar $CAP.json is missing" >&2; exit 2; }
  ln -s "$(realpath "$CAP")" "$WORK/ddr.bin"; ln -s "$(realpath "$CAP.json")" "$WORK/ddr.bin.json"
  CAP="$WORK/ddr.bin"
  SIZE=$("$PY" -c 'import json, os, sys; f = json.load(open(sys.argv[1] + ".json"))["format"]
print(os.stat(sys.argv[1]).st_size // (8 * {"float32le": 4, "int16le": 2, "uint8": 1}[f]))' "$CAP")
else
  CAP="$WORK/ddr.bin"
  "$PY" "$ROOT/bench/scripts/ddr-capture.py" "$CAP" "$SIZE" "${FORMAT:-float32le}"
fi
OUTPUT_ARGS=()
[ "${OUTPUTS:-}" = binary ] && OUTPUT_ARGS=(--outputs binary,artifacts,annotations)
echo "capture: $CAP, $(stat -L -c %s "$CAP") bytes, $SIZE samples per channel" >&2
# CHAIN=diff: ddr-diff-chain.json (the raw source takes each pair's difference; no common-mode figures)
CHAIN_FILE="$ROOT/bench/scripts/ddr-chain.json"
[ "${CHAIN:-}" = diff ] && CHAIN_FILE="$ROOT/bench/scripts/ddr-diff-chain.json"
cp "$CHAIN_FILE" "$WORK/chain.json"   # reads ddr.bin beside it

now() { date +%s.%N; }
NP=()
LS=()
NPC=()
LSC=()
for r in $(seq 1 "$RUNS"); do
  t0=$(now)
  np_counts=$(/usr/bin/env time -f '%U %S' -o "$WORK/np-cpu.txt" "$PY" "$ROOT/bench/scripts/ddr-numpy.py" "$CAP")
  t1=$(now)
  rm -rf "$WORK/out"
  /usr/bin/env time -f '%U %S' -o "$WORK/ls-cpu.txt" "$ROOT/lanesift" run "$WORK/chain.json" --out "$WORK/out" --quiet "${OUTPUT_ARGS[@]}"
  t2=$(now)
  if [ "${OUTPUTS:-}" = binary ]; then
    ls_counts=$("$PY" - "$WORK"/out/rx-bits*.bits <<'PY'
import sys
import numpy as np
n = o = 0
for f in sys.argv[1:]:
    b = open(f, "rb").read()
    p = 32                                    # header (docs/bits-binary.md)
    while p < len(b):
        k = int.from_bytes(b[p:p + 8], "little", signed=True)
        w = (k + 63) // 64
        v = np.frombuffer(b, dtype="<u8", count=w, offset=p + 40)
        n += k
        o += int(np.unpackbits(v.view(np.uint8), bitorder="little")[:k].sum())
        p += 40 + 24 * w
print("bits", n, "ones", o)
PY
)
  else
    ls_counts=$(cat "$WORK"/out/rx-bits*-bits.csv | awk -F, '$1 != "time (s)" { n++; o += ($2 == "1") } END { print "bits", n, "ones", o }')
  fi
  if [ "$np_counts" != "$ls_counts" ]; then
    echo "run $r: numpy says '$np_counts', lanesift says '$ls_counts'" >&2
    exit 1
  fi
  np=$(awk -v a="$t0" -v b="$t1" 'BEGIN { print b - a }')
  ls=$(awk -v a="$t1" -v b="$t2" 'BEGIN { print b - a }')
  npc=$(awk '{ print $1 + $2 }' "$WORK/np-cpu.txt")
  lsc=$(awk '{ print $1 + $2 }' "$WORK/ls-cpu.txt")
  NP+=("$np")
  LS+=("$ls")
  NPC+=("$npc")
  LSC+=("$lsc")
  printf 'run %d: %s; numpy %.2f s (CPU %.2f s), lanesift %.2f s (CPU %.2f s), lanesift/numpy wall %.2f, CPU %.2f; load %s\n' "$r" "$np_counts" \
    "$np" "$npc" "$ls" "$lsc" "$(awk -v a="$ls" -v b="$np" 'BEGIN { print a / b }')" "$(awk -v a="$lsc" -v b="$npc" 'BEGIN { print a / b }')" \
    "$(cut -d' ' -f1 /proc/loadavg)"
done
source bench/scripts/stats.sh
echo "numpy script:  $(min_med_max_s "${NP[@]}")"
echo "lanesift run:  $(min_med_max_s "${LS[@]}")"
echo "numpy CPU (user + system):    $(min_med_max_s "${NPC[@]}")"
echo "lanesift CPU (user + system): $(min_med_max_s "${LSC[@]}")"
printf 'ratio of median CPU seconds, lanesift/numpy: %.2f\n' "$(awk -v a="$(median "${LSC[@]}")" -v b="$(median "${NPC[@]}")" 'BEGIN { print a / b }')"
printf 'ratio of medians, lanesift/numpy: %.2f (target <= 0.33)\n' "$(awk -v a="$(median "${LS[@]}")" -v b="$(median "${NP[@]}")" 'BEGIN { print a / b }')"
echo "plain Java read and sum (read loop only): $(java "$ROOT/bench/scripts/ReadSum.java" "$CAP")"
echo "load average: $(cut -d' ' -f1-3 /proc/loadavg)"
