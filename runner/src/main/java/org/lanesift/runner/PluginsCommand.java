package org.lanesift.runner;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.lanesift.data.DataKind;
import org.lanesift.json.JsonWriter;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.time.TimeValue;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code lanesift plugins}: lists the discovered plugins with their ports and options. */
@Command(name = "plugins", mixinStandardHelpOptions = true, versionProvider = Version.class,
        description = {"Lists every plugin found on the class path: id, name, version, input and output ports with "
                + "their kinds, and options with type, unit, default, range and help. Ports that depend on options "
                + "are shown for the default options."})
final class PluginsCommand implements Callable<Integer> {
    /** Version of the JSON form (docs/cli-json.md); raised when a field changes meaning or goes away. */
    static final int FORMAT = 1;

    @Option(names = "--json", description = "Print one JSON object (see docs/cli-json.md).")
    boolean json;

    private final Main.Host host;

    PluginsCommand(Main.Host host) {
        this.host = host;
    }

    /** Ports for the default options, or null when they need options the user must give. */
    record Ports(List<PortSpec> inputs, List<PortSpec> outputs, String why) {
    }

    static Ports ports(PluginDescriptor d) {
        Map<String, Object> raw = new LinkedHashMap<>();
        for (OptionSpec o : d.options()) {
            if (o.defaultValue() == null) {
                raw.put(o.name(), placeholder(o));
            }
        }
        try {
            OptionValues ov = OptionValues.validate(d, raw);
            return new Ports(d.inputs(ov), d.outputs(ov), null);
        } catch (RuntimeException e) {
            List<String> req = d.options().stream().filter(o -> o.defaultValue() == null).map(OptionSpec::name).toList();
            return new Ports(null, null, "depend on the options" + (req.isEmpty() ? "" : " (" + String.join(", ", req) + ")"));
        }
    }

    private static Object placeholder(OptionSpec o) {
        return switch (o.type()) {
            case INTEGER, NUMBER -> o.min() != null ? o.min() : o.max() != null ? Math.min(0, o.max()) : 0;
            case BOOLEAN -> false;
            case CHOICE -> o.choices().isEmpty() ? "" : o.choices().get(0);
            case TIME -> "0";
            case NUMBERS -> List.of();
            case TEXT -> "";
        };
    }

    @Override
    public Integer call() throws Exception {
        var all = host.registry().all();
        if (json) {
            JsonWriter w = JsonWriter.pretty().nonFiniteAsNull().beginObject().field("format", FORMAT).field("lanesift", Version.get());
            w.name("plugins").beginArray();
            for (PluginProvider p : all) {
                json(w, p.descriptor());
            }
            host.out.println(w.endArray().endObject().finish());
            return 0;
        }
        if (all.isEmpty()) {
            host.out.println("no plugins found on the class path");
            return 0;
        }
        StringBuilder sb = new StringBuilder();
        for (PluginProvider p : all) {
            text(sb, p.descriptor());
        }
        host.out.print(sb);
        return 0;
    }

    private static void text(StringBuilder sb, PluginDescriptor d) {
        sb.append(d.id()).append("  ").append(d.displayName() == null ? "" : d.displayName()).append("  (version ")
                .append(d.version()).append(")\n");
        if (!d.description().isBlank()) {
            sb.append("  ").append(d.description().replace("\n", "\n  ")).append('\n');
        }
        Ports ports = ports(d);
        if (ports.inputs() == null) {
            sb.append("  ports ").append(ports.why()).append('\n');
        } else {
            sb.append("  inputs:  ").append(portList(ports.inputs(), true)).append('\n');
            sb.append("  outputs: ").append(portList(ports.outputs(), false)).append('\n');
        }
        if (d.options().isEmpty()) {
            sb.append("  options: none\n");
        } else {
            sb.append("  options:\n");
            int w = d.options().stream().mapToInt(o -> o.name().length()).max().orElse(4);
            for (OptionSpec o : d.options()) {
                sb.append("    ").append(pad(o.name(), w)).append("  ").append(o.type().name().toLowerCase(Locale.ROOT));
                if (!o.unit().isEmpty()) {
                    sb.append(" [").append(o.unit()).append(']');
                }
                sb.append(o.defaultValue() == null ? ", required" : ", default " + visible(show(o.defaultValue())));
                if (o.min() != null || o.max() != null) {
                    sb.append(", range ").append(o.range());
                }
                if (!o.choices().isEmpty()) {
                    sb.append(", one of ").append(String.join("|", o.choices().stream().map(PluginsCommand::visible).toList()));
                }
                if (!o.help().isBlank()) {
                    sb.append(": ").append(o.help());
                }
                sb.append('\n');
            }
        }
        sb.append('\n');
    }

