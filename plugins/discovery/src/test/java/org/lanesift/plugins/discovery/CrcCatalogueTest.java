package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.Random;
import java.util.zip.CRC32;
import java.util.zip.CRC32C;
import org.junit.jupiter.api.Test;

/** The CRC models against their published check values and against the JDK's CRC-32 implementations. */
class CrcCatalogueTest {
    private static final byte[] CHECK = "123456789".getBytes(StandardCharsets.US_ASCII);

    // Source: the CRC RevEng catalogue, check value = CRC of the ASCII string "123456789"
    // (from memory; the values the project relies on are also in docs/reference-facts.md#crc-check-values)
    @Test
    void everyModelGivesItsCatalogueCheckValue() {
        for (CrcModel m : CrcCatalogue.MODELS) {
            long got = m.of(m.wireBits(CHECK), 0, CHECK.length * 8);
            assertEquals(m.check(), got, m.name() + String.format(": got 0x%X, catalogue check 0x%X", got, m.check()));
        }
    }

    // Source: the JDK's java.util.zip.CRC32 (ISO-HDLC / zlib parameters) and CRC32C (Castagnoli, iSCSI)
    @Test
    void thirtyTwoBitModelsAgreeWithTheJdk() {
        Random r = new Random(32);
        for (int t = 0; t < 50; t++) {
            byte[] b = new byte[1 + r.nextInt(200)];
            r.nextBytes(b);
            CRC32 a = new CRC32();
            a.update(b);
            CRC32C c = new CRC32C();
            c.update(b);
            CrcModel hdlc = byName("CRC-32/ISO-HDLC");
            CrcModel iscsi = byName("CRC-32/ISCSI");
            assertEquals(a.getValue(), hdlc.of(hdlc.wireBits(b), 0, b.length * 8));
            assertEquals(c.getValue(), iscsi.of(iscsi.wireBits(b), 0, b.length * 8));
        }
    }

    static CrcModel byName(String n) {
        return CrcCatalogue.MODELS.stream().filter(m -> m.name().equals(n)).findFirst().orElseThrow();
    }
}
