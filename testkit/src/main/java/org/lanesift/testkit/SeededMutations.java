package org.lanesift.testkit;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.stream.Stream;

/**
 * A short fuzzing session for plain {@code mvn verify} (issue 18 item 8): the Jazzer agent needs
 * about 30 s to start per session, so instead each fuzz target is driven here by a fixed number of
 * seeded mutations (byte flips, inserts, deletes, repeats, splices of two seeds, interesting
 * numbers) of its seed corpus, in the test JVM, without coverage guidance. The same targets run
 * guided under {@code -Pfuzz} (DEVELOPERS.md, "Fuzz tests"). Deterministic: a failure names the
 * seed file and the mutation number, and reproduces with the same numbers.
 */
public final class SeededMutations {
    /** One fuzz target: accepts the bytes or throws (an assertion error or undeclared exception is a finding). */
    public interface Target {
        void accept(byte[] data) throws Exception;
    }

    private static final String[] TOKENS = {"0", "-1", "1e309", "NaN", "inf", "9223372036854775807", "\u00b5", ",", ";", "\t",
        "\n", "\r", "\"", "{", "}", "[", "]", ":", "$end", "#", "\u0000", "1e-19", "-0"};

    private SeededMutations() {
    }

    /**
     * Runs {@code perSeed} mutations of every file in {@code seedDir} through the target.
     *
     * @return the number of executions
     */
    public static int run(Path seedDir, int perSeed, long seed, Target target) throws Exception {
        List<Path> seeds;
        try (Stream<Path> s = Files.list(seedDir)) {
            seeds = s.filter(Files::isRegularFile).sorted().toList();
        }
        if (seeds.isEmpty()) {
            throw new AssertionError("no seed inputs in " + seedDir);
        }
        List<byte[]> corpus = new ArrayList<>();
        List<String> names = new ArrayList<>();
        for (Path p : seeds) {
            corpus.add(Files.readAllBytes(p));
            names.add(p.getFileName().toString());
        }
        return run(corpus, names, perSeed, seed, target);
    }

    /**
     * Runs {@code perSeed} mutations of every seed through the target.
     *
     * @param corpus seed inputs
     * @param names  their names, for a failure message
     * @return the number of executions
     */
    public static int run(List<byte[]> corpus, List<String> names, int perSeed, long seed, Target target) throws Exception {
        if (corpus.isEmpty()) {
            throw new AssertionError("no seed inputs");
        }
        SplittableRandom rnd = new SplittableRandom(seed);
        int runs = 0;
        for (int i = 0; i < corpus.size(); i++) {
            for (int m = 0; m < perSeed; m++) {
                byte[] in = mutate(corpus.get(i), corpus.get(rnd.nextInt(corpus.size())), rnd);
                try {
                    target.accept(in);
                } catch (Exception | AssertionError e) {
                    throw new AssertionError("seed " + names.get(i) + ", mutation " + m + " (random seed " + seed
                            + "): " + e, e);
                }
                runs++;
            }
        }
        return runs;
    }

    /** One to four stacked mutations of {@code a}, possibly spliced with {@code b}. */
    public static byte[] mutate(byte[] a, byte[] b, SplittableRandom rnd) {
        byte[] x = a.clone();
        int k = 1 + rnd.nextInt(4);
        for (int j = 0; j < k; j++) {
            int at = x.length == 0 ? 0 : rnd.nextInt(x.length);
            switch (rnd.nextInt(6)) {
                case 0 -> { // flip a bit
                    if (x.length > 0) {
                        x[at] ^= (byte) (1 << rnd.nextInt(8));
                    }
                }
                case 1 -> x = splice(x, at, rnd.nextInt(1 + Math.min(16, x.length - at)), new byte[0]); // delete
                case 2 -> { // insert a token of the trade's formats
                    byte[] t = TOKENS[rnd.nextInt(TOKENS.length)].getBytes(java.nio.charset.StandardCharsets.UTF_8);
                    x = splice(x, at, 0, t);
                }
                case 3 -> { // repeat a slice
                    int n = rnd.nextInt(1 + Math.min(64, x.length - at));
                    x = splice(x, at, 0, java.util.Arrays.copyOfRange(x, at, at + n));
                }
                case 4 -> { // splice the tail of another seed
                    int from = b.length == 0 ? 0 : rnd.nextInt(b.length);
                    x = splice(x, at, x.length - at, java.util.Arrays.copyOfRange(b, from, b.length));
                }
                default -> { // a random byte
                    if (x.length > 0) {
                        x[at] = (byte) rnd.nextInt(256);
                    }
                }
            }
        }
        return x;
    }

    private static byte[] splice(byte[] x, int at, int remove, byte[] insert) {
        byte[] y = new byte[x.length - remove + insert.length];
        System.arraycopy(x, 0, y, 0, at);
        System.arraycopy(insert, 0, y, at, insert.length);
        System.arraycopy(x, at + remove, y, at + insert.length, x.length - at - remove);
        return y;
    }
}
