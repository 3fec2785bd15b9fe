// Run with the runnable jar on the class path, from the repository root:
//   jshell --class-path dist/target/lanesift.jar examples/jshell/differential.jsh
// It builds a chain in code through the host API, feeds it a synthetic LVDS pair and prints
// the annotations and the first edge times.
import java.util.*;
import org.lanesift.chain.*;
import org.lanesift.data.*;
import org.lanesift.plugin.*;

var plugins = PluginRegistry.discover(null);
var edges = new ArrayList<Edges>();
// JShell ends a statement at the end of a line when it can, so each line ends with a dot
var chain = Chain.builder(plugins).
    input("p", DataKind.ANALOG).input("n", DataKind.ANALOG).
    add("rx", "differential", Map.of("mode", "pair")).
    wire("p", "rx.p").wire("n", "rx.n").
    annotations((src, a) -> System.out.println(src + ": " + a.kind() + " " + a.label())).
    tap("rx.edges", b -> edges.add((Edges) b)).
    build();
double periodFs = 1e15 / 5e9;
int len = 20000;
float[] p = new float[len], n = new float[len];
for (int i = 0; i < len; i++) {
    double t = i * periodFs * 1e-15;
    double d = Math.signum(Math.sin(2 * Math.PI * 25e6 * t + 0.3)) * 0.175;
    p[i] = (float) (1.2 + d);
    n[i] = (float) (1.2 - d);
}
chain.push("p", new AnalogBlock("P", 0, 0, periodFs, p, len, null));
chain.push("n", new AnalogBlock("N", 0, 0, periodFs, n, len, null));
chain.finish();
chain.close();
int total = edges.stream().mapToInt(Edges::count).sum();
System.out.println(total + " edges; first at " + org.lanesift.time.Femtos.format(edges.get(0).timesFs()[0]));
/exit
