#!/usr/bin/env bash
# What the outputs cost (not a unit test): one DDR chain (raw float32 legs -> 4 x differential with a
# fixed threshold -> dual-edge, 3 data lanes) over a generated capture, run with the default outputs,
# with --outputs none and with the packed binary bits (--outputs binary,artifacts,annotations), in
# ROUNDS interleaved rounds; prints each wall time (JVM start included) and the ratios within each round.
# The capture and the chain are those of vs-script.sh (ddr-capture.py, ddr-chain.json).
# Usage: bench/scripts/ddr-outputs.sh [MEGABYTES] [ROUNDS] [WORKDIR]    (needs python3-numpy)
set -euo pipefail
cd "$(dirname "$0")/../.."
source bench/scripts/python.sh
MB="${1:-320}"
ROUNDS="${2:-3}"
WORK="${3:-$(mktemp -d /tmp/lanesift-ddr-outputs.XXXXXX)}"
mkdir -p "$WORK"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
JAR=dist/target/lanesift.jar
if [ ! -f "$WORK/ddr.bin" ]; then
  need_numpy
  "$PY" bench/scripts/ddr-capture.py "$WORK/ddr.bin" $(( MB * 1000000 / 32 ))   # the one DDR capture generator
fi
cp bench/scripts/ddr-chain.json "$WORK/ddr.json"                                   # the one DDR chain; reads ddr.bin beside it
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
