package org.accordia.study;

import java.nio.file.Path;
import java.util.Comparator;
import java.util.Objects;

/**
 * Something found while discovering or inspecting a study.
 *
 * @param severity how much it matters: {@link Severity#ERROR} makes the study not analysable
 * @param file the file or folder concerned, or {@code null} when the problem is study-wide
 * @param message one line saying what is wrong (without the file name)
 */
public record StudyProblem(Severity severity, Path file, String message) implements Comparable<StudyProblem> {

    /** How much a problem matters. */
    public enum Severity {
        /** The study cannot be analysed as it is (unreadable mask, geometry mismatch, too few readers). */
        ERROR,
        /** Analysis can run, but a part is skipped or not estimable (a case with one reader, a symlink loop). */
        WARNING,
        /** Information: an ignored file, a centre with a single reader. */
        NOTE
    }

    private static final Comparator<StudyProblem> ORDER = Comparator
        .comparing(StudyProblem::severity)
        .thenComparing(p -> p.file() == null ? "" : p.file().toString())
        .thenComparing(StudyProblem::message);

    public StudyProblem {
        Objects.requireNonNull(severity, "severity");
        Objects.requireNonNull(message, "message");
        message = message.replace('\n', ' ').replace('\r', ' ');
    }

    public static StudyProblem error(Path file, String message) {
        return new StudyProblem(Severity.ERROR, file, message);
    }

    public static StudyProblem warning(Path file, String message) {
        return new StudyProblem(Severity.WARNING, file, message);
    }

    public static StudyProblem note(Path file, String message) {
        return new StudyProblem(Severity.NOTE, file, message);
    }

    @Override
    public int compareTo(StudyProblem o) {
        return ORDER.compare(this, o);
    }

    /** "SEVERITY: file: message", one line. */
    public String line() {
        return severity + ": " + org.accordia.io.Messages.oneLine((file == null ? "" : file + ": ") + message);
    }
}
