#!/usr/bin/env bash
# Multi-core check (not a unit test): decodes a generated pixel-link capture from disk in one pass
# and in segments on two threads (run --jobs 2), both through the launcher (its JVM options: the
# serial collector) with a 256 MB heap, RUNS times, alternating.
# For every run: wall time, CPU time (user + sys, all threads: JIT and GC included), the CPU of
# garbage collection (from -Xlog:gc+cpu), the compilers' time (-XX:+CITime; wall time of the
# compiler threads, which under load includes waiting for a core) and peak heap of each; the
# speed-up (wall) and the CPU ratio of that run; whether every output file is the same. Then min / median / max of both ratios, and the load average (a shared machine: other
# work on it slows the two-thread run more than the one-pass run).
# Usage: [EXTRA_JAVA_OPTS=...] bench/scripts/segments.sh [GIGABYTES] [WORKDIR] [RUNS]
# (EXTRA_JAVA_OPTS: more JVM options for both runs, e.g. -Dlanesift.readAhead=false for the A/B of
# the raw reader's read-ahead thread)
set -euo pipefail
cd "$(dirname "$0")/../.."
GB="${1:-2.1}"
WORK="${2:-$(mktemp -d /tmp/lanesift-segments.XXXXXX)}"
RUNS="${3:-3}"
mkdir -p "$WORK"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
JAR=dist/target/lanesift.jar
[ -f "$WORK/long.bin" ] || java -cp "$JAR" org.lanesift.examples.demo.LongCapture "$WORK/long.bin" "$GB"
cp examples/chains/segments-pixel-link.json "$WORK/chain.json"
decode() { # name, extra args... -> "$WORK/$name.t": wall cpu peakMB gcCpu jitSeconds
  local name="$1"; shift
  rm -rf "$WORK/$name"
  LANESIFT_JAVA_OPTS="-Xmx256m -Xlog:gc*:file=$WORK/$name-gc.log -XX:+UnlockDiagnosticVMOptions -XX:+CITime ${EXTRA_JAVA_OPTS:-}" \
    /usr/bin/env time -f '%e %U %S' -o "$WORK/$name-time.txt" ./lanesift \
    --quiet run "$WORK/chain.json" --out "$WORK/$name" "$@" > "$WORK/$name-jit.txt" 2>&1 \
    || { cat "$WORK/$name-time.txt" "$WORK/$name-jit.txt"; exit 1; }
  local peak gc jit
  peak=$(grep -oE '[0-9]+M->[0-9]+M' "$WORK/$name-gc.log" | sed -E 's/M->.*//' | sort -n | tail -1)
  gc=$(grep 'gc,cpu' "$WORK/$name-gc.log" | grep -oE 'User=[0-9.]+s Sys=[0-9.]+s' | tr -d 'UserSys=s' \
    | awk '{t += $1 + $2} END {printf "%.2f", t}')
  jit=$(grep -oE 'Total compilation time *: *[0-9.]+' "$WORK/$name-jit.txt" | grep -oE '[0-9.]+$' || echo 0)
  awk -v p="${peak:-0}" -v g="$gc" -v j="$jit" '{printf "%s %.2f %s %s %s\n", $1, $2 + $3, p, g, j}' "$WORK/$name-time.txt" > "$WORK/$name.t"
}
same() {
  local s=yes f
  for f in $(ls "$WORK/one"); do
    case "$f" in
      report.md) cmp -s <(grep -v ', started ' "$WORK/one/$f") <(grep -v ', started ' "$WORK/two/$f") || s="no ($f)" ;;
      signals.vcd) cmp -s <(tail -n +4 "$WORK/one/$f") <(tail -n +4 "$WORK/two/$f") || s="no ($f)" ;;
      *) cmp -s "$WORK/one/$f" "$WORK/two/$f" || s="no ($f)" ;;
    esac
  done
  echo "$s"
}
echo "capture $(du -h "$WORK/long.bin" | cut -f1); load before: $(cut -d' ' -f1-3 /proc/loadavg)"
: > "$WORK/ratios"
for i in $(seq 1 "$RUNS"); do
  decode one
  decode two --jobs 2
  read -r w1 c1 p1 g1 j1 < "$WORK/one.t"
  read -r w2 c2 p2 g2 j2 < "$WORK/two.t"
  sp=$(echo "$w1 / $w2" | bc -l); cr=$(echo "$c2 / $c1" | bc -l)
  echo "$sp $cr" >> "$WORK/ratios"
  printf 'run %d: one pass %.1f s wall, %.1f s CPU (GC %s s, JIT %s s), peak heap %s MB; --jobs 2 %.1f s wall, %.1f s CPU (GC %s s, JIT %s s), peak heap %s MB;' \
    "$i" "$w1" "$c1" "$g1" "$j1" "$p1" "$w2" "$c2" "$g2" "$j2" "$p2"
  printf ' speed-up %.2f, CPU ratio %.2f; same outputs: %s; load %s\n' "$sp" "$cr" "$(same)" "$(cut -d' ' -f1 /proc/loadavg)"
done
source bench/scripts/stats.sh
echo "speed-up (wall): $(min_med_max %.2f $(awk '{print $1}' "$WORK/ratios"))"
echo "CPU --jobs 2 / one pass: $(min_med_max %.2f $(awk '{print $2}' "$WORK/ratios"))"
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)"
