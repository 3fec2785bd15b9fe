package org.lanesift.plugins.discovery;

import java.util.List;

/**
 * The CRC parameter sets tried on every burst. Source: the CRC RevEng catalogue ("Catalogue of
 * parametrised CRC algorithms", reveng.sourceforge.io), entries and check values from memory;
 * docs/reference-facts.md#crc-check-values lists the ones the project relies on. Each model is
 * checked against its check value in {@code CrcCatalogueTest}; the two 32-bit ones also against the
 * JDK's {@code java.util.zip.CRC32} and {@code CRC32C}.
 */
final class CrcCatalogue {
    /** Catalogue entries, widths 8, 16 and 32. */
    static final List<CrcModel> MODELS = List.of(
            new CrcModel("CRC-8/SMBUS", 8, 0x07, 0x00, false, false, 0x00, 0xF4),
            new CrcModel("CRC-8/MAXIM-DOW", 8, 0x31, 0x00, true, true, 0x00, 0xA1),
            new CrcModel("CRC-8/AUTOSAR", 8, 0x2F, 0xFF, false, false, 0xFF, 0xDF),
            new CrcModel("CRC-8/SAE-J1850", 8, 0x1D, 0xFF, false, false, 0xFF, 0x4B),
            new CrcModel("CRC-8/BLUETOOTH", 8, 0xA7, 0x00, true, true, 0x00, 0x26),
            new CrcModel("CRC-16/IBM-3740", 16, 0x1021, 0xFFFF, false, false, 0x0000, 0x29B1),
            new CrcModel("CRC-16/MCRF4XX", 16, 0x1021, 0xFFFF, true, true, 0x0000, 0x6F91),
            new CrcModel("CRC-16/KERMIT", 16, 0x1021, 0x0000, true, true, 0x0000, 0x2189),
            new CrcModel("CRC-16/XMODEM", 16, 0x1021, 0x0000, false, false, 0x0000, 0x31C3),
            new CrcModel("CRC-16/IBM-SDLC", 16, 0x1021, 0xFFFF, true, true, 0xFFFF, 0x906E),
            new CrcModel("CRC-16/ARC", 16, 0x8005, 0x0000, true, true, 0x0000, 0xBB3D),
            new CrcModel("CRC-16/MODBUS", 16, 0x8005, 0xFFFF, true, true, 0x0000, 0x4B37),
            new CrcModel("CRC-16/UMTS", 16, 0x8005, 0x0000, false, false, 0x0000, 0xFEE8),
            new CrcModel("CRC-32/ISO-HDLC", 32, 0x04C11DB7L, 0xFFFFFFFFL, true, true, 0xFFFFFFFFL, 0xCBF43926L),
            new CrcModel("CRC-32/ISCSI", 32, 0x1EDC6F41L, 0xFFFFFFFFL, true, true, 0xFFFFFFFFL, 0xE3069283L),
            new CrcModel("CRC-32/BZIP2", 32, 0x04C11DB7L, 0xFFFFFFFFL, false, false, 0xFFFFFFFFL, 0xFC891918L),
            new CrcModel("CRC-32/MPEG-2", 32, 0x04C11DB7L, 0xFFFFFFFFL, false, false, 0x00000000L, 0x0376E6E7L));

    /** Bursts after which a model that matched fewer than half is dropped. */
    static final int EARLY_OUT = 8;

    private CrcCatalogue() {
    }

    /**
     * A checksum found.
     *
     * @param model   the parameter set
     * @param matched bursts whose last {@code width} bits are the CRC of the bits before them
     * @param tested  bursts tried
     */
    record Match(CrcModel model, int matched, int tested) {
        double share() {
            return tested == 0 ? 0 : matched / (double) tested;
        }
    }

    /**
     * Tries every model on the payload of each burst: the last {@code width} bits against the CRC of
     * the bits before them. Returns every model that matches at least {@code minShare} of the
     * bursts tried, most matches first.
     */
    static List<Match> search(List<MergedBurst> bursts, int maxBursts, double minShare) {
        // the shortest bursts first: a checksum covers every burst, and short ones cost least
        List<MergedBurst> order = new java.util.ArrayList<>(bursts);
        order.sort(java.util.Comparator.comparingInt(MergedBurst::length));
        List<Match> found = new java.util.ArrayList<>();
        for (CrcModel m : MODELS) {
            int ok = 0;
            int tested = 0;
            for (int i = 0; i < order.size() && tested < maxBursts; i++) {
                MergedBurst b = order.get(i);
                if (b.length() < m.width() + 8) {
                    continue;
                }
                tested++;
                int data = b.length() - m.width();
                if (m.of(b.bits(), 0, data) == m.sent(b.bits(), data)) {
                    ok++;
                }
                if (tested == EARLY_OUT && ok < EARLY_OUT / 2) {
                    break; // a model that holds on every burst does not miss half of the first ones
                }
            }
            Match x = new Match(m, ok, tested);
            if (tested > 0 && x.share() >= minShare) {
                found.add(x);
            }
        }
        found.sort((x, y) -> x.share() != y.share() ? Double.compare(y.share(), x.share()) : Integer.compare(y.model().width(), x.model().width()));
        return found;
    }

    /**
     * The best match for a bit order. On a bit-serial link a reflected model whose result is sent
     * LSB first gives the same bits as its direct twin sent MSB first (same polynomial, init and
     * final XOR), so both match; the one whose input order agrees with the words' bit order (LSB
     * first: reflected) is named, and the twin is listed in the report.
     */
    static Match pick(List<Match> found, boolean msbFirst) {
        Match best = null;
        for (Match m : found) {
            if (best == null || m.share() > best.share()
                    || (m.share() == best.share() && m.model().width() == best.model().width() && m.model().refin() == !msbFirst
                    && best.model().refin() == msbFirst)) {
                best = m;
            }
        }
        return best;
    }

    /** Models that give the same wire bits as {@code m}: same width, polynomial, init and final XOR, reflection swapped. */
    static List<CrcModel> twins(CrcModel m) {
        List<CrcModel> out = new java.util.ArrayList<>();
        for (CrcModel x : MODELS) {
            if (x != m && x.width() == m.width() && x.poly() == m.poly() && x.init() == m.init() && x.xorout() == m.xorout()
                    && x.refin() == x.refout() && m.refin() == m.refout()) {
                out.add(x);
            }
        }
        return out;
    }
}
