#!/usr/bin/env bash
# The fixed cost of every run (issue 19, a benchmark, not a unit test): N runs of
# `lanesift --version` and N runs of the DDR chain (ddr-chain.json: raw -> 4 x differential ->
# dual-edge) on a small capture of ddr-capture.py (SIZE samples per channel, default 100000 =
# 3.2 MB) with --outputs binary,artifacts,annotations, each in a fresh JVM started by the
# ./lanesift launcher (so with its JVM options; LANESIFT_JAVA_OPTS adds more), the two commands
# alternated run by run. Prints wall and CPU seconds (user + system) per command, min/median/max,
# and checks that every run wrote the same files with the same bytes (report.md and the manifest
# hold the run's time and are left out of the check).
# Usage: bench/scripts/fixed-cost.sh [N (default 10)] [SIZE (default 100000)]
#        KEEP=1 keeps the work folder.
set -euo pipefail
cd "$(dirname "$0")/../.."
source bench/scripts/python.sh
ROOT="$PWD"
N="${1:-10}"
SIZE="${2:-100000}"
need_numpy
WORK="$(mktemp -d /tmp/lanesift-fixed.XXXXXX)"
[ "${KEEP:-0}" = 1 ] || trap 'rm -rf "$WORK"' EXIT
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
"$PY" bench/scripts/ddr-capture.py "$WORK/ddr.bin" "$SIZE"
cp bench/scripts/ddr-chain.json "$WORK/ddr-chain.json"
echo "load before: $(cut -d' ' -f1-3 /proc/loadavg)"
: > "$WORK/results.txt"
for i in $(seq 1 "$N"); do
  /usr/bin/env time -f '%e %U %S' -o "$WORK/time.txt" "$ROOT/lanesift" --version > /dev/null
  read -r wall user sys < "$WORK/time.txt"
  echo "version $wall $(echo "$user + $sys" | bc)" | tee -a "$WORK/results.txt"
  rm -rf "$WORK/out"
  (cd "$WORK" && /usr/bin/env time -f '%e %U %S' -o "$WORK/time.txt" "$ROOT/lanesift" run ddr-chain.json \
      --outputs binary,artifacts,annotations --out out --quiet)
  read -r wall user sys < "$WORK/time.txt"
  echo "small-run $wall $(echo "$user + $sys" | bc)" | tee -a "$WORK/results.txt"
  (cd "$WORK/out" && find . -type f ! -name report.md ! -name .lanesift-manifest -print0 | LC_ALL=C sort -z \
      | xargs -0 sha256sum) > "$WORK/digests-$i.txt"
done
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)"
for i in $(seq 2 "$N"); do
  cmp -s "$WORK/digests-1.txt" "$WORK/digests-$i.txt" || { echo "run $i wrote different files than run 1" >&2; exit 1; }
done
"$PY" - "$WORK/results.txt" <<'PY'
import sys, statistics as st
rows = [l.split() for l in open(sys.argv[1])]
print("%-10s %-22s %-22s" % ("command", "wall s min/med/max", "cpu s min/med/max"))
for n in dict.fromkeys(r[0] for r in rows):
    w = sorted(float(r[1]) for r in rows if r[0] == n)
    c = sorted(float(r[2]) for r in rows if r[0] == n)
    print("%-10s %5.2f/%5.2f/%5.2f      %5.2f/%5.2f/%5.2f" % (n, w[0], st.median(w), w[-1], c[0], st.median(c), c[-1]))
PY
