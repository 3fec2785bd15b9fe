package org.lanesift.plugins.serial;

/** Frame types of the device stream (docs/device-stream.md, "Frame types"). */
public enum FrameType {
    /** Device to host: sample data; payload = u64 first sample index + sample bytes. */
    DATA(0x01),
    /** Host to device: please identify; empty payload. */
    IDENTIFY(0x10),
    /** Device to host: identification; payload per {@link DeviceInfo#encode()}. */
    IDENT(0x11),
    /** Host to device: configure rate; payload = u32 rate in Hz. */
    CONFIGURE(0x20),
    /** Host to device: start streaming; empty payload. */
    START(0x21),
    /** Host to device: stop streaming; empty payload. */
    STOP(0x22),
    /** Device to host: command accepted; payload = u8 type of the command. */
    ACK(0x30),
    /** Device to host: command refused; payload = u8 type of the command + UTF-8 reason. */
    NAK(0x31);

    /** The code byte on the wire. */
    public final int code;

    FrameType(int code) {
        this.code = code;
    }

    /**
     * Looks up a code.
     *
     * @param code the byte
     * @return the type, or null for an unknown code
     */
    public static FrameType of(int code) {
        for (FrameType t : values()) {
            if (t.code == code) {
                return t;
            }
        }
        return null;
    }
}
