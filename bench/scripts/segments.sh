#!/usr/bin/env bash
# Multi-core check (not a unit test): decodes a generated pixel-link capture from disk in one pass
# and in segments on two threads (run --jobs 2), both with a 256 MB heap; reports both times, their
# ratio measured in this one run, the peak heaps, and whether every output file is the same.
# Usage: bench/scripts/segments.sh [GIGABYTES] [WORKDIR]
set -euo pipefail
cd "$(dirname "$0")/../.."
GB="${1:-2.1}"
WORK="${2:-$(mktemp -d /tmp/lanesift-segments.XXXXXX)}"
mkdir -p "$WORK"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
JAR=dist/target/lanesift.jar
[ -f "$WORK/long.bin" ] || java -cp "$JAR" org.lanesift.examples.demo.LongCapture "$WORK/long.bin" "$GB"
cp examples/chains/segments-pixel-link.json "$WORK/chain.json"
decode() { # name, extra args...
  local name="$1"; shift
  rm -rf "$WORK/$name"
  local start end
  start=$(date +%s.%N)
  /usr/bin/env time -v java -Xmx256m -Xlog:gc:file="$WORK/$name-gc.log" -jar "$JAR" --quiet run "$WORK/chain.json" \
    --out "$WORK/$name" "$@" 2> "$WORK/$name-time.txt" || { cat "$WORK/$name-time.txt"; exit 1; }
  end=$(date +%s.%N)
  echo "$end - $start" | bc > "$WORK/$name-seconds"
}
echo "load before: $(cut -d' ' -f1-3 /proc/loadavg)"
decode one
decode two --jobs 2
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)"
same=yes
for f in $(ls "$WORK/one"); do
  case "$f" in
    report.md) cmp -s <(grep -v ', started ' "$WORK/one/$f") <(grep -v ', started ' "$WORK/two/$f") || { same="no ($f)"; } ;;
    signals.vcd) cmp -s <(tail -n +4 "$WORK/one/$f") <(tail -n +4 "$WORK/two/$f") || { same="no ($f)"; } ;;
    *) cmp -s "$WORK/one/$f" "$WORK/two/$f" || { same="no ($f)"; } ;;
  esac
done
peak() { grep -oE '[0-9]+M->[0-9]+M' "$1" | sed -E 's/M->.*//' | sort -n | tail -1; }
t1=$(cat "$WORK/one-seconds"); t2=$(cat "$WORK/two-seconds")
printf 'capture %s: one pass %.1f s (peak heap %s MB), --jobs 2 %.1f s (peak heap %s MB); speed-up %.2f; same outputs: %s\n' \
  "$(du -h "$WORK/long.bin" | cut -f1)" "$t1" "$(peak "$WORK/one-gc.log")" "$t2" "$(peak "$WORK/two-gc.log")" \
  "$(echo "$t1 / $t2" | bc -l)" "$same"
