package org.lanesift.viewer;

import java.awt.Component;
import java.awt.Rectangle;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import javax.swing.SwingUtilities;
import org.lanesift.data.Frame;
import org.lanesift.json.JsonWriter;
import org.lanesift.plugin.OutputException;

/**
 * Writes, beside a picture of the screen, where things are on it ({@code FILE.png.json}): every
 * row's caption, kind, top and height, the plot's origin, the time axis (left time and
 * femtoseconds per pixel) and where the decoded frame is drawn. Tests use it to look at the
 * right pixels; the picture itself is the evidence.
 */
public final class ScreenLayout {
    private ScreenLayout() {
    }

    /**
     * The layout as JSON.
     *
     * @param screen the screen, laid out
     * @return the JSON text
     */
    public static String json(ViewerScreen screen) {
        WavePanel wave = screen.wave();
        Rectangle wr = SwingUtilities.convertRectangle(wave.getParent(), wave.getBounds(), screen);
        Viewport v = wave.viewport();
        JsonWriter w = JsonWriter.pretty().beginObject();
        w.name("plot").beginObjectInline().field("x", wr.x + WavePainter.CAPTION_PX).field("y", wr.y)
                .field("width", v.widthPx()).field("height", wr.height).endObject();
        w.name("leftFs").value(v.leftFs());
        w.name("fsPerPx").value(v.fsPerPx());
        w.name("rows").beginArray();
        List<Row> rows = wave.model().rows();
        int[] tops = WavePainter.rowTops(rows, 0);
        for (int i = 0; i < rows.size(); i++) {
            Row r = rows.get(i);
            String kind = r.analog() != null ? "analog" : r.logic() != null ? "logic" : "notes";
            w.beginObjectInline().field("name", r.name()).field("kind", kind).field("top", wr.y + tops[i])
                    .field("height", r.heightPx()).endObject();
        }
        w.endArray();
        Rectangle fr = screen.frames().drawnPicture();
        Frame f = screen.frames().shownFrame();
        if (fr != null && f != null) {
            Component area = screen.frames().pictureArea();
            Rectangle at = SwingUtilities.convertRectangle(area, fr, screen);
            w.name("frame").beginObjectInline().field("index", f.index()).field("x", at.x).field("y", at.y)
                    .field("width", at.width).field("height", at.height).endObject();
        }
        w.endObject();
        return w.finish();
    }

    /**
     * Writes the layout beside a picture.
     *
     * @param screen the screen
     * @param png    the picture's path; the layout goes to {@code png + ".json"}
     * @throws OutputException when it cannot be written
     */
    public static void writeBeside(ViewerScreen screen, Path png) {
        Path out = Path.of(png + ".json");
        try {
            Files.writeString(out, json(screen), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new OutputException(out + ": cannot write: " + e.getMessage(), e);
        }
    }
}
