package org.lanesift.viewer;

import java.awt.BorderLayout;
import java.util.ArrayList;
import java.util.List;
import javax.swing.DefaultListModel;
import javax.swing.JLabel;
import javax.swing.JList;
import javax.swing.JPanel;
import javax.swing.JScrollPane;
import javax.swing.JSplitPane;
import org.lanesift.chain.ChainSpec;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;

/**
 * The chain pane: the instances of the chosen chain as a list ({@code id: plugin}), and for the
 * selected one an {@link OptionForm} built from its plugin's descriptor. Edits that validate
 * replace that node's options in the chain the next run uses.
 */
public final class ChainPane extends JPanel {
    private static final long serialVersionUID = 1L;

    private final transient PluginRegistry registry;
    private transient List<ChainSpec.Node> nodes = new ArrayList<>();
    private transient List<ChainSpec.Wire> wires = List.of();
    private final DefaultListModel<String> names = new DefaultListModel<>();
    private final JList<String> list = new JList<>(names);
    private final JPanel form = new JPanel(new BorderLayout());

    /**
     * A pane.
     *
     * @param registry where descriptors are found
     */
    public ChainPane(PluginRegistry registry) {
        super(new BorderLayout());
        this.registry = registry;
        list.addListSelectionListener(e -> {
            if (!e.getValueIsAdjusting()) {
                showForm(list.getSelectedIndex());
            }
        });
        JSplitPane split = new JSplitPane(JSplitPane.VERTICAL_SPLIT, new JScrollPane(list), new JScrollPane(form));
        split.setResizeWeight(0.35);
        add(split, BorderLayout.CENTER);
    }

    /**
     * Shows a chain for editing.
     *
     * @param spec the chain
     */
    public void setChain(ChainSpec spec) {
        nodes = new ArrayList<>(spec.nodes());
        wires = spec.wires();
        names.clear();
        for (ChainSpec.Node n : nodes) {
            names.addElement(n.id() + ": " + n.plugin());
        }
        showForm(-1);
    }

    /**
     * The chain as edited.
     *
     * @return the model
     */
    public ChainSpec chain() {
        return new ChainSpec(List.copyOf(nodes), wires);
    }

    private void showForm(int i) {
        form.removeAll();
        if (i < 0 || i >= nodes.size()) {
            form.add(new JLabel("select an instance to see its options"), BorderLayout.NORTH);
        } else {
            ChainSpec.Node n = nodes.get(i);
            PluginProvider p = registry.find(n.plugin());
            if (p == null) {
                form.add(new JLabel("plugin '" + n.plugin() + "' is not installed"), BorderLayout.NORTH);
            } else {
                form.add(new OptionForm(p.descriptor(), n.options(),
                        o -> nodes.set(i, new ChainSpec.Node(n.id(), n.plugin(), o))), BorderLayout.NORTH);
            }
        }
        form.revalidate();
        form.repaint();
    }
}
