package org.lanesift.chain;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;
import org.lanesift.data.DataKind;
import org.lanesift.fakes.Counter;
import org.lanesift.fakes.PassThrough;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

class ChainPlanTest {
    static final PluginRegistry REG = ChainTest.REG;

    /** Counts how often any stage is opened: planning must open none. */
    static final class Opens implements PluginProvider {
        final AtomicInteger opened = new AtomicInteger();
        final PluginProvider inner;

        Opens(PluginProvider inner) {
            this.inner = inner;
        }

        @Override
        public PluginDescriptor descriptor() {
            return inner.descriptor();
        }

        @Override
        public Stage open(StageContext ctx) throws Exception {
            opened.incrementAndGet();
            return inner.open(ctx);
        }
    }

    static List<String> ids(ChainPlan p) {
        return p.steps().stream().map(ChainPlan.Step::id).toList();
    }

    @Test
    void ordersUpstreamFirstAndKeepsDeclarationOrderWhereFree() {
        // declared downstream first: the order follows the wires, ties in declaration order
        ChainPlan p = ChainPlan.of(Chain.builder(REG).add("c", "test.pass").add("b", "test.pass").input("y", DataKind.ANALOG)
                .add("a", "test.pass").input("x", DataKind.ANALOG)
                .wire("b", "c").wire("a", "b").wire("x", "a").add("d", "test.pass").wire("y", "d"));
        assertEquals(List.of("y", "x", "d", "a", "b", "c"), ids(p));
        // each wire points at the position of its receiver in that order
        ChainPlan.Step x = p.steps().get(1);
        assertEquals(List.of(new ChainPlan.Edge(3, 0, "x.out -> a.in")), x.targets().get(0));
        ChainPlan.Step b = p.steps().get(4);
        assertEquals(List.of(new ChainPlan.Edge(5, 0, "b.out -> c.in")), b.targets().get(0));
        assertTrue(p.steps().get(5).targets().get(0).isEmpty());
    }

    @Test
    void portTypesFollowTheValidatedOptions() {
        ChainPlan p = ChainPlan.of(Chain.builder(REG).input("x", DataKind.LOGIC).add("p", "test.pass", Map.of("kind", "LOGIC"))
                .wire("x", "p.in"));
        ChainPlan.Step s = p.steps().get(1);
        assertEquals(DataKind.LOGIC, s.inputs().get(0).kind());
        assertEquals(DataKind.LOGIC, s.outputs().get(0).kind());
        assertEquals("LOGIC", s.options().getString("kind"));
        assertEquals("instance 'p' (test.pass)", s.label());
        ChainPlan.Step x = p.steps().get(0);
        assertNull(x.provider());
        assertEquals(DataKind.LOGIC, x.externalKind());
        assertEquals("input 'x'", x.label());
    }

    @Test
    void planningOpensNoStageAndOpeningOpensEachOnce() {
        Opens ramp = new Opens(new Counter());
        Opens pass = new Opens(new PassThrough());
        PluginRegistry reg = new PluginRegistry().add(ramp).add(pass);
        ChainBuilder b = Chain.builder(reg).add("src", "test.ramp").add("p", "test.pass").wire("src", "p");
        ChainPlan plan = ChainPlan.of(b);
        assertEquals(0, ramp.opened.get() + pass.opened.get());
        try (Chain c = ChainOpener.open(plan, (id, a) -> { }, (d, t) -> { }, null)) {
            assertEquals(1, ramp.opened.get());
            assertEquals(1, pass.opened.get());
            assertEquals(List.of("src", "p"), c.instanceIds());
        }
    }

