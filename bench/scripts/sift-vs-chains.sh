#!/usr/bin/env bash
# Speed of the one command (a benchmark, not a unit test): `lanesift sift` on a ~50 MB scope CSV
# against the same work as three chain files run one after another with `lanesift run` (leg skew;
# legs corrected, lane skew; both corrected, decode), with the skew tables merged between them, as
# a user had to before sift. Both read the same capture; the runs alternate (sift, chains, sift,
# chains, ...) so that a load change on the machine hits both alike; prints min/median/max of each
# and the ratio of the medians (target: sift <= 1.5 x the three chains).
#
# The three chain files are cut from the chain sift writes (OUT/chains/sift.json): the estimators
# and what feeds them go into passes 1 and 2, the corrections read table files (offsetsFile)
# instead of calibration inputs, so every instance has the options sift gave it. sift also
# inspects the capture first (pairs, clock, levels); each chain is a JVM launch, sift is one.
#
# The capture: the demo's pixel link (raw int16, 8 legs at 2.5 GS/s) written as a scope CSV,
# its first ROWS rows (default 700000, about 50 MB).
# Usage: bench/scripts/sift-vs-chains.sh [RUNS (default 3)] [ROWS]
set -euo pipefail
cd "$(dirname "$0")/../.."
source bench/scripts/python.sh
RUNS="${1:-3}"
ROWS="${2:-700000}"
WORK="$(mktemp -d /tmp/lanesift-sift-bench.XXXXXX)"
trap 'rm -rf "$WORK"' EXIT
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
./lanesift demo --out "$WORK/demo" --quiet >/dev/null || true   # only its captures are used
CAP="$WORK/scope.csv"
"$PY" - "$WORK/demo/captures/pixel-link.bin" "$CAP" "$ROWS" <<'EOF'
import array, json, sys
raw, out, rows = sys.argv[1], sys.argv[2], int(sys.argv[3])
side = json.load(open(raw + ".json"))
assert side["format"] == "int16le"
ch = side["channels"]
n = len(ch)
a = array.array("h")
with open(raw, "rb") as f:
    a.frombytes(f.read(2 * n * rows))
if sys.byteorder != "little":
    a.byteswap()
rate = float(side["rateHz"])
with open(out, "w") as w:
    w.write("time (s)," + ",".join(c["name"] + " (V)" for c in ch) + "\n")
    for r in range(len(a) // n):
        vals = (a[r * n + k] * c["gain"] + c.get("offset", 0) for k, c in enumerate(ch))
        w.write("%.10e," % (r / rate) + ",".join("%.5f" % v for v in vals) + "\n")
EOF
echo "capture: $CAP, $(stat -c %s "$CAP") bytes" >&2

# the chain sift writes, once, to cut the three chains from
./lanesift sift --capture "$CAP" --out "$WORK/ref" --quiet
"$PY" - "$WORK/ref/chains/sift.json" "$WORK/chains" "$CAP" <<'EOF'
import json, os, sys
src, outdir, cap = sys.argv[1], sys.argv[2], sys.argv[3]
os.makedirs(outdir, exist_ok=True)
c = json.load(open(src))
nodes = {n["id"]: n for n in c["nodes"]}
nodes["cap"]["options"]["file"] = cap
est = [i for i, n in nodes.items() if n["plugin"] == "skew-estimate"]
legs_est = [i for i in est if i.startswith("legs-")]
lane_est = [i for i in est if not i.startswith("legs-")]
def table_file(deskew_id):
    return os.path.join(outdir, deskew_id + ".json")
def fixed(n):
    n = json.loads(json.dumps(n))
    if n["plugin"] == "deskew" and "tables" in n["options"]:
        del n["options"]["tables"]; n["options"].pop("minConfidence", None)
        n["options"]["offsetsFile"] = table_file(n["id"])
    return n
calib = [w for w in c["wires"] if ".table" in w["to"] and w["to"].split(".")[0] in nodes
         and nodes[w["to"].split(".")[0]]["plugin"] == "deskew" and w["to"].split(".")[1].startswith("table")]
plain = [w for w in c["wires"] if w not in calib]
def upstream(ids):
    keep, todo = set(), list(ids)
    while todo:
        i = todo.pop()
        if i not in keep:
            keep.add(i)
            todo += [w["from"].split(".")[0] for w in plain if w["to"].split(".")[0] == i]
    return keep
def write(name, ids):
    ns = [fixed(n) for i, n in nodes.items() if i in ids]
    ws = [w for w in plain if w["from"].split(".")[0] in ids and w["to"].split(".")[0] in ids]
    json.dump({"description": name, "nodes": ns, "wires": ws}, open(os.path.join(outdir, name + ".json"), "w"), indent=1)
write("1-legs", upstream(legs_est))
write("2-lanes", upstream(lane_est))
write("3-decode", set(nodes) - set(est))
EOF

merge() {   # merge every OUT/<prefix>*-skew.json into one table
  "$PY" - "$@" <<'EOF'
import glob, json, sys
outdir, prefix, target = sys.argv[1], sys.argv[2], sys.argv[3]
ch = {}
for f in sorted(glob.glob(outdir + "/" + prefix + "*-skew.json")):
    ch.update(json.load(open(f))["channels"])
json.dump({"format": "lanesift-skew-table", "version": 1, "channels": ch}, open(target, "w"))
EOF
}
now() { date +%s.%N; }
SIFT=()
CHAINS=()
for i in $(seq 1 "$RUNS"); do
  rm -rf "$WORK/s" "$WORK/p1" "$WORK/p2" "$WORK/p3"
  t0=$(now)
  ./lanesift sift --capture "$CAP" --out "$WORK/s" --quiet
  t1=$(now)
  ./lanesift run "$WORK/chains/1-legs.json" --out "$WORK/p1" --quiet
  merge "$WORK/p1" legs- "$WORK/chains/legs.json"
  ./lanesift run "$WORK/chains/2-lanes.json" --out "$WORK/p2" --quiet
  merge "$WORK/p2" lanes "$WORK/chains/lanes.json"
  ./lanesift run "$WORK/chains/3-decode.json" --out "$WORK/p3" --quiet
  t2=$(now)
  SIFT+=("$(awk -v a="$t0" -v b="$t1" 'BEGIN { printf "%.2f", b - a }')")
  CHAINS+=("$(awk -v a="$t1" -v b="$t2" 'BEGIN { printf "%.2f", b - a }')")
  echo "run $i: sift ${SIFT[-1]} s, three chains ${CHAINS[-1]} s" >&2
done
# the decode of both must agree (same frames) or the timing compares different work
cmp "$WORK/s/decode/panel-timing.json" "$WORK/p3/panel-timing.json"
source bench/scripts/stats.sh
echo "capture $(basename "$CAP") ($(awk -v s="$(stat -c %s "$CAP")" 'BEGIN { printf "%.1f MB", s / 1e6 }'), $RUNS interleaved runs, $(nproc) cores, load $(cut -d' ' -f1-3 /proc/loadavg))"
echo "  sift:         $(min_med_max_s "${SIFT[@]}")"
echo "  three chains: $(min_med_max_s "${CHAINS[@]}")"
awk -v s="$(median "${SIFT[@]}")" -v c="$(median "${CHAINS[@]}")" 'BEGIN { printf "  ratio of medians sift / three chains: %.2f (target <= 1.5)\n", s / c }'
