#!/usr/bin/env bash
# Live decode check (not a unit test): the device simulator sends flat out over the in-memory
# link, the capture spools every byte, and the spool source -> logic-edges chain (all 8 channels,
# every edge counted) decodes behind it on its own thread, in one JVM with a 64 MB heap. Runs
# bench/.../LiveCaptureBench (JMH, single-shot) RUNS times each way, interleaved:
#   live    capture with the decode following it: end-to-end rate (bytes / time from the start of
#           the capture to the end of the decode), capture rate, largest and final decode lag,
#           peak heap;
#   replay  the same decode over a finished spool (decoding alone);
#   capture capture alone.
# Each also prints the CPU time of the capture and decode threads and the rate each would reach on
# a core of its own (the simulator's thread, which a real device replaces, is not counted).
# Prints every run, then min / median / max of the end-to-end rate, the lag (largest, at the end of
# the capture, and largest in its second half: a bounded lag stops growing, so a longer capture
# shows the same), the heap, and the
# load average before and after (the machine is shared: a busy one slows every figure).
# Usage: bench/scripts/live.sh [MEGABYTES] [RUNS]
# JMH refuses to start while another JMH run holds /tmp/jmh.lock; on a shared machine
# JMH_JAVA_OPTS=-Djmh.ignoreLock=true runs anyway (both runs then slow each other).
set -euo pipefail
cd "$(dirname "$0")/../.."
source bench/scripts/python.sh
MB="${1:-512}"
RUNS="${2:-3}"
JAR=bench/target/benchmarks.jar
if [ ! -f "$JAR" ] || [ -n "$(find plugins/serial-source/src plugins/differential/src host-api/src signal-kit/src bench/src \
    -newer "$JAR" -name '*.java' -print -quit)" ]; then
  mvn -o -q package -pl bench -am -DskipTests
fi
LOG="$(mktemp /tmp/lanesift-live.XXXXXX)"
echo "load before: $(cut -d' ' -f1-3 /proc/loadavg)"
for i in $(seq 1 "$RUNS"); do
  for b in captureWithLiveDecode replayDecode captureOnly; do
    java ${JMH_JAVA_OPTS:-} -jar "$JAR" "LiveCaptureBench.$b\$" -p megabytes="$MB" -f 1 -wi 1 -i 1 -jvmArgsAppend -Xmx64m \
      > "$LOG.run" 2>&1 || { cat "$LOG.run"; exit 1; }
    # the measured invocation: the last of the fork (the warm-up prints the same lines before it)
    { grep -E "^ +$b:" "$LOG.run" | tail -1; grep -E "^ +$b cpu:" "$LOG.run" | tail -1;
      grep -E '^ +edges' "$LOG.run" | tail -1; } | tee -a "$LOG" || true
  done
done
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)"
"$PY" - "$LOG" "$RUNS" <<'PY'
import re, statistics, sys
lines = open(sys.argv[1]).read().splitlines()
def rows(kind, field):
    vals = [float(m.group(1)) for l in lines if l.strip().startswith(kind + ":")
            for m in [re.search(field, l)] if m]
    return vals
def show(name, vals, unit):
    if vals:
        print(f"{name}: min {min(vals):.1f} / median {statistics.median(vals):.1f} / max {max(vals):.1f} {unit} ({len(vals)} runs)")
show("live, end to end", rows("captureWithLiveDecode", r"decode ([0-9.]+) MB/s"), "MB/s")
show("live, capture rate", rows("captureWithLiveDecode", r"capture ([0-9.]+) MB/s"), "MB/s")
show("live, largest lag", rows("captureWithLiveDecode", r"lag max ([0-9.]+) MB"), "MB")
show("live, lag at capture end", rows("captureWithLiveDecode", r"at capture end ([0-9.]+) MB"), "MB")
show("live, largest lag in the capture's second half",
     [float(m.group(1)) for l in lines for m in [re.search(r"second half of the capture ([0-9.]+) MB", l)] if m], "MB")
show("live, peak heap", rows("captureWithLiveDecode", r"peak heap <= ([0-9.]+) MB"), "MB")
show("replay, decode alone", rows("replayDecode", r"decode ([0-9.]+) MB/s"), "MB/s")
show("capture alone", rows("captureOnly", r"capture ([0-9.]+) MB/s"), "MB/s")
show("live, decode thread on a core of its own", rows("captureWithLiveDecode cpu", r"decode thread [0-9.]+ s \(([0-9.]+) MB per"), "MB/s")
show("live, capture thread on a core of its own", rows("captureWithLiveDecode cpu", r"capture thread [0-9.]+ s \(([0-9.]+) MB per"), "MB/s")
show("replay, decode thread on a core of its own", rows("replayDecode cpu", r"decode thread [0-9.]+ s \(([0-9.]+) MB per"), "MB/s")
PY
rm -f "$LOG" "$LOG.run"