    private static String portList(List<PortSpec> ports, boolean inputs) {
        if (ports.isEmpty()) {
            return "none";
        }
        StringBuilder sb = new StringBuilder();
        for (PortSpec p : ports) {
            if (sb.length() > 0) {
                sb.append(", ");
            }
            sb.append(p.name()).append(" (").append(p.kind()).append(inputs && !p.required() ? ", optional" : "")
                    .append(inputs && p.kind() == DataKind.BITS && !p.readsBitMargins() ? ", reads no bit margins" : "").append(')');
        }
        return sb.toString();
    }

    /** Control characters as escapes, so a tab choice shows as \\t. */
    static String visible(String s) {
        return s.replace("\t", "\\t").replace("\n", "\\n").replace("\r", "\\r");
    }

    private static String pad(String s, int w) {
        return s.length() >= w ? s : s + " ".repeat(w - s.length());
    }

    private static String show(Object v) {
        if (v instanceof List<?> l) {
            return l.isEmpty() ? "[]" : l.toString();
        }
        if (v instanceof String s) {
            return s.isEmpty() ? "\"\"" : s;
        }
        return String.valueOf(v);
    }

    private static void json(JsonWriter w, PluginDescriptor d) {
        w.beginObject();
        w.field("id", d.id());
        w.field("name", d.displayName() == null ? d.id() : d.displayName());
        w.field("version", d.version());
        w.field("description", d.description());
        Ports ports = ports(d);
        if (ports.inputs() == null) {
            w.name("inputs").nullValue();
            w.name("outputs").nullValue();
            w.field("portsNote", ports.why());
        } else {
            portsJson(w.name("inputs"), ports.inputs());
            portsJson(w.name("outputs"), ports.outputs());
        }
        w.name("options").beginArray();
        for (OptionSpec s : d.options()) {
            w.beginObject();
            w.field("name", s.name());
            w.field("type", s.type().name().toLowerCase(Locale.ROOT));
            w.field("unit", s.unit());
            w.field("required", s.defaultValue() == null);
            Object def = s.defaultValue();
            w.name("default");
            if (def == null) {
                w.nullValue();
            } else if (def instanceof Boolean b) {
                w.value(b);
            } else if (def instanceof Long l) {
                w.value(l);
            } else if (def instanceof Number n) {
                w.value(n.doubleValue());
            } else if (def instanceof List<?> l) {
                w.beginArray();
                for (Object e : l) {
                    if (e instanceof Number n) {
                        w.value(n.doubleValue());
                    } else {
                        w.value(String.valueOf(e));
                    }
                }
                w.endArray();
            } else if (def instanceof TimeValue tv) {
                w.value(tv.toString());
            } else {
                w.value(String.valueOf(def));
            }
            w.name("min");
            if (s.min() == null) {
                w.nullValue();
            } else {
                w.value(s.min());
            }
            w.name("max");
            if (s.max() == null) {
                w.nullValue();
            } else {
                w.value(s.max());
            }
            w.name("choices").beginArray();
            s.choices().forEach(w::value);
            w.endArray();
            w.field("help", s.help());
            w.endObject();
        }
        w.endArray();
        w.endObject();
    }

    private static void portsJson(JsonWriter w, List<PortSpec> ports) {
        w.beginArray();
        for (PortSpec p : ports) {
            w.beginObject();
            w.field("name", p.name());
            w.field("kind", p.kind().name());
            w.field("required", p.required());
            if (p.kind() == DataKind.BITS) {
                // host-api PortSpec.readsBitMargins: false lets a producer leave the per-bit margins out
                w.field("readsBitMargins", p.readsBitMargins());
            }
            w.field("help", p.help());
            w.endObject();
        }
        w.endArray();
    }
}