    @Test
    void wiringErrorsNameTheWireAndItsPointer() {
        ChainSpec kinds = new ChainSpec(List.of(new ChainSpec.Node("src", "test.ramp", Map.of()),
                new ChainSpec.Node("p", "test.pass", Map.of("kind", "LOGIC"))), List.of(new ChainSpec.Wire("src", "p")));
        ChainException e = assertThrows(ChainException.class, () -> ChainPlan.of(ChainBuilder.fromSpec(kinds, REG)));
        assertEquals("wire src.out -> p.in: output src.out carries ANALOG but input p.in expects LOGIC", e.getMessage());
        assertEquals("/wires/0", e.pointer());

        ChainSpec noSuch = new ChainSpec(List.of(new ChainSpec.Node("src", "test.ramp", Map.of())),
                List.of(new ChainSpec.Wire("src", "q.in")));
        e = assertThrows(ChainException.class, () -> ChainPlan.of(ChainBuilder.fromSpec(noSuch, REG)));
        assertEquals("wire end 'q.in': no instance 'q'; instances: src", e.getMessage());
        assertEquals("/wires/0/to", e.pointer());

        ChainSpec noPort = new ChainSpec(List.of(new ChainSpec.Node("src", "test.ramp", Map.of())),
                List.of(new ChainSpec.Wire("src.in", "src")));
        e = assertThrows(ChainException.class, () -> ChainPlan.of(ChainBuilder.fromSpec(noPort, REG)));
        assertTrue(e.getMessage().startsWith("wire end 'src.in': instance 'src' (test.ramp) has no output 'in'"), e.getMessage());
        assertEquals("/wires/0/from", e.pointer());

        ChainSpec bare = new ChainSpec(List.of(new ChainSpec.Node("src", "test.ramp", Map.of())),
                List.of(new ChainSpec.Wire("src", "src")));
        e = assertThrows(ChainException.class, () -> ChainPlan.of(ChainBuilder.fromSpec(bare, REG)));
        assertEquals("wire end 'src': instance 'src' (test.ramp) has 0 inputs, name one: (none)", e.getMessage());

        e = assertThrows(ChainException.class, () -> ChainPlan.of(Chain.builder(REG).input("x", DataKind.ANALOG)
                .add("p", "test.pass").wire("x", "")));
        assertEquals("wire end missing: expected \"instance.port\"", e.getMessage());
    }

    @Test
    void unwiredRequiredInputAndUnknownPluginCarryTheNodePointer() {
        ChainSpec unwired = new ChainSpec(List.of(new ChainSpec.Node("src", "test.ramp", Map.of()),
                new ChainSpec.Node("p", "test.pass", Map.of())), List.of());
        ChainException e = assertThrows(ChainException.class, () -> ChainPlan.of(ChainBuilder.fromSpec(unwired, REG)));
        assertEquals("instance 'p' (test.pass): required input 'in' is not wired", e.getMessage());
        assertEquals("/nodes/1", e.pointer());

        ChainSpec unknown = new ChainSpec(List.of(new ChainSpec.Node("src", "test.nothing", Map.of())), List.of());
        e = assertThrows(ChainException.class, () -> ChainPlan.of(ChainBuilder.fromSpec(unknown, REG)));
        assertTrue(e.getMessage().startsWith("instance 'src': unknown plugin 'test.nothing'; known plugins: "), e.getMessage());
        assertEquals("/nodes/0/plugin", e.pointer());

        ChainSpec badOption = new ChainSpec(List.of(new ChainSpec.Node("p", "test.pass", Map.of("kind", "WORDS"))), List.of());
        e = assertThrows(ChainException.class, () -> ChainPlan.of(ChainBuilder.fromSpec(badOption, REG)));
        assertEquals("/nodes/0/options/kind", e.pointer());
    }

    @Test
    void aCycleNamesOnlyTheInstancesOnIt() {
        ChainException e = assertThrows(ChainException.class, () -> ChainPlan.of(Chain.builder(REG)
                .input("x", DataKind.ANALOG).add("a", "test.pass").add("z", "test.pass").add("m", "test.pass")
                .add("after", "test.pass").wire("x", "a").wire("z", "m").wire("m", "z.in").wire("a", "after")));
        // 'z' and 'm' feed each other; 'a' and 'after' hang off the input and are not part of it
        assertEquals("the wires form a cycle through m, z", e.getMessage());
    }

    @Test
    void theStepsCannotBeChangedAfterValidation() {
        ChainPlan p = ChainPlan.of(Chain.builder(REG).input("x", DataKind.ANALOG).add("p", "test.pass").wire("x", "p"));
        assertThrows(UnsupportedOperationException.class, () -> p.steps().remove(0));
        assertThrows(UnsupportedOperationException.class, () -> p.steps().get(0).targets().get(0).clear());
        assertThrows(UnsupportedOperationException.class, () -> p.steps().get(0).taps().get(0).clear());
    }
}
