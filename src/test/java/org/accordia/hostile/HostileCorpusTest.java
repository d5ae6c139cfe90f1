package org.accordia.hostile;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;
import org.accordia.cli.Main;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The corpus of bad inputs ({@code src/test/resources/hostile/<kind>/}, written by
 * {@link HostileCorpus}; symbolic links and non-UTF-8 names are built here) run through the
 * command line in-process. Every kind must end with exit code 2, exactly one line on stderr
 * (no stack trace), and a line naming the offending file and the problem. For {@code inspect},
 * which collects problems into its report, that line is the report's problem line on stdout
 * and the single stderr line says the study cannot be analysed; errors in the study description
 * or the protocol stop at once with the one stderr line naming the file.
 */
class HostileCorpusTest {
    static final Path CORPUS = Path.of("src/test/resources/hostile");

    @TempDir
    Path tmp;

    /**
     * One kind of bad input.
     *
     * @param kind the corpus folder (or a built kind's name)
     * @param file a fragment of the offending file's path that the problem line must contain
     * @param phrase the words that say what is wrong
     */
    record Kind(String kind, String file, String phrase) {
        @Override
        public String toString() {
            return kind;
        }
    }

    /** The table: kind, the file named, the problem phrase (from the readers' and loader's messages). */
    static Stream<Kind> kinds() {
        return Stream.of(
            new Kind("nifti-truncated-header", "r2/case1.nii", "truncated header: 200 bytes"),
            new Kind("nifti-truncated-data", "r2/case1.nii", "truncated data: expected 32 bytes, found 10"),
            new Kind("nifti-bad-magic", "r2/case1.nii", "bad magic"),
            new Kind("nifti-sizeof-hdr-wrong", "r2/case1.nii", "sizeof_hdr reads 349"),
            new Kind("nifti-negative-dimension", "r2/case1.nii", "dim[2] = -4 (must be positive)"),
            new Kind("nifti-zero-dimension", "r2/case1.nii", "dim[3] = 0 (must be positive)"),
            new Kind("nifti-dimension-overflow", "r2/case1.nii", "overflow a 64-bit voxel count"),
            new Kind("nifti-trillion-voxels", "r2/case1.nii", "declares 1000000000000 voxels"),
            new Kind("nifti-vox-offset-beyond-file", "r2/case1.nii", "vox_offset 100000 is beyond the end of the file"),
            new Kind("nifti-corrupt-gzip", "r2/case1.nii.gz", "corrupt gzip stream"),
            new Kind("nifti-gzip-bomb", "r2/case1.nii.gz", "payload larger than declared"),
            new Kind("nifti-unsupported-datatype", "r2/case1.nii", "unsupported datatype 128 (RGB24)"),
            new Kind("nifti-non-integral-float-labels", "r2/case1.nii", "non-integral label value 0.5"),
            new Kind("nifti-nan-in-float-mask", "r2/case1.nii", "label value NaN"),
            new Kind("nifti-big-endian-wrong-flag", "r2/case1.nii", "is the byte order wrong?"),
            new Kind("nifti-4d-series", "r2/case1.nii", "3 time points is not a single 3-D volume"),
            new Kind("nifti-negative-label", "r2/case1.nii", "negative label value -1"),
            new Kind("nifti-detached-pair", "r2/case1.nii", "detached .hdr/.img pair"),
            new Kind("nrrd-missing-sizes", "r2/case1.nrrd", "missing required field \"sizes\""),
            new Kind("nrrd-detached-data-missing", "r2/case1.nhdr", "data file not found"),
            new Kind("nrrd-unsupported-encoding", "r2/case1.nrrd", "unsupported encoding \"bzip2\""),
            new Kind("nrrd-data-file-escape", "r2/case1.nhdr", "lies outside the header's folder"),
            new Kind("nrrd-big-endian-wrong-flag", "r2/case1.nrrd", "non-integral label value"),
            new Kind("metaimage-missing-raw", "r2/case1.mhd", "data file not found"),
            new Kind("metaimage-compressed-size-beyond-file", "r2/case1.mha", "CompressedDataSize is 99999 bytes"),
            new Kind("tiff-zero-dimension", "r2/case1.tif", "dimension 2 is 0 (must be positive)"),
            new Kind("png-truncated", "r2/case1.png", "ImageJ could not read the image"),
            new Kind("mismatched-geometry", "r2/case1.nii", "grid differs from"),
            new Kind("reader-under-two-centres", "r1", "appears under two centres"),
            new Kind("one-reader", "study", "the study has 1 reader(s)"),
            new Kind("empty-study", "study", "the study has no case"),
            new Kind("max-voxels-exceeded", "r1/case1.nii", "more than the limit of 16"),
            new Kind("manifest-too-few-columns", "manifest.csv", "line 3: 3 column(s), expected 4"),
            new Kind("manifest-path-escape", "manifest.csv", "leads outside the study root"),
            new Kind("manifest-duplicate-row", "manifest.csv", "duplicate row for case 'case1' and reader 'r1'"),
            new Kind("manifest-unknown-column", "manifest.csv", "unknown column 'colour'"),
            new Kind("manifest-bad-quoting", "manifest.csv", "malformed CSV"),
            new Kind("manifest-unknown-extension", "b.txt", "unrecognised volume format"),
            new Kind("manifest-reader-under-two-centres", "manifest.csv", "a reader belongs to exactly one centre"),
            new Kind("manifest-long-file-name", "n".repeat(300) + ".nii", "File name too long"),
            new Kind("manifest-not-utf8", "manifest.csv", "not valid UTF-8 text"),
            new Kind("protocol-unknown-key", "protocol.yaml", "shift.alpah: unknown key"),
            new Kind("protocol-wrong-type", "protocol.yaml", "geometry_tolerance_mm: expected a number, got a list"),
            new Kind("protocol-alias-bomb", "protocol.yaml", "aliases"),
            new Kind("protocol-max-voxels-out-of-range", "protocol.yaml", "max_voxels: must lie between 1 and"),
            new Kind("tiff-directory-loop", "r2/case1.tif", "directory chain loops"),
            new Kind("tiff-value-count-beyond-file", "r2/case1.tif", "more than the file's 809 bytes hold"),
            new Kind("tiff-pixels-beyond-file", "r2/case1.tif", "truncated data: TIFF directory 1"),
            new Kind("label-above-65535", "r2/case1.nii", "label value 70000 is above 65535"),
            new Kind("label-int-max", "r2/case1.nii", "label value 2147483647 is above 65535"),
            new Kind("protocol-huge-resamples", "protocol.yaml", "bootstrap_resamples: must be an integer between 100 and 100000"),
            new Kind("protocol-label-above-65535", "protocol.yaml", "must be an integer between 1 and 65535"),
            // the study's own protocol.yaml: inspect reads it as analyze does, and both refuse it alike
            new Kind("study-protocol-bad", "study/protocol.yaml", "shift.alpah: unknown key"),
            new Kind("study-protocol-folder", "study/protocol.yaml", "protocol file is not a regular file"),
            // readable masks without a voxel to analyse: inspect says "cannot be analysed", analyze refuses
            new Kind("every-mask-empty", "study", "no mask holds any foreground label"),
            new Kind("every-mask-empty-named-structures", "study",
                "no mask holds a voxel of any structure of the protocol (lesion)"),
            // built here: cannot be committed to git
            new Kind("mask-named-pipe", "r2/case1.nii", "named pipe"),
            new Kind("mask-dangling-link", "r2/case1.nii", "dangling symbolic link"),
            new Kind("protocol-named-pipe", "protocol.yaml", "named pipe"),
            new Kind("nrrd-data-file-link-outside", "r2/case1.nhdr", "outside the header's folder through a symbolic link"),
            new Kind("metaimage-data-file-link-to-environ", "r2/case1.mhd", "outside the header's folder through a symbolic link"),
            new Kind("symlink-loop", "r2", "symbolic link loop"),
            new Kind("symlink-outside-root", "r2", "symbolic link leads outside the study root"),
            new Kind("non-utf8-name", "c1/r", "not valid text in the system encoding"),
            // a named pipe as the study's protocol.yaml: refused before anything opens it (no hang)
            new Kind("study-protocol-fifo", "study/protocol.yaml", "protocol file is not a regular file"));
    }

