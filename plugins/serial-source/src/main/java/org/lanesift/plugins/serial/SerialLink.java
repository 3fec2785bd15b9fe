package org.lanesift.plugins.serial;

/** An open byte link to a device (a serial port, a pseudo-terminal, an in-memory loopback). */
public interface SerialLink extends AutoCloseable {
    /**
     * Reads what is available, waiting at most a short timeout (about 100 ms).
     *
     * @param b   destination
     * @param off first byte
     * @param len most bytes to read
     * @return bytes read, 0 on timeout, -1 when the link is gone (disconnect)
     */
    int read(byte[] b, int off, int len);

    /**
     * Writes all bytes.
     *
     * @param b bytes
     * @throws DeviceException when the link is gone
     */
    void write(byte[] b);

    /**
     * The name the link was opened by.
     *
     * @return the name
     */
    String name();

    @Override
    void close();
}
