package org.accordia.cli;

import java.nio.file.Path;
import org.accordia.io.ReadLimits;
import org.accordia.run.RunRequest;
import org.accordia.study.LoadOptions;
import org.accordia.study.Protocol;
import picocli.CommandLine;
import picocli.CommandLine.Option;

/** The options of every command that reads a study's volumes (a picocli mixin). */
public final class ReadOptions {

    @Option(names = "--max-voxels", paramLabel = "N",
        description = "Refuse any volume declaring more voxels than this; overrides the protocol's max_voxels "
            + "(default: the protocol's value, itself 2147483631 by default).")
    Long maxVoxels;

    @Option(names = "--allow-outside-root",
        description = "Accept mask and image paths that lead outside the study folder (default: refused).")
    boolean allowOutsideRoot;

    /** Checks the values (a usage error names the option). */
    void check(CommandLine cl) {
        if (maxVoxels != null && (maxVoxels < 1 || maxVoxels > ReadLimits.ARRAY_LIMIT)) {
            throw new CommandLine.ParameterException(cl, "--max-voxels must lie between 1 and " + ReadLimits.ARRAY_LIMIT);
        }
    }

    /** The protocol with --max-voxels applied. */
    Protocol apply(Protocol p) {
        return maxVoxels == null ? p : p.withMaxVoxels(maxVoxels);
    }

    /** A run request for {@code study} with these options and the protocol file given (or null). */
    RunRequest request(Path study, Path protocolFile) {
        return new RunRequest(study, protocolFile, null, maxVoxels, allowOutsideRoot);
    }

    LoadOptions loadOptions() {
        return new LoadOptions(allowOutsideRoot);
    }

    boolean allowOutsideRoot() {
        return allowOutsideRoot;
    }
}
