package org.lanesift.runner;

import java.io.IOException;
import java.io.InputStream;
import java.util.Properties;
import picocli.CommandLine;

/** The program version: from the jar manifest, else from Maven's pom.properties, else "dev". */
final class Version implements CommandLine.IVersionProvider {
    static String get() {
        String v = Main.class.getPackage().getImplementationVersion();
        if (v != null) {
            return v;
        }
        try (InputStream in = Main.class.getResourceAsStream("/META-INF/maven/org.lanesift/runner/pom.properties")) {
            if (in != null) {
                Properties p = new Properties();
                p.load(in);
                String pv = p.getProperty("version");
                if (pv != null) {
                    return pv;
                }
            }
        } catch (IOException ignored) {
            // fall through
        }
        return "dev";
    }

    @Override
    public String[] getVersion() {
        return new String[] {"lanesift " + get(), "Java " + System.getProperty("java.version") + " (" + System.getProperty("java.vm.name") + ")"};
    }
}
