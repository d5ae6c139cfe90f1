package org.accordia.run;

import java.nio.file.Path;
import java.util.Objects;
import org.accordia.report.SummaryJson;

/**
 * Where a run's protocol came from, in the order of precedence: the file given explicitly, the
 * study's {@value StudyRun#STUDY_PROTOCOL}, the built-in defaults. Recorded in the outputs
 * (summary.json {@code protocol.source}, the report's settings section).
 *
 * @param kind which of the three
 * @param file the protocol file read, or null for the defaults and a supplied protocol
 */
public record ProtocolSource(Kind kind, Path file) {

    /** The three places a protocol comes from. */
    public enum Kind {
        /** A file named on the command line ({@code --protocol}). */
        GIVEN("given_file"),
        /** The study folder's {@value StudyRun#STUDY_PROTOCOL}. */
        STUDY("study_folder"),
        /** No file: the documented defaults, one structure per label value present. */
        DEFAULTS("defaults"),
        /** A protocol object handed over by a library caller (benchmarks, simulations). */
        SUPPLIED("supplied");

        private final String key;

        Kind(String key) {
            this.key = key;
        }

        /** The value written in summary.json. */
        public String key() {
            return key;
        }
    }

    public ProtocolSource {
        Objects.requireNonNull(kind, "kind");
        if ((kind == Kind.GIVEN || kind == Kind.STUDY) != (file != null)) {
            throw new IllegalArgumentException("a protocol file goes with GIVEN and STUDY only");
        }
    }

    /**
     * As summary.json records it: the kind's key and the file relative to the study root, or its
     * name alone when outside the study (no absolute path, so the file does not depend on where the
     * study lies).
     */
    public SummaryJson.ProtocolInfo info(Path studyRoot) {
        if (file == null) {
            return new SummaryJson.ProtocolInfo(kind.key(), null);
        }
        Path abs = file.toAbsolutePath().normalize();
        Path root = studyRoot.toAbsolutePath().normalize();
        String shown = abs.startsWith(root) ? root.relativize(abs).toString().replace('\\', '/')
            : String.valueOf(abs.getFileName());
        return new SummaryJson.ProtocolInfo(kind.key(), shown);
    }

    /** The source in words, for the report and the inspection. */
    public String words() {
        return switch (kind) {
            case GIVEN -> "the file given with --protocol (" + file.getFileName() + ")";
            case STUDY -> StudyRun.STUDY_PROTOCOL + " in the study folder";
            case DEFAULTS -> "built-in defaults (docs/protocol.md), one structure per label value present";
            case SUPPLIED -> "a protocol supplied by the calling program";
        };
    }
}
