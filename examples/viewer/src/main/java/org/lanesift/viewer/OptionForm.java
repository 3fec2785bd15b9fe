package org.lanesift.viewer;

import java.awt.Color;
import java.awt.GridBagConstraints;
import java.awt.GridBagLayout;
import java.awt.Insets;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.function.Consumer;
import javax.swing.JComboBox;
import javax.swing.JComponent;
import javax.swing.JLabel;
import javax.swing.JPanel;
import javax.swing.JTextField;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;

/**
 * A settings form built from a plugin's descriptor, nothing hand-written per plugin: one line per
 * {@link OptionSpec} with its name and unit, a field (a drop-down for a choice or a yes/no, text
 * otherwise) holding the value set or, greyed, the default; the help and the allowed range as the
 * tooltip; and a line under the form with the error {@link OptionValues#validate} gives, naming
 * the option and its range. Only values that validate are handed on.
 */
public final class OptionForm extends JPanel {
    private static final long serialVersionUID = 1L;

    private final JLabel error = new JLabel(" ");

    /**
     * A form.
     *
     * @param d        the plugin's descriptor
     * @param values   the options set now (not changed by the form)
     * @param accepted told the new option map each time an edit validates
     */
    public OptionForm(PluginDescriptor d, Map<String, Object> values, Consumer<Map<String, Object>> accepted) {
        super(new GridBagLayout());
        Map<String, Object> current = new LinkedHashMap<>(values);
        GridBagConstraints c = new GridBagConstraints();
        c.insets = new Insets(2, 4, 2, 4);
        c.anchor = GridBagConstraints.WEST;
        int row = 0;
        JLabel title = new JLabel(d.displayName() + "  (" + d.id() + " " + d.version() + ")");
        c.gridx = 0;
        c.gridy = row++;
        c.gridwidth = 2;
        add(title, c);
        c.gridwidth = 1;
        for (OptionSpec o : d.options()) {
            String unit = o.unit() == null || o.unit().isEmpty() ? "" : " (" + o.unit() + ")";
            JLabel name = new JLabel(o.name() + unit);
            String tip = "<html>" + escape(o.help()) + (o.range() == null || o.range().isEmpty() ? "" : "<br>range: " + escape(o.range())) + "</html>";
            name.setToolTipText(tip);
            JComponent field = field(o, current, d, accepted);
            field.setToolTipText(tip);
            c.gridx = 0;
            c.gridy = row;
            c.fill = GridBagConstraints.NONE;
            c.weightx = 0;
            add(name, c);
            c.gridx = 1;
            c.fill = GridBagConstraints.HORIZONTAL;
            c.weightx = 1;
            add(field, c);
            row++;
        }
        error.setForeground(new Color(0xC0392B));
        c.gridx = 0;
        c.gridy = row;
        c.gridwidth = 2;
        add(error, c);
    }

    private JComponent field(OptionSpec o, Map<String, Object> current, PluginDescriptor d, Consumer<Map<String, Object>> accepted) {
        Object set = current.get(o.name());
        if (o.type() == OptionSpec.Type.CHOICE || o.type() == OptionSpec.Type.BOOLEAN) {
            String[] items = o.type() == OptionSpec.Type.BOOLEAN ? new String[] {"true", "false"} : o.choices().toArray(new String[0]);
            JComboBox<String> box = new JComboBox<>(items);
            box.setSelectedItem(String.valueOf(set != null ? set : o.defaultValue()));
            box.addActionListener(e -> edit(o.name(), box.getSelectedItem(), current, d, accepted));
            return box;
        }
        JTextField t = new JTextField(set == null ? "" : String.valueOf(set), 14);
        if (set == null && o.defaultValue() != null) {
            t.setText(String.valueOf(o.defaultValue()));
            t.setForeground(Color.GRAY);
        }
        t.addActionListener(e -> edit(o.name(), t.getText(), current, d, accepted));
        t.addFocusListener(new java.awt.event.FocusAdapter() {
            @Override
            public void focusLost(java.awt.event.FocusEvent e) {
                edit(o.name(), t.getText(), current, d, accepted);
            }
        });
        return t;
    }

    private void edit(String option, Object value, Map<String, Object> current, PluginDescriptor d, Consumer<Map<String, Object>> accepted) {
        Map<String, Object> next = new LinkedHashMap<>(current);
        if (value == null || value.toString().isBlank()) {
            next.remove(option);
        } else {
            next.put(option, value.toString().trim());
        }
        String problem = check(d, next);
        error.setText(problem == null ? " " : problem);
        if (problem == null && !next.equals(current)) {
            current.clear();
            current.putAll(next);
            accepted.accept(new LinkedHashMap<>(next));
        }
    }

    /**
     * Validates options as the chain will.
     *
     * @param d       the descriptor
     * @param options raw values
     * @return the error naming the option and what is allowed, or null when they are valid
     */
    static String check(PluginDescriptor d, Map<String, Object> options) {
        try {
            OptionValues.validate(d, options);
            return null;
        } catch (InputException e) {
            return e.getMessage();
        }
    }

    /**
     * The error shown now.
     *
     * @return the text, blank when none
     */
    String errorText() {
        return error.getText();
    }

    private static String escape(String s) {
        return s == null ? "" : s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;");
    }
}
