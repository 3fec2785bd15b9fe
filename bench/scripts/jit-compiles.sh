#!/usr/bin/env bash
# What the JIT compiles during one cold pass (not a unit test): one pass of the DDR chain
# (bench ColdPass: raw -> 4 x differential -> dual-edge, no output files) over a capture written by
# ddr-capture.py, in a fresh JVM with the launcher's collector and -XX:+LogCompilation, RUNS times.
# Prints for each run the pass line, the top-N methods by C2 (tier 4) compile time with how many
# times each was compiled (an "osr@BCI" entry is a compile of a loop while it runs, on-stack
# replacement), and the total C2 and C1 compile time. A hot method compiled several times on a cold
# pass competes with the decode for the second core; DEVELOPERS.md "JIT warm-up" says what was
# changed because of these figures.
# The log's per-task times are the compiler thread's wall time between the start and the end of a
# task, so on a loaded machine they include waiting for a core.
# Usage: [JAR=benchmarks.jar] bench/scripts/jit-compiles.sh CAPTURE [RUNS (default 2)] [TOP (default 12)]
set -euo pipefail
cd "$(dirname "$0")/../.."
source bench/scripts/python.sh
CAP="${1:?usage: bench/scripts/jit-compiles.sh CAPTURE [RUNS] [TOP]}"
RUNS="${2:-2}"
TOP="${3:-12}"
[ -f "$CAP" ] && [ -f "$CAP.json" ] || { echo "$CAP or its sidecar $CAP.json is missing (write one with bench/scripts/ddr-capture.py)" >&2; exit 2; }
JAR="${JAR:-bench/target/benchmarks.jar}"   # JAR=... measures another build (e.g. one of an older commit)
[ -f "$JAR" ] || mvn -o -q -pl bench -am package -DskipTests
LOG="$(mktemp /tmp/lanesift-jit.XXXXXX)"
trap 'rm -f "$LOG"' EXIT
for r in $(seq 1 "$RUNS"); do
  echo "run $r, load $(cut -d' ' -f1 /proc/loadavg):"
  java -XX:+UseSerialGC -XX:+UnlockDiagnosticVMOptions -XX:+LogCompilation -XX:LogFile="$LOG" \
    -cp "$JAR" org.lanesift.bench.ColdPass "$CAP" --passes 1 | sed 's/^/  /'
  "$PY" - "$LOG" "$TOP" <<'PY'
import re, sys
from collections import defaultdict
text = open(sys.argv[1], errors="replace").read()
top = int(sys.argv[2])
secs = defaultdict(float)
kinds = defaultdict(list)
total = {"1-3": 0.0, "4": 0.0}
# each compiler thread's tasks, one after another, in a section of their own
sections = re.findall(r"<compilation_log thread='\d+'>(.*?)</compilation_log>", text, re.S)
tasks = [t for sec in sections for t in re.finditer(r"<task ([^>]*)>.*?<task_done ([^>]*)/>", sec, re.S)]
for m in tasks:
    attrs, done = m.group(1), m.group(2)
    method = re.search(r"method='([^']*)'", attrs).group(1).split(" ")
    name = method[0].split(".")[-1] + "." + method[1]
    level = re.search(r"level='(\d)'", attrs)
    level = level.group(1) if level else "4"
    took = float(re.search(r"stamp='([^']*)'", done).group(1)) - float(re.search(r"stamp='([^']*)'", attrs).group(1))
    total["4" if level == "4" else "1-3"] += took
    if level == "4":
        osr = re.search(r"osr_bci='(\d+)'", attrs)
        secs[name] += took
        kinds[name].append("osr@" + osr.group(1) if osr else "std")
for name in sorted(secs, key=secs.get, reverse=True)[:top]:
    print("  C2 %.3f s  %d x  %-50s %s" % (secs[name], len(kinds[name]), name, " ".join(kinds[name])))
print("  C2 total %.3f s, C1 total %.3f s" % (total["4"], total["1-3"]))
PY
done
