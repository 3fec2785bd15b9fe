package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.condition.EnabledIfSystemProperty;

/**
 * Discovery accuracy over 200 random link formats drawn by {@link LinkFormatGenerator} (seeded).
 * Bars from the issue: 95 % top-1 for word length, bit order, sync and clocking; 90 % of the
 * pictures among the top 3 candidates. They are asserted separately for links whose clock
 * pauses between bursts and for links that idle at a level between bursts on a running clock
 * (two tables, {@link AccuracyTables}; the streaming links among them, a quarter of the
 * others, are counted in a third table), and on 60 links that stream with no pause, framed by
 * their sync alone. The methods behind each row: clocking from the circular
 * histogram of data-transition phases; sync as the bursts' common prefix (majority per bit);
 * word length from the burst lengths (whole words after the sync; on idle-run links the
 * likelihood of the hidden idle-level tails, a Bayesian model comparison), with the autocorrelation of
 * the bit stream and the entropy per bit position as evidence; bit order and lane distribution
 * from the smoothness of the decoded picture (neighbour-pixel correlation) and the entropy slope
 * across a word; line length from the autocorrelation peak of the pixel values (computed by FFT,
 * Wiener-Khinchin); checksums from the CRC RevEng catalogue's parameter sets, each checked
 * against its catalogue check value in {@link CrcCatalogueTest}.
 *
 * <p>The default build checks two seeds (the test seed and seed 7). More seeds:
 * {@code mvn -o -pl plugins/discovery -am verify -Dtest=DiscoveryAccuracyTest -Dsurefire.failIfNoSpecifiedTests=false
 * -Ddiscovery.seeds=7,1,2,3,4} (about 20 s a seed).
 */
class DiscoveryAccuracyTest {
    static final int FORMATS = 200;
    static final int STREAMING_FORMATS = 60;

    @Test
    void meetsTheBarsOfTheIssueOnTheTestSeed() {
        assertBars(20_2026L);
    }

    @Test
    void meetsTheBarsOfTheIssueOnSeed7() {
        assertBars(7L);
    }

    /** Links that stream with no pause and no idle run, framed by their sync alone (16 to 24 bits). */
    @Test
    void meetsTheBarsOfTheIssueOnStreamingLinks() {
        AccuracyTables a = AccuracyTables.measure(new LinkFormatGenerator(20_2026L).streamingOnly(), 20_2026L, STREAMING_FORMATS);
        report(a);
        List<String> missed = a.missedBars(AccuracyTables.STREAMING);
        assertTrue(missed.isEmpty(), () -> String.join("\n", missed) + a.table());
    }

    @Test
    @EnabledIfSystemProperty(named = "discovery.seeds", matches = "[0-9, _]+")
    void meetsTheBarsOfTheIssueOnEverySeedAsked() {
        List<String> missed = new ArrayList<>();
        StringBuilder all = new StringBuilder();
        for (String s : System.getProperty("discovery.seeds").split(",")) {
            long seed = Long.parseLong(s.replace("_", "").trim());
            AccuracyTables a = AccuracyTables.measure(seed, FORMATS);
            AccuracyTables st = AccuracyTables.measure(new LinkFormatGenerator(seed).streamingOnly(), seed, STREAMING_FORMATS);
            for (AccuracyTables t : new AccuracyTables[] {a, st}) {
                all.append(t.table());
                report(t);
            }
            missed.addAll(a.missedBars(AccuracyTables.CLOCK_PAUSES, AccuracyTables.IDLE_RUNS));
            missed.addAll(st.missedBars(AccuracyTables.STREAMING));
        }
        assertTrue(missed.isEmpty(), () -> String.join("\n", missed) + all);
    }

    private static void assertBars(long seed) {
        AccuracyTables a = AccuracyTables.measure(seed, FORMATS);
        report(a);
        List<String> missed = a.missedBars(AccuracyTables.CLOCK_PAUSES, AccuracyTables.IDLE_RUNS);
        assertTrue(missed.isEmpty(), () -> String.join("\n", missed) + a.table());
    }

    private static void report(AccuracyTables a) {
        System.out.println(a.table());
        a.misses.stream().limit(40).forEach(System.out::println);
    }
}
