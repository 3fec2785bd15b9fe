package org.lanesift.plugins.serial;

/**
 * One serial port as the operating system lists it.
 *
 * @param name         system port name, such as {@code ttyACM0}
 * @param path         path to open, such as {@code /dev/ttyACM0}
 * @param description  the port's description text
 * @param vendorId     USB vendor id, or -1 if not a USB port
 * @param productId    USB product id, or -1
 * @param serialNumber USB serial number, or empty
 */
public record PortInfo(String name, String path, String description, int vendorId, int productId, String serialNumber) {
    /**
     * The id as {@code VVVV:PPPP} in hex, or empty for a port without USB ids.
     *
     * @return the id text
     */
    public String usbId() {
        return vendorId < 0 || productId < 0 ? "" : String.format("%04x:%04x", vendorId, productId);
    }
}
