package org.lanesift.viewer;

import java.awt.BorderLayout;
import java.awt.Component;
import java.util.List;
import java.util.function.DoubleConsumer;
import javax.swing.DefaultListCellRenderer;
import javax.swing.DefaultListModel;
import javax.swing.JCheckBox;
import javax.swing.JList;
import javax.swing.JPanel;
import javax.swing.JScrollPane;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.time.Femtos;

/**
 * The findings list: every annotation by time, marked with its severity's colour, optionally only
 * warnings and errors; selecting one moves the waveform and cursor to its start.
 */
public final class FindingsList extends JPanel {
    private static final long serialVersionUID = 1L;

    private transient List<Annotation> all = List.of();
    private final DefaultListModel<Annotation> shown = new DefaultListModel<>();
    private final JList<Annotation> list = new JList<>(shown);
    private final JCheckBox onlyProblems = new JCheckBox("warnings and errors only");

    /**
     * A list.
     *
     * @param jump told the start of the selected annotation, femtoseconds
     */
    public FindingsList(DoubleConsumer jump) {
        super(new BorderLayout());
        list.setCellRenderer(new DefaultListCellRenderer() {
            private static final long serialVersionUID = 1L;

            @Override
            public Component getListCellRendererComponent(JList<?> l, Object v, int i, boolean sel, boolean focus) {
                Annotation a = (Annotation) v;
                super.getListCellRendererComponent(l, line(a), i, sel, focus);
                if (!sel) {
                    setBackground(a.severity() == Severity.INFO ? Palette.PAPER : Palette.fill(a.severity()));
                }
                return this;
            }
        });
        list.addListSelectionListener(e -> {
            Annotation a = list.getSelectedValue();
            if (!e.getValueIsAdjusting() && a != null) {
                jump.accept(a.startFs());
            }
        });
        onlyProblems.addActionListener(e -> refill());
        add(onlyProblems, BorderLayout.NORTH);
        add(new JScrollPane(list), BorderLayout.CENTER);
    }

    /**
     * One line for an annotation.
     *
     * @param a the annotation
     * @return time, severity, track, kind and label
     */
    static String line(Annotation a) {
        return Femtos.format(a.startFs()) + "   " + a.severity().name().toLowerCase(java.util.Locale.ROOT) + "   "
                + a.track() + "   " + a.kind() + ": " + a.label();
    }

    /**
     * Shows the findings of a run; problems only when there are any.
     *
     * @param findings the annotations by time
     */
    public void setFindings(List<Annotation> findings) {
        all = findings;
        onlyProblems.setSelected(findings.stream().anyMatch(a -> a.severity() != Severity.INFO));
        refill();
    }

    /**
     * How many lines are shown.
     *
     * @return the count
     */
    public int shownCount() {
        return shown.size();
    }

    /**
     * Adds annotations that arrived while the chain runs (in arrival order; the list is put in
     * time order when the run ends).
     *
     * @param batch new annotations
     */
    public void append(List<Annotation> batch) {
        List<Annotation> grown = new java.util.ArrayList<>(all);
        grown.addAll(batch);
        all = grown;
        for (Annotation a : batch) {
            if (!onlyProblems.isSelected() || a.severity() != Severity.INFO) {
                shown.addElement(a);
            }
        }
    }

    private void refill() {
        shown.clear();
        for (Annotation a : all) {
            if (!onlyProblems.isSelected() || a.severity() != Severity.INFO) {
                shown.addElement(a);
            }
        }
    }
}