    /** The committed corpus and the table agree: every folder has a row. */
    @Test
    void everyCommittedKindHasARow() throws IOException {
        List<String> rows = kinds().map(Kind::kind).toList();
        try (Stream<Path> dirs = Files.list(CORPUS)) {
            for (Path d : dirs.toList()) {
                assertTrue(rows.contains(d.getFileName().toString()), "no row for " + d);
            }
        }
        assertTrue(rows.size() >= 30, "at least 30 kinds");
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("kinds")
    void inspectRefusesWithOneLine(Kind k) throws Exception {
        Path kindDir = materialise(k.kind(), tmp);
        Run r = run(inspectArgs(kindDir));
        assertEquals(2, r.code(), k + ": exit code\n" + r.out() + r.err());
        assertOneCleanErrLine(r);
        String all = r.out() + r.err();
        assertTrue(all.lines().anyMatch(l -> l.contains(k.file()) && l.contains(k.phrase())),
            k + ": no line names " + k.file() + " and \"" + k.phrase() + "\"\n" + all);
    }

    // ---------------------------------------------------------------- helpers shared with the analyze tests

    record Run(int code, String out, String err) {
    }

    static Run run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(new PrintWriter(out), new PrintWriter(err), args);
        return new Run(code, out.toString(), err.toString());
    }

    static String[] inspectArgs(Path kindDir) {
        List<String> a = new ArrayList<>(List.of("inspect", kindDir.resolve("study").toString()));
        Path protocol = kindDir.resolve("protocol.yaml");
        if (Files.exists(protocol)) {
            a.addAll(List.of("--protocol", protocol.toString()));
        }
        return a.toArray(String[]::new);
    }

