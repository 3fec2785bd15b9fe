#!/usr/bin/env bash
# Speed of the one command (not a unit test): `lanesift sift` on a capture against the three chain
# files it wrote (leg skew, lane skew, decode) run one after another with `lanesift run`, on the
# same capture in the same script run. Prints both wall times and their ratio. sift also inspects
# the capture (pairs, clock, levels) and merges the tables; the chains are each a JVM launch, sift
# is one. Without arguments it uses the demo's two captures (a 34 MB CSV and a 22 MB raw file).
# Usage: bench/scripts/sift-vs-chains.sh [CAPTURE ...]
set -euo pipefail
cd "$(dirname "$0")/../.."
WORK="$(mktemp -d /tmp/lanesift-sift-bench.XXXXXX)"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
if [ "$#" -eq 0 ]; then
  ./lanesift demo --out "$WORK/demo" --quiet >/dev/null
  set -- "$WORK/demo/captures/packet-link.csv" "$WORK/demo/captures/pixel-link.bin"
fi
now() { date +%s.%N; }
for CAP in "$@"; do
  OUT="$WORK/$(basename "$CAP").sift"
  t0=$(now)
  ./lanesift sift --capture "$CAP" --out "$OUT" --quiet
  t1=$(now)
  for C in 1-legs 2-lanes 3-decode; do
    ./lanesift run "$OUT/chains/$C.json" --out "$WORK/$(basename "$CAP").$C" --quiet
  done
  t2=$(now)
  awk -v f="$(basename "$CAP")" -v size="$(stat -c %s "$CAP")" -v a="$t0" -v b="$t1" -v c="$t2" \
    'BEGIN { s = b - a; r = c - b; printf "%s (%.1f MB): sift %.1f s, three chains %.1f s, ratio %.2f\n", f, size / 1e6, s, r, s / r }'
done
rm -rf "$WORK"
