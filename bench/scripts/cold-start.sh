#!/usr/bin/env bash
# Cold-start check (not a unit test): one pass of raw -> 4 x differential (fixed threshold) ->
# dual-edge (the chain of ddr-chain.json) over the capture of vs-script.sh (8 interleaved float32
# legs at 2.5 GS/s, a 100 MHz double-edge link, written by ddr-capture.py; SIZE samples per channel,
# default 30 M = 960 MB), each pass in a fresh JVM with no output files (bench ColdPass), under several sets of JVM options, the sets interleaved round by round.
# Prints per set: wall and CPU seconds (min/median/max over the rounds), the median peak resident
# memory, and the median of the per-round wall ratios to the first set. Every pass must count the
# same bits and ones.
# Usage: [ONLY='default|serial'] bench/scripts/cold-start.sh [ROUNDS] [SIZE] [WORKDIR]
# (WORKDIR: a folder kept by KEEP=1 vs-script.sh holds the same capture, ddr.bin, and is reused)
# (ONLY: a regular expression; only the sets whose whole name matches run)
set -euo pipefail
cd "$(dirname "$0")/../.."
source bench/scripts/python.sh
ROUNDS="${1:-3}"
SIZE="${2:-30000000}"
WORK="${3:-$(mktemp -d /tmp/lanesift-cold.XXXXXX)}"
mkdir -p "$WORK"
need_numpy
JAR=bench/target/benchmarks.jar
[ -f "$JAR" ] || mvn -o -q -pl bench -am package -DskipTests
[ -f "$WORK/ddr.bin" ] || "$PY" bench/scripts/ddr-capture.py "$WORK/ddr.bin" "$SIZE"
# an application class-data archive of the classes one pass loads
[ -f "$WORK/app.jsa" ] || java -XX:ArchiveClassesAtExit="$WORK/app.jsa" -cp "$JAR" org.lanesift.bench.ColdPass "$WORK/ddr.bin" >/dev/null 2>&1
SETS=(
  "default|"
  "serial|-XX:+UseSerialGC"
  "serial-thp|-XX:+UseSerialGC -XX:+UseTransparentHugePages"
  "serial-thp-cds|-XX:+UseSerialGC -XX:+UseTransparentHugePages -XX:SharedArchiveFile=$WORK/app.jsa"
  "xmx1g|-Xmx1g"
  "pretouch-xms1g|-Xms1g -Xmx1g -XX:+AlwaysPreTouch"
  "c1-only|-XX:TieredStopAtLevel=1"
)
cat /dev/null > "$WORK/results.txt"
echo "load before: $(cut -d' ' -f1-3 /proc/loadavg)"
cat "$WORK/ddr.bin" > /dev/null   # the file in the page cache for every set alike
for round in $(seq 1 "$ROUNDS"); do
  for s in "${SETS[@]}"; do
    name="${s%%|*}"; opts="${s#*|}"
    if [ -n "${ONLY:-}" ] && ! [[ "$name" =~ ^(${ONLY})$ ]]; then continue; fi
    # shellcheck disable=SC2086
    /usr/bin/env time -f '%e %U %S %M' -o "$WORK/time.txt" java $opts -cp "$JAR" org.lanesift.bench.ColdPass "$WORK/ddr.bin" > "$WORK/out.txt"
    read -r wall user sys rss < "$WORK/time.txt"
    counts=$(sed -E 's/ pass.*//' "$WORK/out.txt")
    echo "$round $name $wall $(echo "$user + $sys" | bc) $rss $counts" | tee -a "$WORK/results.txt"
  done
done
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)"
[ "$(awk '{print $6, $7, $8, $9}' "$WORK/results.txt" | sort -u | wc -l)" = 1 ] || { echo "the passes disagree on the bits" >&2; exit 1; }
"$PY" - "$WORK/results.txt" "${SETS[0]%%|*}" <<'PY'
import sys, statistics as st
rows = [l.split() for l in open(sys.argv[1])]
base = sys.argv[2]
names = list(dict.fromkeys(r[1] for r in rows))
wall = {(r[0], r[1]): float(r[2]) for r in rows}
print("%-18s %-22s %-22s %9s %s" % ("set", "wall s min/med/max", "cpu s min/med/max", "rss MB", "wall ratio to " + base + " (median of rounds)"))
for n in names:
    w = sorted(float(r[2]) for r in rows if r[1] == n)
    c = sorted(float(r[3]) for r in rows if r[1] == n)
    m = st.median(int(r[4]) for r in rows if r[1] == n) / 1024
    ratios = [wall[(r, n)] / wall[(r, base)] for r in dict.fromkeys(x[0] for x in rows)]
    print("%-18s %5.2f/%5.2f/%5.2f      %5.2f/%5.2f/%5.2f      %7.0f   %.2f" % (n, w[0], st.median(w), w[-1], c[0], st.median(c), c[-1], m, st.median(ratios)))
PY
