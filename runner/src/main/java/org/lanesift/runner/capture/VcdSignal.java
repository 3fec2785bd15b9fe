package org.lanesift.runner.capture;

import org.lanesift.data.Block;
import org.lanesift.data.DataKind;

/**
 * One VCD variable (one identifier code) and what is known of its value since the last block:
 * a {@link VcdScalar} (1-bit wire, emitted as edges), a {@link VcdVector} (2 to 64 bits, emitted as
 * words) or a {@link VcdReal} (real variable, sampled and held on a fixed grid).
 */
abstract sealed class VcdSignal permits VcdScalar, VcdVector, VcdReal {
    /** Output index, in declaration order. */
    final int index;
    /** Declared width in bits (64 for reals). */
    final int width;
    /** Dotted scope path and reference, as declared. */
    final String path;
    /** Identifier code. */
    final String code;
    private String port;

    VcdSignal(int index, int width, String path, String code) {
        this.index = index;
        this.width = width;
        this.path = path;
        this.code = code;
    }

    /** Output port name, set once all names are known. */
    final String port() {
        return port;
    }

    final void port(String name) {
        port = name;
    }

    /** Kind of block this variable becomes. */
    abstract DataKind dataKind();

    /**
     * Help text of the output port.
     *
     * @param realPeriodFs grid period of real variables, fs
     */
    abstract String help(double realPeriodFs);

    /** The first time of the dump, fs: the state before it is taken as holding from there. */
    abstract void start(long timeFs);

    /** {@code $dumpoff} at this time, fs: the value is unknown from here. */
    abstract void dumpOff(long timeFs);

    /** {@code $dumpon}: values resume. */
    void dumpOn() {
    }

    /**
     * Takes the changes since the last block as one block covering {@code [spanStartFs, endFs)}
     * and starts collecting the next.
     *
     * @param spanStartFs start of the block, fs
     * @param endFs       end of the block (exclusive), fs
     * @param last        true for the last block of the capture
     * @param realPeriodFs grid period of real variables, fs
     * @return the block
     */
    abstract Block take(long spanStartFs, long endFs, boolean last, double realPeriodFs);
}
