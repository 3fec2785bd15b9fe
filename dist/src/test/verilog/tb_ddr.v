// Test bench of ddr_tx: unit interval 2 ns (500 Mbit/s per lane, 250 MHz clock), reset
// released at 10 ns, runs +bits=<n> unit intervals and writes clk_out, d0 and d1 to +vcd=<file>.
`timescale 1ps/1ps
module tb;
    reg bclk = 1'b0;
    reg rst = 1'b1;
    integer bits;
    reg [1023:0] vcd_file;
    wire clk_out, d0, d1;

    ddr_tx tx (.bclk(bclk), .rst(rst), .clk_out(clk_out), .d0(d0), .d1(d1));

    always #1000 bclk = ~bclk;

    initial begin
        if (!$value$plusargs("vcd=%s", vcd_file)) begin
            $display("missing +vcd=<file>");
            $finish;
        end
        if (!$value$plusargs("bits=%d", bits)) begin
            bits = 2000;
        end
        $dumpfile(vcd_file);
        $dumpvars(0, tb.clk_out, tb.d0, tb.d1);
        #10000 rst = 1'b0;
        #(bits * 2000) $finish;
    end
endmodule
