package org.lanesift.plugins.serial;

import org.lanesift.plugin.OptionException;
import java.util.List;

/** Lists and opens serial ports; {@link JSerialCommPorts} is the real one, tests fake it. */
public interface SerialPorts {
    /**
     * Lists the ports the system enumerates (pseudo-terminals do not appear).
     *
     * @return ports
     */
    List<PortInfo> list();

    /**
     * Opens a port by system name or path (a pseudo-terminal's link path works too), 8N1.
     *
     * @param name     name or path
     * @param baudRate baud rate (ignored by USB CDC devices and pseudo-terminals)
     * @return the open link
     * @throws org.lanesift.plugin.OptionException when it cannot be opened, naming the port
     */
    SerialLink open(String name, int baudRate);

    /**
     * Opens the first listed port with a USB vendor and product id.
     *
     * @param vendorId  USB vendor id
     * @param productId USB product id
     * @param baudRate  baud rate
     * @return the open link
     * @throws org.lanesift.plugin.OptionException when no listed port has the id, listing the ids there are
     */
    default SerialLink openById(int vendorId, int productId, int baudRate) {
        List<PortInfo> ports = list();
        for (PortInfo p : ports) {
            if (p.vendorId() == vendorId && p.productId() == productId) {
                return open(p.path(), baudRate);
            }
        }
        String wanted = String.format("%04x:%04x", vendorId, productId);
        String have = ports.stream().map(PortInfo::usbId).filter(s -> !s.isEmpty()).distinct().reduce((a, b) -> a + ", " + b).orElse("none");
        throw new OptionException("device", "--device " + wanted + ": no port with this USB id; ids present: " + have);
    }

    /**
     * Parses {@code VVVV:PPPP} (hex).
     *
     * @param text the id text
     * @return {vendor, product}
     * @throws org.lanesift.plugin.OptionException if it is not two 1-4 digit hex numbers
     */
    static int[] parseUsbId(String text) {
        if (text == null || !text.matches("[0-9a-fA-F]{1,4}:[0-9a-fA-F]{1,4}")) {
            throw new OptionException("device", "--device " + text + ": expected VID:PID in hex, such as 1209:0001");
        }
        String[] p = text.split(":");
        return new int[] {Integer.parseInt(p[0], 16), Integer.parseInt(p[1], 16)};
    }
}
