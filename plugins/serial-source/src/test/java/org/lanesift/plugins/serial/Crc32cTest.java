package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.zip.CRC32C;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import org.junit.jupiter.api.Test;

class Crc32cTest {
    @Test
    void checkValueFromTheCatalogue() {
        // CRC RevEng catalogue, CRC-32/ISCSI (alias CRC-32C): check = 0xE3069283 for ASCII "123456789"
        byte[] b = "123456789".getBytes(StandardCharsets.US_ASCII);
        assertEquals(0xE3069283, Crc32c.of(b, 0, b.length));
        assertEquals(0xE3069283, ~Crc32c.update(0xFFFFFFFF, b, 0, b.length), "the table form");
    }

    @Property(tries = 200)
    void tableFormAgreesWithTheJdkImplementation(@ForAll byte[] data) {
        // reference implementation: java.util.zip.CRC32C (JDK 9+, RFC 3720 CRC32C)
        CRC32C ref = new CRC32C();
        ref.update(data);
        assertEquals((int) ref.getValue(), ~Crc32c.update(0xFFFFFFFF, data, 0, data.length));
    }

    @Property(tries = 200)
    void oneShotOfARangeAgreesWithTheTableForm(@ForAll byte[] data, @ForAll @net.jqwik.api.constraints.IntRange(min = 0, max = 64) int cut) {
        int off = Math.min(cut, data.length);
        int len = data.length - off;
        assertEquals(~Crc32c.update(0xFFFFFFFF, data, off, len), Crc32c.of(data, off, len));
    }

    @Test
    void runningRegisterEqualsOneShot() {
        byte[] b = "123456789".getBytes(StandardCharsets.US_ASCII);
        int reg = Crc32c.update(0xFFFFFFFF, b, 0, 4);
        reg = Crc32c.update(reg, b, 4, 5);
        assertEquals(0xE3069283, ~reg);
    }
}
