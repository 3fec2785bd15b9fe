package org.lanesift.chain;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Consumer;
import org.lanesift.annotation.AnnotationSink;
import org.lanesift.data.Block;

/**
 * How a plan with calibration wires (wires ending on a calibration input, {@code PortSpec#calibration})
 * runs: first one calibration pass per level of calibration, each over the whole capture from its
 * start, then the final pass with every calibration result delivered before the first data block.
 *
 * <p><b>Levels.</b> The depth of an instance is the largest number of calibration wires on any
 * path into it. Calibration pass {@code k} runs the instances that produce a calibration result
 * at depth {@code k} together with everything upstream of them through ordinary wires (their own
 * calibration inputs were filled by earlier passes). The final pass runs every instance that
 * leads to a result: an unwired output, a host tap, or an instance without outputs. An instance
 * that only feeds calibration inputs (an estimator) runs in calibration passes only.
 *
 * <p><b>Nothing twice.</b> Annotations, host taps and unwired outputs are kept from the pass in
 * which an instance runs for the last time: the final pass for instances that run there, the
 * last calibration pass otherwise. A calibration result also reaches the host (it is written like
 * any unwired output) from that pass. Sources are opened afresh for every pass, so each pass reads
 * the capture from its start; a chain with external inputs (pushed by a host) cannot be read
 * again and is refused.
 */
final class CalibrationPasses {
    private final ChainPlan plan;
    private final int[] depth;
    private final boolean[] inFinal;
    private final int[] lastPass;
    private final List<boolean[]> passes = new ArrayList<>();
    /** Calibration results: key step index * 65536 + input index, blocks in the order emitted. */
    private final Map<Long, List<Block>> held = new HashMap<>();
    private int[] finalIndex;

    private CalibrationPasses(ChainPlan plan, int[] depth, boolean[] inFinal) {
        this.plan = plan;
        this.depth = depth;
        this.inFinal = inFinal;
        this.lastPass = new int[depth.length];
        Arrays.fill(lastPass, -1);
    }

    /**
     * The passes of a plan.
     *
     * @param plan the validated plan
     * @return the passes, or null when the plan has no calibration wire (it runs in one pass)
     * @throws ChainException when the plan has external inputs, which cannot be read twice
     */
    static CalibrationPasses of(ChainPlan plan) {
        List<ChainPlan.Step> st = plan.steps();
        int n = st.size();
        int[] depth = new int[n];
        String firstWire = null;
        for (int m = 0; m < n; m++) {
            for (List<ChainPlan.Edge> es : st.get(m).targets()) {
                for (ChainPlan.Edge e : es) {
                    boolean cal = plan.isCalibration(e);
                    if (cal && firstWire == null) {
                        firstWire = e.wireName();
                    }
                    depth[e.to()] = Math.max(depth[e.to()], depth[m] + (cal ? 1 : 0));
                }
            }
        }
        if (firstWire == null) {
            return null;
        }
        for (ChainPlan.Step s : st) {
            if (s.externalKind() != null) {
                throw new ChainException("wire " + firstWire + " ends on a calibration input: the engine reads the capture once"
                        + " to calibrate and again to decode, and external input '" + s.id() + "' cannot be read again", null);
            }
        }
        boolean[] fin = new boolean[n];
        for (int m = n - 1; m >= 0; m--) {
            ChainPlan.Step s = st.get(m);
            boolean result = s.outputs().isEmpty();
            for (int o = 0; o < s.outputs().size() && !result; o++) {
                List<ChainPlan.Edge> es = s.targets().get(o);
                result = es.isEmpty() || !s.taps().get(o).isEmpty();
                for (ChainPlan.Edge e : es) {
                    result |= !plan.isCalibration(e) && fin[e.to()];
                }
            }
            fin[m] = result;
        }
        CalibrationPasses c = new CalibrationPasses(plan, depth, fin);
        c.planPasses();
        return c;
    }

    private void planPasses() {
        List<ChainPlan.Step> st = plan.steps();
        int n = st.size();
        List<List<Integer>> upstream = new ArrayList<>();
        for (int m = 0; m < n; m++) {
            upstream.add(new ArrayList<>());
        }
        int levels = 0;
        boolean[] producer = new boolean[n];
        for (int m = 0; m < n; m++) {
            for (List<ChainPlan.Edge> es : st.get(m).targets()) {
                for (ChainPlan.Edge e : es) {
                    if (plan.isCalibration(e)) {
                        producer[m] = true;
                        levels = Math.max(levels, depth[m] + 1);
                    } else {
                        upstream.get(e.to()).add(m);
                    }
                }
            }
        }
        for (int k = 0; k < levels; k++) {
            boolean[] member = new boolean[n];
            List<Integer> todo = new ArrayList<>();
            for (int m = 0; m < n; m++) {
                if (producer[m] && depth[m] == k) {
                    todo.add(m);
                }
            }
            while (!todo.isEmpty()) {
                int m = todo.remove(todo.size() - 1);
                if (!member[m]) {
                    member[m] = true;
                    lastPass[m] = k;
                    todo.addAll(upstream.get(m));
                }
            }
            passes.add(member);
        }
    }

    /**
     * The number of calibration passes before the final one.
     *
     * @return at least 1
     */
    int count() {
        return passes.size();
    }

