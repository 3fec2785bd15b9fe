package org.lanesift.plugin;

import java.util.Collection;
import java.util.Collections;
import java.util.Map;
import java.util.ServiceLoader;
import java.util.TreeMap;

/**
 * The plugins available to a host, by id: those found on a class loader through
 * {@link ServiceLoader}, plus any added by hand (for tests and embedding).
 */
public final class PluginRegistry {
    private final Map<String, PluginProvider> byId = new TreeMap<>();

    /** Creates an empty registry. */
    public PluginRegistry() {
    }

    /**
     * Discovers every {@link PluginProvider} on a class loader.
     *
     * @param loader the class loader, or null for the thread's context loader
     * @return the registry
     * @throws IllegalStateException if two plugins claim the same id
     */
    public static PluginRegistry discover(ClassLoader loader) {
        PluginRegistry r = new PluginRegistry();
        ClassLoader cl = loader != null ? loader : Thread.currentThread().getContextClassLoader();
        for (PluginProvider p : ServiceLoader.load(PluginProvider.class, cl)) {
            r.add(p);
        }
        return r;
    }

    /**
     * Adds a provider.
     *
     * @param p the provider
     * @return this registry
     * @throws IllegalStateException if its id is taken
     */
    public PluginRegistry add(PluginProvider p) {
        String id = p.descriptor().id();
        PluginProvider old = byId.putIfAbsent(id, p);
        if (old != null && old.getClass() != p.getClass()) {
            throw new IllegalStateException("two plugins claim the id '" + id + "': " + old.getClass().getName()
                    + " and " + p.getClass().getName());
        }
        return this;
    }

    /**
     * Looks a plugin up.
     *
     * @param id plugin id
     * @return the provider, or null
     */
    public PluginProvider find(String id) {
        return byId.get(id);
    }

    /**
     * All plugins, sorted by id.
     *
     * @return providers
     */
    public Collection<PluginProvider> all() {
        return Collections.unmodifiableCollection(byId.values());
    }
}
