#!/usr/bin/env bash
# A/B of deskew's filter worker thread (not a unit test): `lanesift bench --samples N` with the
# worker on and off (-Dlanesift.stageThreads=false), alternating, RUNS times each, through the
# launcher. For every run: the whole chain's wall seconds and ratio to the plain read, its process
# CPU seconds (all threads: worker, JIT and GC included) and the load average before it; then per
# side min / median / max of the wall seconds, the CPU seconds and the ratio, and the on/off wall
# ratio within each round (below 1: the worker made the chain faster).
# Usage: [EXTRA_JAVA_OPTS=...] bench/scripts/stage-threads.sh [SAMPLES] [RUNS]
set -euo pipefail
cd "$(dirname "$0")/../.."
SAMPLES="${1:-60000000}"
RUNS="${2:-3}"
WORK="$(mktemp -d /tmp/lanesift-stage-threads.XXXXXX)"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
one() { # side (on|off), round -> "$WORK/side.r": wall ratio cpu
  local side="$1" opts="${EXTRA_JAVA_OPTS:-}"
  [ "$side" = off ] && opts="$opts -Dlanesift.stageThreads=false"
  local load; load=$(cut -d' ' -f1 /proc/loadavg)
  LANESIFT_JAVA_OPTS="$opts" ./lanesift bench --samples "$SAMPLES" > "$WORK/$side-$2.txt"
  local wall ratio cpu
  wall=$(grep -E '^  \+ pixel decoder' "$WORK/$side-$2.txt" | head -1 | awk '{print $6}')
  ratio=$(grep -oE 'ratio to the sequential read [0-9.]+ \(target' "$WORK/$side-$2.txt" | awk '{print $6}')
  cpu=$(grep -E '^  \+ pixel decoder' "$WORK/$side-$2.txt" | tail -1 | awk '{print $6}')
  echo "$wall $ratio $cpu $load" >> "$WORK/$side.r"
  printf '  %-3s %s s wall, ratio %s, %s s process CPU (load before %s)\n' "$side" "$wall" "$ratio" "$cpu" "$load"
}
echo "bench --samples $SAMPLES, $RUNS rounds; $(uptime)"
for i in $(seq 1 "$RUNS"); do
  echo "round $i:"
  if [ $((i % 2)) = 1 ]; then one on "$i"; one off "$i"; else one off "$i"; one on "$i"; fi
  paste "$WORK/on.r" "$WORK/off.r" | tail -1 | awk '{printf "  on/off wall %.3f\n", $1 / $5}'
done
source bench/scripts/stats.sh
col() { awk -v c="$2" '{print $c}' "$WORK/$1.r"; }
for side in on off; do
  echo "$side: wall s $(min_med_max %.3f $(col $side 1)); CPU s $(min_med_max %.3f $(col $side 3)); ratio $(min_med_max %.4f $(col $side 2))"
done
echo "$(uptime)"
