/*
 * Test transmitter for the init-sequence closed loop (InitReplayTest). It walks the tables of the
 * generated header the way firmware would, and re-encodes every record into the bytes of a DSI
 * packet: data identifier, two data bytes (short) or word count (long), header ECC, and for a long
 * packet the payload and its 16-bit checksum. One line per packet on stdout:
 *     <lp|hs> <wait_us> <packet bytes in hex, space separated>
 * and "--" between the init table and the frame-window table.
 *
 * ECC: each parity bit is the XOR of the header bits listed in docs/reference-facts.md
 * (section "DSI packets, ECC and checksum"). Checksum: CRC-16, polynomial x^16+x^12+x^5+1
 * reflected (0x8408), initial value 0xFFFF, no final XOR (CRC-16/MCRF4XX in the CRC RevEng
 * catalogue), sent least significant byte first. Written from those rules, not from Lanesift's Java.
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include "dut-init.h"

static const uint32_t PARITY_SETS[6] = {
    /* bit lists of docs/reference-facts.md written as masks over the 24 header bits */
    (1u << 0) | (1u << 1) | (1u << 2) | (1u << 4) | (1u << 5) | (1u << 7) | (1u << 10) | (1u << 11) | (1u << 13) | (1u << 16)
        | (1u << 20) | (1u << 21) | (1u << 22) | (1u << 23),
    (1u << 0) | (1u << 1) | (1u << 3) | (1u << 4) | (1u << 6) | (1u << 8) | (1u << 10) | (1u << 12) | (1u << 14) | (1u << 17)
        | (1u << 20) | (1u << 21) | (1u << 22) | (1u << 23),
    (1u << 0) | (1u << 2) | (1u << 3) | (1u << 5) | (1u << 6) | (1u << 9) | (1u << 11) | (1u << 12) | (1u << 15) | (1u << 18)
        | (1u << 20) | (1u << 21) | (1u << 22),
    (1u << 1) | (1u << 2) | (1u << 3) | (1u << 7) | (1u << 8) | (1u << 9) | (1u << 13) | (1u << 14) | (1u << 15) | (1u << 19)
        | (1u << 20) | (1u << 21) | (1u << 23),
    (1u << 4) | (1u << 5) | (1u << 6) | (1u << 7) | (1u << 8) | (1u << 9) | (1u << 16) | (1u << 17) | (1u << 18) | (1u << 19)
        | (1u << 20) | (1u << 22) | (1u << 23),
    (1u << 10) | (1u << 11) | (1u << 12) | (1u << 13) | (1u << 14) | (1u << 15) | (1u << 16) | (1u << 17) | (1u << 18)
        | (1u << 19) | (1u << 21) | (1u << 22) | (1u << 23),
};

static uint8_t header_ecc(uint8_t b0, uint8_t b1, uint8_t b2) {
    uint32_t h = (uint32_t) b0 | (uint32_t) b1 << 8 | (uint32_t) b2 << 16;
    uint8_t e = 0;
    for (int p = 0; p < 6; p++) {
        uint32_t x = h & PARITY_SETS[p];
        int ones = 0;
        while (x) {
            ones ^= 1;
            x &= x - 1;
        }
        e |= (uint8_t) (ones << p);
    }
    return e;
}

static uint16_t payload_crc(const uint8_t *d, unsigned n) {
    uint16_t c = 0xFFFF;
    for (unsigned i = 0; i < n; i++) {
        c ^= d[i];
        for (int k = 0; k < 8; k++) {
            c = (c & 1) ? (uint16_t) ((c >> 1) ^ 0x8408) : (uint16_t) (c >> 1);
        }
    }
    return c;
}

/* the test transmitter: one packet out, as hex */
static void transmit(uint8_t flags, uint8_t data_id, const uint8_t *data, unsigned count, uint32_t wait_us) {
    uint8_t b1, b2;
    if (flags & DUT_LONG) {
        b1 = (uint8_t) (count & 0xFF);
        b2 = (uint8_t) (count >> 8);
    } else {
        if (count != 2) {
            fprintf(stderr, "short packet record with %u data bytes\n", count);
            exit(3);
        }
        b1 = data[0];
        b2 = data[1];
    }
    printf("%s %lu %02X %02X %02X %02X", (flags & DUT_LP) ? "lp" : "hs", (unsigned long) wait_us, data_id, b1, b2,
           header_ecc(data_id, b1, b2));
    if (flags & DUT_LONG) {
        uint16_t c = payload_crc(data, count);
        for (unsigned i = 0; i < count; i++) {
            printf(" %02X", data[i]);
        }
        printf(" %02X %02X", c & 0xFF, c >> 8);
    }
    printf("\n");
}

/* the replay loop a firmware author would write (docs/init-sequence.md) */
static unsigned replay(const uint8_t *p) {
    unsigned records = 0;
    while (p[0] != DUT_END) {
        uint8_t flags = p[0];
        uint8_t data_id = p[1];
        unsigned count = (unsigned) p[2] | (unsigned) p[3] << 8;
        const uint8_t *data = p + 4;
        const uint8_t *w = data + count;
        uint32_t wait_us = (uint32_t) w[0] | (uint32_t) w[1] << 8 | (uint32_t) w[2] << 16 | (uint32_t) w[3] << 24;
        transmit(flags, data_id, data, count, wait_us);
        /* firmware: if (wait_us) delay_us(wait_us); */
        p = w + 4;
        records++;
    }
    return records;
}

int main(void) {
    if (replay(dut_init) != DUT_INIT_RECORDS) {
        fprintf(stderr, "record count differs from DUT_INIT_RECORDS\n");
        return 4;
    }
    printf("--\n");
    if (replay(dut_frame_window) != DUT_FRAME_WINDOW_RECORDS) {
        fprintf(stderr, "record count differs from DUT_FRAME_WINDOW_RECORDS\n");
        return 4;
    }
    printf("config %d %lu %d %d\n", DUT_LINK_LANES, DUT_LINK_HS_BIT_RATE_HZ, DUT_LINK_PIXEL_BITS, DUT_LINK_VIDEO_MODE);
    printf("frames %d %d %d\n", DUT_FRAME_WRITES, DUT_FRAME_PIXEL_BYTES, DUT_FRAME_WRITE_PACKETS);
    return 0;
}
