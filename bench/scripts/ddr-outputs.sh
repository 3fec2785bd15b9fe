#!/usr/bin/env bash
# Output-writing cost on a DDR chain (not a unit test; issue 19 item 1). Generates a raw float32
# capture of four differential pairs (a 104 MHz clock and three data lanes at 208 Mbit/s, both clock
# edges, 2.5 GS/s, random data, a little noise), then decodes it with raw -> 4 x differential
# (fixed threshold) -> dual-edge, which writes the bits CSVs and the VCD of the comparator levels.
# Each round runs the jar under test and, when given, a second jar (e.g. one built before a change)
# on the same file, alternately, and prints both wall times and their ratio in that round; with
# JFR=1 it also records one run of each and prints the share of execution samples in the writers
# (org.lanesift.runner.output) next to the whole run.
# Usage: bench/scripts/ddr-outputs.sh [MEGABYTES] [ROUNDS] [OTHER_JAR] [WORKDIR]
set -euo pipefail
cd "$(dirname "$0")/../.."
MB="${1:-400}"
ROUNDS="${2:-3}"
OTHER="${3:-}"
WORK="${4:-$(mktemp -d /tmp/lanesift-ddr.XXXXXX)}"
mkdir -p "$WORK"
./lanesift --version >/dev/null            # builds dist/target/lanesift.jar if needed
JAR="$WORK/under-test.jar"
cp dist/target/lanesift.jar "$JAR"
FRAMES=$(( MB * 1000000 / 32 ))
if [ ! -f "$WORK/ddr.bin" ]; then
  cat > "$WORK/Gen.java" <<'JAVA'
import java.io.*;
import java.nio.*;
import java.nio.channels.FileChannel;
import java.nio.file.*;
import java.util.Random;
/** Four pairs (CLK, D0..D2), float32 little-endian legs interleaved; 24 samples per clock period. */
public class Gen {
    public static void main(String[] a) throws IOException {
        long frames = Long.parseLong(a[1]);
        Random r = new Random(19);
        int ui = 24; // samples per clock period (104 MHz); data changes a quarter period after each clock edge
        boolean[] bit = new boolean[3];
        ByteBuffer b = ByteBuffer.allocate(32 * 65536).order(ByteOrder.LITTLE_ENDIAN);
        try (FileChannel ch = FileChannel.open(Path.of(a[0]), StandardOpenOption.CREATE, StandardOpenOption.WRITE,
                StandardOpenOption.TRUNCATE_EXISTING)) {
            for (long i = 0; i < frames; i++) {
                int ph = (int) (i % ui);
                double clk = ramp(ph, 0) - ramp(ph, ui / 2.0);       // +1 first half, -1 second half
                if ((i + ui / 4) % (ui / 2) == 0 || i == 0) {
                    for (int k = 0; k < 3; k++) {
                        bit[k] = r.nextBoolean();
                    }
                }
                put(b, 2 * clk - 1, r);
                for (int k = 0; k < 3; k++) {
                    put(b, bit[k] ? 1 : -1, r);
                }
                if (!b.hasRemaining()) {
                    b.flip();
                    ch.write(b);
                    b.clear();
                }
            }
            b.flip();
            ch.write(b);
        }
        Files.writeString(Path.of(a[0] + ".json"), "{\"rateHz\": 2.5e9, \"format\": \"float32le\", \"channels\": ["
                + "{\"name\": \"CLK_P\"}, {\"name\": \"CLK_N\"}, {\"name\": \"D0_P\"}, {\"name\": \"D0_N\"},"
                + "{\"name\": \"D1_P\"}, {\"name\": \"D1_N\"}, {\"name\": \"D2_P\"}, {\"name\": \"D2_N\"}]}\n");
    }
    /** 0 before the edge at phase e, rising over 3 samples to 1. */
    static double ramp(int ph, double e) {
        return Math.max(0, Math.min(1, (ph - e + 1.5) / 3.0));
    }
    static void put(ByteBuffer b, double s, Random r) {
        double d = 0.175 * s; // +/-350 mV differential
        b.putFloat((float) (1.2 + d + 0.005 * r.nextGaussian()));
        b.putFloat((float) (1.2 - d + 0.005 * r.nextGaussian()));
    }
}
JAVA
  java "$WORK/Gen.java" "$WORK/ddr.bin" "$FRAMES"
fi
pair() { # id name
  echo "{\"id\": \"$1\", \"plugin\": \"differential\", \"options\": {\"name\": \"$2\", \"thresholdVolts\": 0.0, \"hysteresisVolts\": 0.05, \"levelReport\": false}}"
}
cat > "$WORK/ddr.json" <<JSON
{
  "description": "output-writing cost: raw float32 legs, four comparators with a fixed threshold, both-edge sampling",
  "nodes": [
    {"id": "cap", "plugin": "raw", "options": {"file": "ddr.bin"}},
    $(pair rx-CLK CLK), $(pair rx-D0 D0), $(pair rx-D1 D1), $(pair rx-D2 D2),
    {"id": "ddr", "plugin": "dual-edge", "options": {"mode": "ddr", "lanes": 3}}
  ],
  "wires": [
    {"from": "cap.CLK_P", "to": "rx-CLK.p"}, {"from": "cap.CLK_N", "to": "rx-CLK.n"},
    {"from": "cap.D0_P", "to": "rx-D0.p"}, {"from": "cap.D0_N", "to": "rx-D0.n"},
    {"from": "cap.D1_P", "to": "rx-D1.p"}, {"from": "cap.D1_N", "to": "rx-D1.n"},
    {"from": "cap.D2_P", "to": "rx-D2.p"}, {"from": "cap.D2_N", "to": "rx-D2.n"},
    {"from": "rx-CLK.edges", "to": "ddr.clock"}, {"from": "rx-D0.edges", "to": "ddr.lane0"},
    {"from": "rx-D1.edges", "to": "ddr.lane1"}, {"from": "rx-D2.edges", "to": "ddr.lane2"}
  ]
}
JSON
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
