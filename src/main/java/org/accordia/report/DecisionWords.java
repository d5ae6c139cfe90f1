package org.accordia.report;

import java.util.List;
import java.util.Locale;
import org.accordia.shift.DesignLimit;
import org.accordia.shift.MaskToCorrect;
import org.accordia.shift.VerdictRules;
import org.accordia.shift.Wording;

/**
 * The words for the typed parts of a decision: one plain sentence per design limitation (used by
 * the report and by {@code inspect}), the headline of rules that give no pooling verdict, and a
 * mask to correct.
 */
public final class DecisionWords {
    private DecisionWords() {
    }

    /** One plain sentence on what the design cannot answer. */
    public static String design(DesignLimit d, double alpha) {
        List<String> c = d.centres();
        return switch (d.kind()) {
            case SINGLE_CENTRE -> "Single centre" + (c.isEmpty() ? "" : " (" + c.get(0) + ")")
                + ": there is no other centre to compare with, so a between-centre shift is not testable.";
            case CANNOT_REACH_ALPHA -> String.format(Locale.ROOT,
                "The readers can be split between the centres in only %,d distinct ways, so the smallest reachable "
                    + "p-value is %s, above %s: no data can make the centre test significant, and a non-significant "
                    + "result is not evidence that there is no shift.", d.partitions(),
                Wording.plain(d.minP() == null ? Double.NaN : d.minP(), 3), Wording.alpha(alpha));
            case TWO_CENTRES -> "With two centres (" + String.join(" and ", c) + ") each is measured against the other: "
                + "the data can show that they differ, not which one departs from the common way of drawing.";
            case ONE_READER_CENTRE -> (c.size() == 1 ? "Centre " + c.get(0) + " has" : "Centres " + String.join(", ", c)
                + " have") + " one reader: a shift there cannot be told apart from that reader's own bias, and "
                + (c.size() == 1 ? "the centre adds" : "these centres add") + " no within-centre variation to the test.";
        };
    }

    /** The headline for a rule that replaces the verdict's usual words, or null. */
    public static String headline(String rule) {
        return switch (rule) {
            case VerdictRules.SINGLE_CENTRE -> "single centre: shift not testable";
            case VerdictRules.EMPTY_CENTRE -> "no pooling verdict: a centre's masks are all empty";
            case VerdictRules.EMPTY_READER -> "no pooling verdict: a reader's masks are all empty";
            default -> null;
        };
    }

    /** "nor1 (norvale) leaves out 1 part (0.12 ml) that most readers mark". */
    public static String correction(MaskToCorrect m) {
        String who = m.reader() + " (" + m.centre() + ")";
        return switch (m.kind()) {
            case LEAVES_OUT_PART -> String.format(Locale.ROOT, "%s leaves out %d part%s (%s ml) that most readers mark",
                who, m.parts(), m.parts() == 1 ? "" : "s", Wording.plain(m.partsMl(), 2));
            case EMPTY_WHILE_OTHERS_DRAW -> who + " leaves the mask empty while every other reader draws the structure";
        };
    }
}
