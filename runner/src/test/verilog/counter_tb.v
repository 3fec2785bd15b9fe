// Testbench for the VCD import test (runner VcdIcarusTest): a clock that is x until 3 ns and then
// toggles every 5 ns, an 8-bit counter that is x until the first clock edge and counts once reset
// is released, and a real level. Dumping is switched off for 40 ns.
// Written for Icarus Verilog (Debian package iverilog): iverilog -o tb.vvp counter_tb.v && vvp tb.vvp
`timescale 1ns / 1ps
module counter_tb;
  reg clk;
  reg rst;
  reg [7:0] count;
  real level;

  initial begin
    $dumpfile("counter_tb.vcd");
    $dumpvars(0, counter_tb);
    rst = 1;
    #3 clk = 0;
    forever #5 clk = ~clk;
  end

  always @(posedge clk) begin
    if (rst)
      count <= 8'd0;
    else
      count <= count + 8'd1;
  end

  initial begin
    level = 0.0;
    #22 rst = 0;
    #50 level = 1.25;
    #100 $dumpoff;
    #40 $dumpon;
    #200 $finish;
  end
endmodule
