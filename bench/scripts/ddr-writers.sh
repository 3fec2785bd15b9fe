#!/usr/bin/env bash
# Output-writing cost on a DDR chain (not a unit test), against another jar. Uses the capture and chain of
# vs-script.sh (ddr-capture.py: a 100 MHz double-edge link, 8 float32 legs at 2.5 GS/s; ddr-chain.json:
# raw -> 4 x differential (fixed threshold) -> dual-edge, writing its default outputs).
# Each round runs the jar under test and, when given, a second jar (e.g. one built before a change)
# on the same file, alternately, and prints both wall times and their ratio in that round; with
# JFR=1 it also records one run of each and prints the share of execution samples in the writers
# (org.lanesift.runner.output) next to the whole run.
# Usage: bench/scripts/ddr-writers.sh [MEGABYTES] [ROUNDS] [OTHER_JAR] [WORKDIR]
set -euo pipefail
cd "$(dirname "$0")/../.."
source bench/scripts/python.sh
MB="${1:-400}"
ROUNDS="${2:-3}"
OTHER="${3:-}"
WORK="${4:-$(mktemp -d /tmp/lanesift-ddr.XXXXXX)}"
mkdir -p "$WORK"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
JAR="$WORK/under-test.jar"
cp dist/target/lanesift.jar "$JAR"
if [ ! -f "$WORK/ddr.bin" ]; then
  need_numpy
  "$PY" bench/scripts/ddr-capture.py "$WORK/ddr.bin" $(( MB * 1000000 / 32 ))   # the one DDR capture generator
fi
cp bench/scripts/ddr-chain.json "$WORK/ddr.json"                                   # the one DDR chain; reads ddr.bin beside it
decode() { # jar out [extra java options]
  local jar="$1" out="$2"; shift 2
  rm -rf "$WORK/$out"
  local start end
  start=$(date +%s.%N)
  java "$@" -jar "$jar" --quiet run "$WORK/ddr.json" --out "$WORK/$out" >/dev/null
  end=$(date +%s.%N)
  echo "$end - $start" | bc
}
echo "capture $(du -h "$WORK/ddr.bin" | cut -f1), load before: $(cut -d' ' -f1-3 /proc/loadavg)"
for i in $(seq 1 "$ROUNDS"); do
  a=$(decode "$JAR" new)
  if [ -n "$OTHER" ]; then
    b=$(decode "$OTHER" other)
    printf 'round %d: under test %.2f s, other %.2f s, ratio other/under test %.2f\n' "$i" "$a" "$b" "$(echo "$b / $a" | bc -l)"
  else
    printf 'round %d: %.2f s\n' "$i" "$a"
  fi
done
if [ -n "$OTHER" ]; then
  for f in $(cd "$WORK/new" && ls); do
    case "$f" in
      report.md|.lanesift-manifest) ;;
      signals.vcd) cmp -s <(tail -n +4 "$WORK/new/$f") <(tail -n +4 "$WORK/other/$f") || echo "differs: $f" ;;
      *) cmp -s "$WORK/new/$f" "$WORK/other/$f" || echo "differs: $f" ;;
    esac
  done
fi
ls -l "$WORK/new"
if [ "${JFR:-0}" = 1 ]; then
  share() { # jar out
    decode "$1" "$2" -XX:StartFlightRecording=filename="$WORK/$2.jfr",settings=profile >/dev/null
    jfr print --events jdk.ExecutionSample "$WORK/$2.jfr" > "$WORK/$2.samples"
    local all out
    all=$(grep -c 'jdk.ExecutionSample' "$WORK/$2.samples" || true)
    # a sample is the writers' when any frame of its stack is in the output package
    out=$(awk '/jdk.ExecutionSample/{if(s)n++; s=0} /org\.lanesift\.runner\.output\./{s=1} END{if(s)n++; print n+0}' "$WORK/$2.samples")
    printf '%s: %d of %d execution samples in the writers (%.0f %%)\n' "$2" "$out" "$all" "$(echo "100 * $out / $all" | bc -l)"
  }
  share "$JAR" new-jfr
  [ -n "$OTHER" ] && share "$OTHER" other-jfr
fi
