package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.mockito.ArgumentMatchers.any;
import static org.mockito.ArgumentMatchers.anyInt;
import static org.mockito.ArgumentMatchers.eq;
import static org.mockito.Mockito.CALLS_REAL_METHODS;
import static org.mockito.Mockito.atLeastOnce;
import static org.mockito.Mockito.inOrder;
import static org.mockito.Mockito.mock;
import static org.mockito.Mockito.verify;
import static org.mockito.Mockito.when;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.ToolHarness;
import org.junit.jupiter.api.io.TempDir;
import org.mockito.InOrder;

/** The capture and the command against a faked port wrapper. */
class PortWrapperTest {
    @TempDir
    Path tmp;

    @Test
    void opensByUsbIdAndListsTheIdsThereAreOtherwise() {
        SerialPorts ports = mock(SerialPorts.class, CALLS_REAL_METHODS);
        SerialLink link = mock(SerialLink.class);
        when(ports.list()).thenReturn(List.of(new PortInfo("ttyACM0", "/dev/ttyACM0", "probe", 0x1209, 0x0001, "A1"),
                new PortInfo("ttyS0", "/dev/ttyS0", "uart", -1, -1, "")));
        when(ports.open("/dev/ttyACM0", 115200)).thenReturn(link);
        assertEquals(link, ports.openById(0x1209, 0x0001, 115200));
        org.lanesift.plugin.OptionException e = assertThrows(org.lanesift.plugin.OptionException.class, () -> ports.openById(0x1209, 0x0002, 115200));
        assertEquals("--device 1209:0002: no port with this USB id; ids present: 1209:0001", e.getMessage());
        assertThrows(org.lanesift.plugin.OptionException.class, () -> SerialPorts.parseUsbId("12345:1"));
    }

    @Test
    void listShowsNamesIdsAndSerialNumbers() {
        SerialPorts ports = mock(SerialPorts.class);
        when(ports.list()).thenReturn(List.of(new PortInfo("ttyACM0", "/dev/ttyACM0", "probe", 0x1209, 0x0001, "A1")));
        ToolHarness.Result r = ToolHarness.of(new CaptureTool(ports)).option("list", "true").run();
        assertEquals(0, r.code());
        String s = r.out();
        assertTrue(s.contains("ttyACM0") && s.contains("1209:0001") && s.contains("A1") && s.contains("probe"), s);
    }

    @Test
    void aSilentDeviceGetsOneClearLineAndTheSpoolIsStillClosed() {
        SerialPorts ports = mock(SerialPorts.class);
        SerialLink link = mock(SerialLink.class);
        when(link.name()).thenReturn("/dev/ttyACM0");
        when(ports.open(eq("/dev/ttyACM0"), anyInt())).thenReturn(link);
        when(link.read(any(), anyInt(), anyInt())).thenReturn(0);
        Path dir = tmp.resolve("s");
        ToolHarness.Result r = ToolHarness.of(new CaptureTool(ports)).option("port", "/dev/ttyACM0").option("out", dir.toString())
                .quiet(true).run();
        assertEquals(1, r.code());
        assertTrue(r.err().contains("no IDENT reply within 2000 ms"), r.err());
        assertTrue(java.nio.file.Files.exists(dir.resolve("spool.closed")));
        verify(link, atLeastOnce()).close();
    }

    @Test
    void badArgumentsExitTwoWithOneLine() {
        SerialPorts ports = mock(SerialPorts.class);
        // missing values and unknown options are the host's part: dist ToolCommandsTest
        for (String[] a : new String[][] {{"port", "a", "device", "1:2"}, {"duration", "soon", "simulate", "true"},
                {"simulate", "true", "raw", "true"}, {"device", "xyz"}, {"channels", "9", "simulate", "true"}}) {
            ToolHarness h = ToolHarness.of(new CaptureTool(ports)).option("out", tmp.resolve("bad").toString());
            for (int i = 0; i < a.length; i += 2) {
                h.option(a[i], a[i + 1]);
            }
            ToolHarness.Result r = h.run();
            assertEquals(2, r.code(), String.join(" ", a));
            assertEquals(1, r.err().lines().count(), r.err());
        }
    }

    @Test
    void scriptedDeviceIsIdentifiedStartedAndSpooledUntilItGoes() throws Exception {
        SerialLink link = mock(SerialLink.class);
        when(link.name()).thenReturn("mock");
        byte[] ident = Framing.encode(FrameType.IDENT, 0, DeviceSimulator.INFO.encode());
        byte[] payload = new byte[8 + 16];
        for (int i = 0; i < 16; i++) {
            payload[8 + i] = DeviceSimulator.sample(i);
        }
        byte[] data = Framing.encode(FrameType.DATA, 0, payload);
        byte[][] script = {ident, data};
        int[] step = {0};
        when(link.read(any(), anyInt(), anyInt())).thenAnswer(inv -> {
            if (step[0] >= script.length) {
                return -1;
            }
            byte[] b = script[step[0]++];
            System.arraycopy(b, 0, inv.getArgument(0), (int) inv.getArgument(1), b.length);
            return b.length;
        });
        Capture.Result r = new Capture(() -> link, tmp.resolve("m"), new Capture.Settings()).run();
        assertEquals(ident.length + data.length, r.bytes());
        assertEquals(1, r.frames());
        assertEquals("disconnect", r.reason());
        InOrder o = inOrder(link);
        o.verify(link).write(Framing.encode(FrameType.IDENTIFY, 0, new byte[0]));
        byte[] cfg = new byte[4];
        Framing.putU32(cfg, 0, 1_000_000);
        o.verify(link).write(Framing.encode(FrameType.CONFIGURE, 0, cfg));
        o.verify(link).write(Framing.encode(FrameType.START, 0, new byte[0]));
        Replayed p = new Replayed(tmp.resolve("m"));
        assertEquals("[0,16)", p.runsText());
    }
}
