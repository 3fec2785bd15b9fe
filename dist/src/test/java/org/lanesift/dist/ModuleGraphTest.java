package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.xml.parsers.DocumentBuilderFactory;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.Node;
import org.w3c.dom.NodeList;

/**
 * DEVELOPERS.md's module table says what each module depends on; this test reads every module's
 * pom.xml and checks the table against it, both ways, so the documented graph cannot drift from
 * the built one. (Whether each pom declares exactly what its code uses is Maven's dependency
 * analysis, run by the build; see the parent pom.)
 */
class ModuleGraphTest {
    private static final Path ROOT = Path.of("..");

    /** Module folder by artifact id, from the root pom's module list. */
    static Map<String, String> modules() throws Exception {
        Map<String, String> byArtifact = new TreeMap<>();
        for (String dir : children(parse(ROOT.resolve("pom.xml")).getDocumentElement(), "modules", "module")) {
            Element pom = parse(ROOT.resolve(dir).resolve("pom.xml")).getDocumentElement();
            byArtifact.put(text(pom, "artifactId"), dir);
        }
        return byArtifact;
    }

    /** What the pom of one module declares outside test scope: module folders and third-party artifact ids. */
    static TreeSet<String> declared(String dir, Map<String, String> modules) throws Exception {
        TreeSet<String> deps = new TreeSet<>();
        Element pom = parse(ROOT.resolve(dir).resolve("pom.xml")).getDocumentElement();
        for (Element d : elements(pom, "dependencies", "dependency")) {
            String scope = text(d, "scope");
            if ("test".equals(scope)) {
                continue;
            }
            String artifact = text(d, "artifactId");
            deps.add(modules.getOrDefault(artifact, artifact));
        }
        return deps;
    }

    /** The table rows of DEVELOPERS.md: module folder to the backticked names in its last column. */
    static Map<String, TreeSet<String>> documented() throws Exception {
        Map<String, TreeSet<String>> rows = new TreeMap<>();
        Pattern row = Pattern.compile("^\\| `([^`]+)` \\|.*\\| ([^|]*) \\|\\s*$");
        Pattern name = Pattern.compile("`([^`]+)`");
        for (String line : Files.readAllLines(ROOT.resolve("DEVELOPERS.md"))) {
            Matcher m = row.matcher(line);
            if (!m.matches()) {
                continue;
            }
            TreeSet<String> names = new TreeSet<>();
            Matcher n = name.matcher(m.group(2));
            while (n.find()) {
                names.add(n.group(1));
            }
            rows.put(m.group(1), names);
        }
        return rows;
    }

    @Test
    void theDocumentedModuleTableIsTheBuiltGraph() throws Exception {
        Map<String, String> modules = modules();
        Map<String, TreeSet<String>> table = documented();
        assertEquals(new TreeSet<>(modules.values()), new TreeSet<>(table.keySet()),
                "DEVELOPERS.md lists exactly the modules of the root pom");
        List<String> wrong = new ArrayList<>();
        for (String dir : modules.values()) {
            TreeSet<String> built = declared(dir, modules);
            if (!built.equals(table.get(dir))) {
                wrong.add(dir + ": pom declares " + built + ", DEVELOPERS.md says " + table.get(dir));
            }
        }
        assertTrue(wrong.isEmpty(), String.join("\n", wrong));
    }

    @Test
    void noPluginDependsOnAnotherPluginAndTheContractDependsOnNothing() throws Exception {
        Map<String, String> modules = modules();
        for (String dir : modules.values()) {
            TreeSet<String> deps = declared(dir, modules);
            if (dir.startsWith("plugins/")) {
                assertTrue(deps.stream().noneMatch(d -> d.startsWith("plugins/")), dir + " depends on " + deps);
            }
        }
        assertTrue(declared("host-api", modules).isEmpty(), "host-api is JDK only");
        assertTrue(declared("runner", modules).stream().noneMatch(d -> d.startsWith("plugins/") || d.equals("examples")),
                "runner finds plugins and contributed commands at run time");
    }

    private static Document parse(Path pom) throws Exception {
        DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
        f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
        return f.newDocumentBuilder().parse(pom.toFile());
    }

    private static List<Element> elements(Element parent, String list, String item) {
        List<Element> out = new ArrayList<>();
        for (Node c = parent.getFirstChild(); c != null; c = c.getNextSibling()) {
            if (c instanceof Element e && e.getTagName().equals(list)) {
                NodeList items = e.getElementsByTagName(item);
                for (int i = 0; i < items.getLength(); i++) {
                    out.add((Element) items.item(i));
                }
            }
        }
        return out;
    }

    private static List<String> children(Element parent, String list, String item) {
        List<String> out = new ArrayList<>();
        for (Element e : elements(parent, list, item)) {
            out.add(e.getTextContent().trim());
        }
        return out;
    }

    private static String text(Element parent, String tag) {
        for (Node c = parent.getFirstChild(); c != null; c = c.getNextSibling()) {
            if (c instanceof Element e && e.getTagName().equals(tag)) {
                return e.getTextContent().trim();
            }
        }
        return null;
    }
}
