package org.lanesift.plugin;

/**
 * The entry point of a plugin, found through {@link java.util.ServiceLoader}: list the
 * implementing class in {@code META-INF/services/org.lanesift.plugin.PluginProvider}. It describes
 * the plugin and opens stages. It must be stateless and cheap to construct.
 */
public interface PluginProvider {
    /**
     * The plugin's descriptor.
     *
     * @return the descriptor, the same every call
     */
    PluginDescriptor descriptor();

    /**
     * Opens a stage for one instance. The options in the context are validated against the
     * descriptor; further cross-option checks belong here and throw {@link OptionException}.
     *
     * @param context the instance's context
     * @return a new stage
     * @throws Exception when the stage cannot be opened (a file missing, a device busy)
     */
    Stage open(StageContext context) throws Exception;
}
