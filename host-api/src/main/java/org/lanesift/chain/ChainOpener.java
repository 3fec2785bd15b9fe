package org.lanesift.chain;

import org.lanesift.annotation.AnnotationSink;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.PluginProvider;

/**
 * Instantiates the stages of a {@link ChainPlan}: each provider opens its stage, upstream first,
 * with the stage's running node as its context. If one fails, every stage already opened is
 * closed before the error is thrown, so a chain that did not open holds nothing.
 */
final class ChainOpener {
    private ChainOpener() {
    }

    /**
     * Opens every stage of a plan.
     *
     * @param plan        the validated plan
     * @param annotations where stages' annotations go
     * @param progress    where source progress goes
     * @param outputs     the host's sink for unwired outputs, or null
     * @return the running chain
     * @throws ChainException on a bad option found only when the stage opens
     * @throws StageFailure   when a provider fails otherwise
     */
    static Chain open(ChainPlan plan, AnnotationSink annotations, ProgressListener progress, BlockSink outputs) {
        Chain chain = new Chain(plan, annotations, progress, outputs);
        for (Chain.Node n : chain.nodes()) {
            PluginProvider provider = n.step.provider();
            if (provider == null) {
                continue;
            }
            try {
                n.stage = provider.open(n);
                if (n.stage == null) {
                    throw new IllegalStateException("provider returned no stage");
                }
            } catch (OptionException e) {
                chain.close();
                String ptr = n.step.pointer();
                throw new ChainException(n.label() + ": " + e.getMessage(), ptr == null ? null : ptr + "/options/" + e.option(), e);
            } catch (ChainException e) {
                chain.close();
                throw e;
            } catch (Exception e) {
                chain.close();
                throw new StageFailure(n.id, n.label() + " could not start: " + e.getMessage(), e);
            }
        }
        return chain;
    }
}
