// Test bench: a 16 x 8 picture read from +image=<hex file> (one 24-bit RRGGBB
// word per line, row-major), shown with an invented small timing:
// H 16 active, 2 front porch, 3 sync, 3 back porch (24 total);
// V 8 active, 1 front porch, 1 sync, 2 back porch (12 total); syncs negative.
// Each line starts at the HS leading edge, each frame at the VS leading edge.
// Frame f is sent with its blue channel XORed with f[7:0].
// The capture starts in line 5 of frame 0 and runs +pixels=<n> pixel clocks.
// Writes the serialised lanes to +vcd=<file>.
`timescale 1ps/1ps
module tb;
    localparam H_SYNC = 3, H_BP = 3, H_ACT = 16, H_FP = 2;
    localparam V_SYNC = 1, V_BP = 2, V_ACT = 8, V_FP = 1;
    localparam H_TOT = H_SYNC + H_BP + H_ACT + H_FP;
    localparam V_TOT = V_SYNC + V_BP + V_ACT + V_FP;

    reg bitclk = 1'b0;
    reg rst = 1'b1;
    reg [23:0] img [0:H_ACT * V_ACT - 1];
    reg [7:0] h = 0;
    reg [7:0] v = 5;
    reg [7:0] frame = 0;
    integer pixels;
    integer sent = 0;
    reg [1023:0] image_file;
    reg [1023:0] vcd_file;

    wire hs_act = (h < H_SYNC);
    wire vs_act = (v < V_SYNC);
    wire in_h = (h >= H_SYNC + H_BP) && (h < H_SYNC + H_BP + H_ACT);
    wire in_v = (v >= V_SYNC + V_BP) && (v < V_SYNC + V_BP + V_ACT);
    wire de = in_h && in_v;
    wire [7:0] ax = h - (H_SYNC + H_BP);
    wire [7:0] ay = v - (V_SYNC + V_BP);
    wire [23:0] pix = de ? (img[ay * H_ACT + ax] ^ {16'h0000, frame}) : 24'h000000;

    wire clk_out, d0, d1, d2, d3, pixel_done;

    lvds71_tx tx (
        .bitclk(bitclk), .rst(rst),
        .r(pix[23:16]), .g(pix[15:8]), .b(pix[7:0]),
        .de(de), .hs(~hs_act), .vs(~vs_act),
        .clk_out(clk_out), .d0(d0), .d1(d1), .d2(d2), .d3(d3), .pixel_done(pixel_done));

    always #500 bitclk = ~bitclk;   // 1 ns bit period, 7 ns pixel clock

    always @(posedge bitclk) begin
        if (!rst && pixel_done) begin
            sent = sent + 1;
            if (h == H_TOT - 1) begin
                h <= 0;
                if (v == V_TOT - 1) begin
                    v <= 0;
                    frame <= frame + 8'd1;
                end else begin
                    v <= v + 8'd1;
                end
            end else begin
                h <= h + 8'd1;
            end
            if (sent > pixels + 1) begin
                $finish;
            end
        end
    end

    initial begin
        if (!$value$plusargs("image=%s", image_file)) begin
            $display("missing +image=<file>");
            $finish;
        end
        if (!$value$plusargs("vcd=%s", vcd_file)) begin
            $display("missing +vcd=<file>");
            $finish;
        end
        if (!$value$plusargs("pixels=%d", pixels)) begin
            pixels = 1000;
        end
        $readmemh(image_file, img);
        $dumpfile(vcd_file);
        $dumpvars(0, tb.clk_out, tb.d0, tb.d1, tb.d2, tb.d3, tb.bitclk);
        #3000 rst = 1'b0;
    end
endmodule
