package org.lanesift.plugins.serial;

import org.lanesift.plugin.OptionException;
import com.fazecast.jSerialComm.SerialPort;
import java.util.ArrayList;
import java.util.List;

/** {@link SerialPorts} on jSerialComm. */
public final class JSerialCommPorts implements SerialPorts {
    /** Creates the port access. */
    public JSerialCommPorts() {
    }

    @Override
    public List<PortInfo> list() {
        List<PortInfo> out = new ArrayList<>();
        for (SerialPort p : SerialPort.getCommPorts()) {
            String sn = p.getSerialNumber();
            out.add(new PortInfo(p.getSystemPortName(), p.getSystemPortPath(), p.getPortDescription(),
                    p.getVendorID(), p.getProductID(), sn == null || sn.equalsIgnoreCase("Unknown") ? "" : sn));
        }
        return out;
    }

    @Override
    public SerialLink open(String name, int baudRate) {
        SerialPort p;
        try {
            p = SerialPort.getCommPort(name);
        } catch (RuntimeException e) {
            throw new OptionException("port", "--port " + name + ": no such port (" + e.getMessage() + ")", e);
        }
        p.setComPortParameters(baudRate, 8, SerialPort.ONE_STOP_BIT, SerialPort.NO_PARITY);
        p.setFlowControl(SerialPort.FLOW_CONTROL_DISABLED);
        p.setComPortTimeouts(SerialPort.TIMEOUT_READ_SEMI_BLOCKING | SerialPort.TIMEOUT_WRITE_BLOCKING, 100, 1000);
        if (!p.openPort()) {
            throw new OptionException("port", "--port " + name + ": cannot open the port (error " + p.getLastErrorCode() + "; is it there, and may this user open it?)");
        }
        return new Link(p, name);
    }

    private static final class Link implements SerialLink {
        private final SerialPort port;
        private final String name;
        private volatile boolean closed;

        Link(SerialPort port, String name) {
            this.port = port;
            this.name = name;
        }

        @Override
        public int read(byte[] b, int off, int len) {
            if (closed) {
                return -1;
            }
            int n = port.readBytes(b, len, off);
            return n < 0 ? -1 : n;
        }

        @Override
        public void write(byte[] b) {
            int n = port.writeBytes(b, b.length);
            if (n != b.length) {
                throw new DeviceException("port " + name + ": write failed (" + n + " of " + b.length + " bytes)");
            }
        }

        @Override
        public String name() {
            return name;
        }

        @Override
        public void close() {
            closed = true;
            port.closePort();
        }
    }
}
