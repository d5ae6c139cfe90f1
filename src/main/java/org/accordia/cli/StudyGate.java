package org.accordia.cli;

import org.accordia.io.InputException;
import org.accordia.study.Study;
import org.accordia.study.StudyProblem;

/**
 * What {@code analyze} requires of a discovered study before reading any mask, so that it stops
 * at the first problem with one line instead of failing later or analysing a part silently: no
 * discovery error (a folder link leaving the study root, two masks of one case for one reader,
 * an unlistable folder) and at least two readers. Warnings (a skipped symbolic-link loop, an
 * unusable file name) do not stop it.
 */
final class StudyGate {
    private StudyGate() {
    }

    static void requireAnalysable(Study s) throws InputException {
        for (StudyProblem p : s.problems().stream().sorted().toList()) {
            if (p.severity() == StudyProblem.Severity.ERROR) {
                throw new InputException(p.file(), p.message());
            }
        }
        if (s.readers().size() < 2) {
            throw new InputException(s.manifest() != null ? s.manifest() : s.root(), "the study has "
                + s.readers().size() + " reader(s); agreement needs at least 2");
        }
    }
}
