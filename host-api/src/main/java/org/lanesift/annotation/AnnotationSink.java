package org.lanesift.annotation;

/**
 * Receives annotations as a chain produces them, in the order stages emit them (which is time
 * order per stage, not necessarily across stages). A GUI implements it to draw rows; the command
 * line implements it to write JSON Lines. Called on the thread that runs the chain.
 */
@FunctionalInterface
public interface AnnotationSink {
    /**
     * Takes one annotation.
     *
     * @param source id of the chain instance that emitted it
     * @param annotation the annotation
     */
    void accept(String source, Annotation annotation);
}
