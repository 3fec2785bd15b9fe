package org.lanesift.runner.capture;

import org.junit.jupiter.api.extension.AfterEachCallback;
import org.junit.jupiter.api.extension.BeforeEachCallback;
import org.junit.jupiter.api.extension.ExtensionContext;

/**
 * Puts {@link BlockArrays#poison} back as it was before each test, for tests that switch the
 * poisoning of lent blocks on and off ({@code @ExtendWith(PoisonAsBefore.class)}).
 */
final class PoisonAsBefore implements BeforeEachCallback, AfterEachCallback {
    private static final ExtensionContext.Namespace NS = ExtensionContext.Namespace.create(PoisonAsBefore.class);

    @Override
    public void beforeEach(ExtensionContext context) {
        context.getStore(NS).put("poison", BlockArrays.poison);
    }

    @Override
    public void afterEach(ExtensionContext context) {
        BlockArrays.poison = context.getStore(NS).get("poison", Boolean.class);
    }
}
