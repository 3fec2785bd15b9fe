package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertNotNull;

import java.awt.Color;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import javax.imageio.ImageIO;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;

/** A picture of the screen and the layout written beside it, with the pixel questions the tests ask. */
record ShotCheck(BufferedImage image, JsonValue layout) {

    static ShotCheck read(Path png) throws IOException {
        BufferedImage img = ImageIO.read(png.toFile());
        assertNotNull(img, png + " is a PNG");
        return new ShotCheck(img, JsonReader.read(Path.of(png + ".json"), png + ".json"));
    }

    /** The layout entry of a row, or null. */
    JsonValue row(String name) {
        for (JsonValue r : layout.get("rows").elements()) {
            if (r.get("name").asString().equals(name)) {
                return r;
            }
        }
        return null;
    }

    /** Screen column of a time. */
    int xOf(double tFs) {
        return layout.get("plot").get("x").asDouble() > 0
                ? (int) Math.floor(layout.get("plot").get("x").asDouble() + (tFs - layout.get("leftFs").asDouble()) / layout.get("fsPerPx").asDouble())
                : -1;
    }

    /** How many pixels of a colour lie in a rectangle (exact RGB match). */
    int count(Color c, int x0, int y0, int w, int h) {
        int n = 0;
        for (int y = Math.max(0, y0); y < Math.min(image.getHeight(), y0 + h); y++) {
            for (int x = Math.max(0, x0); x < Math.min(image.getWidth(), x0 + w); x++) {
                if ((image.getRGB(x, y) & 0xFFFFFF) == (c.getRGB() & 0xFFFFFF)) {
                    n++;
                }
            }
        }
        return n;
    }

    int rgb(int x, int y) {
        return image.getRGB(x, y) & 0xFFFFFF;
    }
}
