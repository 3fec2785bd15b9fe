package org.lanesift.plugins.si;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * An eye mask: named polygons in the eye's own coordinates, x in unit intervals from the data
 * crossing (0 to 1 spans one eye) and y in millivolts. The text format is described in
 * {@code docs/eye-mask.md}:
 *
 * <pre>
 * lanesift-eye-mask 1
 * # a diamond in the middle of the eye
 * polygon centre
 *   0.25   0
 *   0.50  80
 *   0.75   0
 *   0.50 -80
 * end
 * </pre>
 */
final class EyeMask {
    static final String MAGIC = "lanesift-eye-mask";
    private static final int MAX_VERTICES = 10_000;

    /** One polygon; vertices in UI and millivolts. */
    record Polygon(String name, double[] xUi, double[] yMv) {
        boolean contains(double x, double y) {
            boolean in = false;
            int n = xUi.length;
            for (int i = 0, j = n - 1; i < n; j = i++) {
                if ((yMv[i] > y) != (yMv[j] > y)
                        && x < (xUi[j] - xUi[i]) * (y - yMv[i]) / (yMv[j] - yMv[i]) + xUi[i]) {
                    in = !in;
                }
            }
            return in;
        }
    }

    final List<Polygon> polygons;

    EyeMask(List<Polygon> polygons) {
        this.polygons = List.copyOf(polygons);
    }

    /** Exception for a bad mask file; the message names the file and line. */
    static final class MaskException extends IllegalArgumentException {
        private static final long serialVersionUID = 1L;

        MaskException(String message) {
            super(message);
        }
    }

    static EyeMask read(Path file) {
        List<String> lines;
        try {
            byte[] b = org.lanesift.plugin.InputFiles.readAtMost(file, "eye mask file " + file, 4 << 20);
            if (b.length > 4 << 20) {
                throw new MaskException("eye mask file " + file + ": larger than 4 MiB, not a mask");
            }
            lines = new String(b, StandardCharsets.UTF_8).lines().toList();
        } catch (java.nio.file.NoSuchFileException e) {
            throw new MaskException("eye mask file " + file + ": no such file (looked in folder "
                    + file.toAbsolutePath().normalize().getParent() + ")");
        } catch (IOException e) {
            throw new MaskException("eye mask file " + file + ": cannot read it (" + e.getMessage() + ")");
        }
        return parse(file.toString(), lines);
    }

    static EyeMask parse(String where, List<String> lines) {
        List<Polygon> out = new ArrayList<>();
        boolean header = false;
        String name = null;
        int startLine = 0;
        List<double[]> verts = new ArrayList<>();
        for (int ln = 1; ln <= lines.size(); ln++) {
            String raw = lines.get(ln - 1);
            int hash = raw.indexOf('#');
            String s = (hash >= 0 ? raw.substring(0, hash) : raw).trim();
            if (s.isEmpty()) {
                continue;
            }
            String at = where + " line " + ln + ": ";
            String[] tok = s.split("\\s+");
            if (!header) {
                if (tok.length != 2 || !tok[0].equals(MAGIC) || !tok[1].equals("1")) {
                    throw new MaskException(at + "expected the header '" + MAGIC + " 1', got '" + token(s) + "'");
                }
                header = true;
                continue;
            }
            String key = tok[0].toLowerCase(Locale.ROOT);
            if (key.equals("polygon")) {
                if (name != null) {
                    throw new MaskException(at + "'polygon' inside polygon '" + name + "' (started on line " + startLine + "): expected 'end' first");
                }
                if (tok.length != 2 || !tok[1].matches("[A-Za-z0-9_.-]+")) {
                    throw new MaskException(at + "expected 'polygon NAME' with a name of letters, digits, '_', '.', '-'");
                }
                name = tok[1];
                startLine = ln;
                verts.clear();
            } else if (key.equals("end")) {
                if (name == null) {
                    throw new MaskException(at + "'end' without a 'polygon' before it");
                }
                if (verts.size() < 3) {
                    throw new MaskException(at + "polygon '" + name + "' has " + verts.size() + " vertices; expected at least 3");
                }
                double[] xs = new double[verts.size()];
                double[] ys = new double[verts.size()];
                for (int i = 0; i < xs.length; i++) {
                    xs[i] = verts.get(i)[0];
                    ys[i] = verts.get(i)[1];
                }
                out.add(new Polygon(name, xs, ys));
                name = null;
            } else {
                if (name == null) {
                    throw new MaskException(at + "expected 'polygon NAME', got '" + token(s) + "'");
                }
                if (tok.length != 2) {
                    throw new MaskException(at + "expected a vertex 'X_UI Y_MV' (two numbers), got '" + org.lanesift.plugin.Echo.of(s, 40) + "'");
                }
                double x;
                double y;
                try {
                    x = Double.parseDouble(tok[0]);
                    y = Double.parseDouble(tok[1]);
                } catch (NumberFormatException e) {
                    throw new MaskException(at + "expected a vertex 'X_UI Y_MV' (two numbers), got '" + org.lanesift.plugin.Echo.of(s, 40) + "'");
                }
                if (!Double.isFinite(x) || !Double.isFinite(y) || x < -1 || x > 2) {
                    throw new MaskException(at + "vertex x must be finite in -1..2 UI and y finite in mV, got '" + org.lanesift.plugin.Echo.of(s, 40) + "'");
                }
                if (verts.size() >= MAX_VERTICES) {
                    throw new MaskException(at + "polygon '" + name + "' has more than " + MAX_VERTICES + " vertices");
                }
                verts.add(new double[] {x, y});
            }
        }
        if (!header) {
            throw new MaskException(where + ": empty; expected the header '" + MAGIC + " 1'");
        }
        if (name != null) {
            throw new MaskException(where + " line " + startLine + ": polygon '" + name + "' has no 'end'");
        }
        if (out.isEmpty()) {
            throw new MaskException(where + ": no polygons; expected at least one 'polygon NAME' ... 'end'");
        }
        return new EyeMask(out);
    }

    /**
     * Index of the polygon that contains a point, or -1. The point's x is folded into one unit
     * interval, so a mask drawn for one eye applies to every eye of the window.
     */
    int hit(double xUi, double yMv) {
        double xf = xUi - Math.floor(xUi);
        for (int p = 0; p < polygons.size(); p++) {
            Polygon poly = polygons.get(p);
            if (poly.contains(xf, yMv) || poly.contains(xf + 1, yMv) || poly.contains(xf - 1, yMv)) {
                return p;
            }
        }
        return -1;
    }

    /** The first word of a line, escaped and cut short: a message never echoes more of a file than that. */
    private static String token(String s) {
        String t = s.strip();
        int sp = 0;
        while (sp < t.length() && !Character.isWhitespace(t.charAt(sp))) {
            sp++;
        }
        return org.lanesift.plugin.Echo.of(t.substring(0, sp), 24);
    }
}
