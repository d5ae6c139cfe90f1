package org.accordia.bench;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.io.InputException;
import org.accordia.study.Protocol;
import org.accordia.study.Structure;

/**
 * Generated benchmark studies cached in a work folder: one sub-folder per generator
 * specification, named from its roster and grid, with the full specification written beside the
 * study ({@value #SPEC_FILE}) once generation has completed. A folder is reused only when that file
 * holds exactly the same specification; otherwise the study is generated again into a temporary
 * folder and renamed into place.
 */
public final class BenchStudies {
    /** Written last into a cached study: the generator specification it was made from. */
    public static final String SPEC_FILE = "bench-spec.txt";

    private BenchStudies() {
    }

    /** The spec of the benchmark study: demo plants, 3 centres x 3 readers, the given grid. */
    public static DemoSpec spec(int cases, int[] size, double[] spacingMm) {
        DemoSpec base = DemoSpec.defaults().withRoster(cases, 3, 3)
            .withGrid(size[0], size[1], size[2], spacingMm[0], spacingMm[1], spacingMm[2]);
        return base;
    }

    /**
     * The protocol the benchmarks analyse with: every default, and the structures of the demo
     * protocol (protocols/demo.yaml): {@code lesion} = labels {1, 2} (tolerance 2 mm) and
     * {@code core} = label {2} (1.5 mm).
     */
    public static Protocol protocol() {
        Protocol d = Protocol.defaults();
        return new Protocol("benchmark (generated)", List.of(new Structure("lesion", List.of(1, 2), 2.0),
            new Structure("core", List.of(2), 1.5)), d.geometryToleranceMm(), d.maxVoxels(), d.seed(), d.agreement(),
            d.consensus(), d.shift(), d.review());
    }

    /** Folder name of a spec inside the work folder. */
    public static String folderNameOf(DemoSpec s) {
        return String.format(Locale.ROOT, "study-%dc-%dx%dx%d-%s-%08x", s.cases(), s.nx(), s.ny(), s.nz(),
            (s.sxMm() + "x" + s.syMm() + "x" + s.szMm()).replace('.', 'p'), s.toString().hashCode());
    }

    /** True when the folder holds a completed study of exactly this spec. */
    public static boolean isCached(Path folder, DemoSpec spec) {
        Path f = folder.resolve(SPEC_FILE);
        try {
            return Files.isRegularFile(f) && Files.readString(f, StandardCharsets.UTF_8).trim().equals(spec.toString());
        } catch (IOException e) {
            return false;
        }
    }

    /**
     * The study of {@code spec} inside {@code workDir}, generated (with {@code threads} workers) when
     * no completed copy is there.
     *
     * @return the study folder
     */
    public static Path ensure(DemoSpec spec, Path workDir, int threads) throws IOException, InputException {
        Path target = workDir.resolve(folderNameOf(spec));
        if (isCached(target, spec)) {
            return target;
        }
        Files.createDirectories(workDir);
        Path tmp = workDir.resolve(".tmp-" + folderNameOf(spec) + "-" + ProcessHandle.current().pid());
        deleteTree(tmp);
        DemoGenerator.generate(spec, tmp, threads);
        Files.writeString(tmp.resolve(SPEC_FILE), spec + "\n", StandardCharsets.UTF_8);
        deleteTree(target);
        try {
            Files.move(tmp, target, StandardCopyOption.ATOMIC_MOVE);
        } catch (AtomicMoveNotSupportedException e) {
            Files.move(tmp, target);
        }
        return target;
    }

    /** Deletes a folder and everything below it, if it exists. */
    static void deleteTree(Path p) throws IOException {
        if (!Files.exists(p)) {
            return;
        }
        try (Stream<Path> s = Files.walk(p)) {
            for (Path q : (Iterable<Path>) s.sorted(Comparator.reverseOrder())::iterator) {
                Files.delete(q);
            }
        }
    }
}