    /** Exactly one line on stderr, from us, without a stack trace. */
    static void assertOneCleanErrLine(Run r) {
        List<String> lines = r.err().lines().toList();
        assertEquals(1, lines.size(), "one line on stderr:\n" + r.err());
        assertTrue(lines.get(0).startsWith("accordia: "), r.err());
        for (String s : List.of(r.out(), r.err())) {
            assertFalse(s.contains("\tat "), "stack trace:\n" + s);
            assertFalse(s.contains("Exception"), "exception class name leaked:\n" + s);
        }
    }

    /**
     * Copies the kind's committed folder into {@code into}, or builds it when it cannot be
     * committed; returns the kind's folder (holding {@code study/} and maybe {@code protocol.yaml}).
     */
    static Path materialise(String kind, Path into) throws IOException, InterruptedException {
        Path dst = into.resolve(kind);
        Path src = CORPUS.resolve(kind);
        if (Files.isDirectory(src)) {
            copyTree(src, dst);
            return dst;
        }
        Path study = dst.resolve("study");
        Path r1 = Files.createDirectories(study.resolve("c1/r1"));
        Files.write(r1.resolve("case1.nii"), HostileCorpus.goodNifti());
        switch (kind) {
            case "symlink-loop" -> Files.createSymbolicLink(study.resolve("c1/r2"), Path.of(".."));
            case "symlink-outside-root" -> {
                Path elsewhere = Files.createDirectories(into.resolve(kind + "-elsewhere/r2"));
                Files.write(elsewhere.resolve("case1.nii"), HostileCorpus.goodNifti());
                Files.createSymbolicLink(study.resolve("c1/r2"), elsewhere);
            }
            case "non-utf8-name" -> {
                // A reader folder named "r" + byte 0xFF: not UTF-8. Java cannot spell such a name, the shell can.
                Process p = new ProcessBuilder("sh", "-c", "d=\"$1/$(printf 'r\\377')\"; mkdir -p \"$d\" && cp \"$2\" \"$d/case1.nii\"",
                    "sh", study.resolve("c1").toString(), r1.resolve("case1.nii").toString()).inheritIO().start();
                assertEquals(0, p.waitFor(), "creating a non-UTF-8 name");
            }
            case "mask-named-pipe", "protocol-named-pipe" -> {
                Path r2 = Files.createDirectories(study.resolve("c1/r2"));
                Files.write(r2.resolve("case1.nii"), HostileCorpus.goodNifti());
                Path fifo = kind.startsWith("mask") ? r2.resolve("case1.nii") : dst.resolve("protocol.yaml");
                Files.deleteIfExists(fifo);
                Process p = new ProcessBuilder("mkfifo", fifo.toString()).inheritIO().start();
                assertEquals(0, p.waitFor(), "mkfifo");
            }
            case "mask-dangling-link" -> Files.createSymbolicLink(Files.createDirectories(study.resolve("c1/r2")).resolve("case1.nii"),
                Path.of("gone.nii"));
            case "nrrd-data-file-link-outside", "metaimage-data-file-link-to-environ" -> {
                Path r2 = Files.createDirectories(study.resolve("c1/r2"));
                Path outside = Files.write(Files.createDirectories(into.resolve(kind + "-elsewhere")).resolve("secret.raw"),
                    HostileCorpus.goodVoxels());
                if (kind.startsWith("nrrd")) {
                    Files.writeString(r2.resolve("case1.nhdr"), "NRRD0004\ntype: uint8\ndimension: 3\nsizes: 4 4 2\n"
                        + "encoding: raw\ndata file: case1.raw\n");
                    Files.createSymbolicLink(r2.resolve("case1.raw"), outside);
                } else {
                    Files.writeString(r2.resolve("case1.mhd"), "ObjectType = Image\nNDims = 3\nDimSize = 4 4 2\n"
                        + "ElementType = MET_UCHAR\nElementDataFile = case1.raw\n");
                    Files.createSymbolicLink(r2.resolve("case1.raw"), Path.of("/proc/self/environ"));
                }
            }
            case "study-protocol-fifo" -> {
                Files.write(Files.createDirectories(study.resolve("c1/r2")).resolve("case1.nii"), HostileCorpus.goodNifti());
                Process p = new ProcessBuilder("mkfifo", study.resolve("protocol.yaml").toString()).inheritIO().start();
                assertEquals(0, p.waitFor(), "creating a named pipe");
            }
            default -> throw new IllegalArgumentException("unknown kind " + kind);
        }
        return dst;
    }

    static void copyTree(Path src, Path dst) throws IOException {
        try (Stream<Path> walk = Files.walk(src)) {
            for (Path p : walk.toList()) {
                Path t = dst.resolve(src.relativize(p).toString());
                if (Files.isDirectory(p)) {
                    Files.createDirectories(t);
                } else {
                    Files.copy(p, t);
                }
            }
        }
    }

    static List<String> kindNames() {
        return kinds().map(Kind::kind).toList();
    }

    static String[] concat(String[] a, String... b) {
        String[] out = Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }
}
