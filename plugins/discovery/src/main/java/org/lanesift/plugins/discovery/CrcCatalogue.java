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
     * the bits before them. Returns the best model (most matches), or null when none matches at least
     * {@code minShare} of the bursts.
     */
    static Match search(List<MergedBurst> bursts, int maxBursts, double minShare) {
        Match best = null;
        for (CrcModel m : MODELS) {
            int ok = 0;
            int tested = 0;
            for (int i = 0; i < bursts.size() && tested < maxBursts; i++) {
                MergedBurst b = bursts.get(i);
                if (b.length() < m.width() + 8) {
                    continue;
                }
                tested++;
                int data = b.length() - m.width();
                if (m.of(b.bits(), 0, data) == m.sent(b.bits(), data)) {
                    ok++;
                }
            }
            Match x = new Match(m, ok, tested);
            if (tested > 0 && x.share() >= minShare && (best == null || x.share() > best.share()
                    || (x.share() == best.share() && m.width() > best.model().width()))) {
                best = x;
            }
        }
        return best;
    }
}
