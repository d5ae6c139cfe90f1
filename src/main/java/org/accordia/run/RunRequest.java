package org.accordia.run;

import java.nio.file.Path;
import java.util.Objects;

/**
 * What a run is asked to read: the study (a folder, or a manifest file) and the optional
 * overrides of the command line.
 *
 * @param study the study folder or manifest
 * @param protocolFile the protocol file given explicitly, or null (then the study's
 *     {@value StudyRun#STUDY_PROTOCOL}, else the built-in defaults)
 * @param seed a seed overriding the protocol's, or null
 * @param maxVoxels a voxel limit overriding the protocol's {@code max_voxels}, or null
 * @param allowOutsideRoot accept mask and image paths that lead outside the study folder
 */
public record RunRequest(Path study, Path protocolFile, Long seed, Long maxVoxels, boolean allowOutsideRoot) {
    public RunRequest {
        Objects.requireNonNull(study, "study");
    }

    /** A request for the study alone: its own protocol (or the defaults), no override. */
    public static RunRequest of(Path study) {
        return new RunRequest(study, null, null, null, false);
    }

    public RunRequest withProtocolFile(Path file) {
        return new RunRequest(study, file, seed, maxVoxels, allowOutsideRoot);
    }

    public RunRequest withSeed(Long newSeed) {
        return new RunRequest(study, protocolFile, newSeed, maxVoxels, allowOutsideRoot);
    }
}
