// 7:1 pixel link serialiser, 24-bit VESA slot order (docs/reference-facts.md#pixel-link-clock-and-slot-mappings:
// VESA Notebook Panel Standard 2007 / Open LVDS Display Interface 0.95).
// One pixel per 7 bit clocks; slot 0 goes out first. The clock lane is high
// in slots 0-1 and 5-6 and low in slots 2-4.
// Written for the pixel-link decoder's test as an independent reference.
`timescale 1ps/1ps
module lvds71_tx (
    input  wire       bitclk,
    input  wire       rst,
    input  wire [7:0] r,
    input  wire [7:0] g,
    input  wire [7:0] b,
    input  wire       de,
    input  wire       hs,
    input  wire       vs,
    output reg        clk_out,
    output reg        d0,
    output reg        d1,
    output reg        d2,
    output reg        d3,
    output wire       pixel_done
);
    reg [2:0] slot;
    reg [6:0] w0, w1, w2, w3;
    // bit s of each word is slot s
    wire [6:0] n0 = {r[0], r[1], r[2], r[3], r[4], r[5], g[0]};   // G0 R5 R4 R3 R2 R1 R0
    wire [6:0] n1 = {g[1], g[2], g[3], g[4], g[5], b[0], b[1]};   // B1 B0 G5 G4 G3 G2 G1
    wire [6:0] n2 = {b[2], b[3], b[4], b[5], hs, vs, de};         // DE VS HS B5 B4 B3 B2
    wire [6:0] n3 = {r[6], r[7], g[6], g[7], b[6], b[7], 1'b0};   // 0 B7 B6 G7 G6 R7 R6
    wire [6:0] clk_pattern = 7'b1100011;                           // slots 6..0: 1 1 0 0 0 1 1

    assign pixel_done = (slot == 3'd6);

    always @(posedge bitclk) begin
        if (rst) begin
            slot <= 3'd6;
            w0 <= 7'd0; w1 <= 7'd0; w2 <= 7'd0; w3 <= 7'd0;
            clk_out <= 1'b1;
            d0 <= 1'b0; d1 <= 1'b0; d2 <= 1'b0; d3 <= 1'b0;
        end else if (slot == 3'd6) begin
            slot <= 3'd0;
            w0 <= n0; w1 <= n1; w2 <= n2; w3 <= n3;
            d0 <= n0[0]; d1 <= n1[0]; d2 <= n2[0]; d3 <= n3[0];
            clk_out <= clk_pattern[0];
        end else begin
            slot <= slot + 3'd1;
            d0 <= w0[slot + 3'd1]; d1 <= w1[slot + 3'd1]; d2 <= w2[slot + 3'd1]; d3 <= w3[slot + 3'd1];
            clk_out <= clk_pattern[slot + 3'd1];
        end
    end
endmodule
