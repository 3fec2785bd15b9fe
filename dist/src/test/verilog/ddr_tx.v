// A DDR link transmitter (our own test design): two data lanes, each sending bytes least
// significant bit first, one bit per unit interval; the clock lane toggles in the middle of
// every bit, so each clock edge (rising and falling) is centred on one bit of every lane
// (double data rate, clock period = 2 unit intervals). Each lane first sends 8 bytes 0x00,
// then the sync byte B8, then data byte 2k (lane 0) or 2k+1 (lane 1), where byte n is
// (37 * n + 11) mod 256.
`timescale 1ps/1ps
module ddr_tx (
    input  wire bclk,    // bit clock: one rising edge per unit interval
    input  wire rst,
    output reg  clk_out,
    output wire d0,
    output wire d1);

    reg [7:0] sh0;
    reg [7:0] sh1;
    reg [2:0] bitn;
    reg [15:0] n;        // data byte pairs sent
    reg [3:0] pre;       // preamble bytes left, then the sync byte

    function [7:0] byte_at(input [15:0] k);
        byte_at = k * 8'd37 + 8'd11;
    endfunction

    assign d0 = sh0[0];
    assign d1 = sh1[0];

    always @(posedge bclk) begin
        if (rst) begin
            sh0 <= 8'h00;
            sh1 <= 8'h00;
            bitn <= 3'd0;
            n <= 16'd0;
            pre <= 4'd8;
        end else if (bitn == 3'd7) begin
            bitn <= 3'd0;
            if (pre > 4'd1) begin
                sh0 <= 8'h00;
                sh1 <= 8'h00;
                pre <= pre - 4'd1;
            end else if (pre == 4'd1) begin
                sh0 <= 8'hB8;
                sh1 <= 8'hB8;
                pre <= 4'd0;
            end else begin
                sh0 <= byte_at(2 * n);
                sh1 <= byte_at(2 * n + 1);
                n <= n + 16'd1;
            end
        end else begin
            sh0 <= sh0 >> 1;
            sh1 <= sh1 >> 1;
            bitn <= bitn + 3'd1;
        end
    end

    always @(negedge bclk) begin
        clk_out <= rst ? 1'b0 : ~clk_out;
    end
endmodule