    /**
     * The final pass: every instance that leads to a result, calibration wires removed (their
     * results are delivered by {@link #deliverFinal}).
     *
     * @return the plan the host's chain runs
     */
    ChainPlan finalPlan() {
        finalIndex = new int[inFinal.length];
        return cut(inFinal, -1, finalIndex, Set.of());
    }

    /**
     * Progress of pass {@code pass} (the final pass is {@link #count()}) as part of the whole run.
     *
     * @param outer the host's listener
     * @param pass  the pass
     * @return a listener for that pass
     */
    ProgressListener progress(ProgressListener outer, int pass) {
        int all = passes.size() + 1;
        return (done, total) -> outer.progress(total < 0 ? done : (long) pass * total + done, total < 0 ? -1 : all * total);
    }

    /**
     * Runs every calibration pass, then delivers the results to the final chain.
     *
     * @param target      the final chain (opened from {@link #finalPlan()})
     * @param annotations the host's annotation sink
     * @param progress    the host's progress listener
     * @param outputs     the host's sink for unwired outputs, or null
     */
    void run(Chain target, AnnotationSink annotations, ProgressListener progress, BlockSink outputs) {
        List<ChainPlan.Step> st = plan.steps();
        for (int k = 0; k < passes.size() && !target.isCancelled(); k++) {
            Set<String> keep = new HashSet<>();
            for (int m = 0; m < st.size(); m++) {
                if (!inFinal[m] && lastPass[m] == k) {
                    keep.add(st.get(m).id());
                }
            }
            int[] index = new int[st.size()];
            ChainPlan cut = cut(passes.get(k), k, index, keep);
            AnnotationSink ann = (id, a) -> {
                if (keep.contains(id)) {
                    annotations.accept(id, a);
                }
            };
            BlockSink out = outputs == null ? null : (id, port, b) -> {
                if (keep.contains(id)) {
                    outputs.accept(id, port, b);
                }
            };
            try (Chain pass = ChainOpener.open(cut, ann, progress(progress, k), out)) {
                target.calibrating(pass);
                deliver(pass, passes.get(k), index);
                pass.run();
            } finally {
                target.calibrating(null);
            }
        }
        if (!target.isCancelled()) {
            deliver(target, inFinal, finalIndex);
        }
    }

    /** Hands every calibration result to the calibration inputs of the members of a pass. */
    private void deliver(Chain chain, boolean[] member, int[] index) {
        List<ChainPlan.Step> st = plan.steps();
        for (int m = 0; m < st.size(); m++) {
            if (!member[m]) {
                continue;
            }
            ChainPlan.Step s = st.get(m);
            for (int i = 0; i < s.inputs().size(); i++) {
                if (!s.inputs().get(i).calibration()) {
                    continue;
                }
                List<Block> blocks = held.get(key(m, i));
                if (blocks == null || blocks.isEmpty()) {
                    throw new StageFailure(s.id(), s.label() + ": calibration input '" + s.inputs().get(i).name()
                            + "' received nothing from its calibration pass", new IllegalStateException("no calibration result"));
                }
                for (Block b : blocks) {
                    chain.deliverCalibration(index[m], i, b);
                }
            }
        }
    }

    private static long key(int step, int input) {
        return (long) step * 65536 + input;
    }

    /**
     * The part of the plan a pass runs. Ordinary wires between members stay; wires to
     * non-members go; calibration wires go, and in the pass that computes them (the producer's
     * depth) their blocks are held for later passes. Host taps stay on the instances in
     * {@code keep} (every instance in the final pass, {@code pass < 0}).
     */
    private ChainPlan cut(boolean[] member, int pass, int[] index, Set<String> keep) {
        List<ChainPlan.Step> st = plan.steps();
        int count = 0;
        for (int m = 0; m < st.size(); m++) {
            index[m] = member[m] ? count++ : -1;
        }
        List<ChainPlan.Step> out = new ArrayList<>(count);
        for (int m = 0; m < st.size(); m++) {
            if (!member[m]) {
                continue;
            }
            ChainPlan.Step s = st.get(m);
            boolean keepTaps = pass < 0 || keep.contains(s.id());
            List<List<ChainPlan.Edge>> targets = new ArrayList<>();
            List<List<Consumer<Block>>> taps = new ArrayList<>();
            for (int o = 0; o < s.outputs().size(); o++) {
                List<ChainPlan.Edge> es = new ArrayList<>();
                List<Consumer<Block>> ts = new ArrayList<>(keepTaps ? s.taps().get(o) : List.of());
                for (ChainPlan.Edge e : s.targets().get(o)) {
                    if (plan.isCalibration(e)) {
                        if (pass >= 0 && depth[m] == pass) {
                            List<Block> into = held.computeIfAbsent(key(e.to(), e.input()), x -> new ArrayList<>());
                            ts.add(into::add);
                        }
                    } else if (member[e.to()]) {
                        es.add(new ChainPlan.Edge(index[e.to()], e.input(), e.wireName()));
                    }
                }
                targets.add(List.copyOf(es));
                taps.add(List.copyOf(ts));
            }
            out.add(new ChainPlan.Step(s.id(), s.pointer(), s.descriptor(), s.provider(), s.options(), s.inputs(), s.outputs(),
                    s.externalKind(), List.copyOf(targets), List.copyOf(taps)));
        }
        return ChainPlan.ofSteps(out);
    }
}
