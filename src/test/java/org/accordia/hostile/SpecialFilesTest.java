package org.accordia.hostile;

import static org.accordia.hostile.HostileCorpusTest.assertOneCleanErrLine;
import static org.accordia.hostile.HostileCorpusTest.run;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.net.StandardProtocolFamily;
import java.net.UnixDomainSocketAddress;
import java.nio.channels.ServerSocketChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.accordia.hostile.HostileCorpusTest.Run;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Every special file type, at every place where a command opens a file: {@code inspect} and
 * {@code analyze} must refuse it with one line and exit code 2, without blocking (a named pipe
 * opened for reading blocks until a writer comes; {@code /dev/zero} never ends). The JUnit
 * timeout is only a hang guard (no timing is asserted); special types the system cannot create
 * are skipped with an assumption.
 *
 * <p>Places: a mask in the folder layout; a mask and an image named by the manifest; the detached
 * data file of an NRRD header and of a MetaImage header; the manifest itself; the study's
 * {@code protocol.yaml}; a {@code --protocol} file.
 */
class SpecialFilesTest {
    @TempDir
    static Path shared;
    static Path demo;
    private static final List<ServerSocketChannel> SOCKETS = new ArrayList<>();

    enum Special { FIFO, DEVICE, FOLDER, SOCKET, DANGLING_LINK, LOOPING_LINK }

    enum Place { LAYOUT_MASK, MANIFEST_MASK, MANIFEST_IMAGE, NRRD_DATA_FILE, METAIMAGE_DATA_FILE, MANIFEST, STUDY_PROTOCOL, PROTOCOL_OPTION }

    @BeforeAll
    static void generate() {
        demo = AnalyzeHostileTest.smallDemo(shared.resolve("demo"));
    }

    @AfterAll
    static void closeSockets() throws IOException {
        for (ServerSocketChannel s : SOCKETS) {
            s.close();
        }
    }

    static Stream<Arguments> cases() {
        List<Arguments> out = new ArrayList<>();
        for (Special s : Special.values()) {
            for (Place p : Place.values()) {
                out.add(Arguments.of(s, p));
            }
        }
        return out.stream();
    }

    @ParameterizedTest(name = "{0} as {1}")
    @MethodSource("cases")
    @Timeout(value = 120, unit = TimeUnit.SECONDS, threadMode = Timeout.ThreadMode.SEPARATE_THREAD)
    void refusedWithOneLineAndNoHang(Special special, Place place) throws Exception {
        Path study = shared.resolve(special + "-" + place);
        HostileCorpusTest.copyTree(demo, study);
        Path masks = study.resolve("esterhaven").resolve("est1");
        List<String> extra = new ArrayList<>();
        Path target;
        switch (place) {
            case LAYOUT_MASK -> {
                Files.delete(study.resolve("manifest.csv"));
                target = masks.resolve("case01.nii.gz");
                Files.delete(target);
            }
            case MANIFEST_MASK -> {
                target = masks.resolve("special.nii");
                replaceInManifest(study, "esterhaven/est1/case01.nii.gz", "esterhaven/est1/special.nii");
            }
            case MANIFEST_IMAGE -> {
                target = study.resolve("images").resolve("special.nii");
                replaceInManifest(study, "images/case01.nii.gz", "images/special.nii");
            }
            case NRRD_DATA_FILE -> {
                Files.writeString(masks.resolve("case01.nhdr"), "NRRD0004\ntype: uint8\ndimension: 3\nsizes: 16 16 6\n"
                    + "spacings: 2 2 5\nencoding: raw\ndata file: case01.raw\n", StandardCharsets.US_ASCII);
                replaceInManifest(study, "esterhaven/est1/case01.nii.gz", "esterhaven/est1/case01.nhdr");
                target = masks.resolve("case01.raw");
            }
            case METAIMAGE_DATA_FILE -> {
                Files.writeString(masks.resolve("case01.mhd"), "ObjectType = Image\nNDims = 3\nDimSize = 16 16 6\n"
                    + "ElementSpacing = 2 2 5\nElementType = MET_UCHAR\nElementDataFile = case01.raw\n", StandardCharsets.US_ASCII);
                replaceInManifest(study, "esterhaven/est1/case01.nii.gz", "esterhaven/est1/case01.mhd");
                target = masks.resolve("case01.raw");
            }
            case MANIFEST -> {
                target = study.resolve("manifest.csv");
                Files.delete(target);
            }
            case STUDY_PROTOCOL -> {
                target = study.resolve("protocol.yaml");
                Files.delete(target);
                extra.addAll(List.of("--seed", "1")); // the built-in defaults would otherwise apply silently
            }
            case PROTOCOL_OPTION -> {
                target = shared.resolve(special + "-" + place + "-protocol.yaml");
                extra.addAll(List.of("--protocol", target.toString()));
            }
            default -> throw new IllegalStateException();
        }
        make(special, target);

        Path out = shared.resolve(special + "-" + place + "-out");
        List<String> inspect = new ArrayList<>(List.of("inspect", study.toString()));
        if (place == Place.PROTOCOL_OPTION) {
            inspect.addAll(extra);
        }
        // A folder named like a mask inside a reader folder is no mask of the layout (which lists
        // exactly three levels): it is skipped with a note and the case counts as missing for that
        // reader, so both commands may complete. Everything else must be refused.
        boolean layoutFolder = special == Special.FOLDER && place == Place.LAYOUT_MASK;
        Run i = run(inspect.toArray(String[]::new));
        assertFalse((i.out() + i.err()).contains("\tat "), i.err());
        if (!layoutFolder) {
            assertEquals(2, i.code(), special + " as " + place + " (inspect):\n" + i.out() + i.err());
        }

        List<String> analyze = new ArrayList<>(List.of("analyze", study.toString(), "--out", out.toString(), "--quiet"));
        analyze.addAll(extra);
        Run a = run(analyze.toArray(String[]::new));
        if (layoutFolder) {
            assertTrue(a.code() == 0 || a.code() == 2, a.err());
            return;
        }
        assertEquals(2, a.code(), special + " as " + place + " (analyze):\n" + a.out() + a.err());
        assertOneCleanErrLine(a);
        assertTrue(!Files.exists(out) || isEmpty(out), "nothing left in the output folder");
    }

    private static boolean isEmpty(Path dir) throws IOException {
        try (Stream<Path> s = Files.list(dir)) {
            return s.findAny().isEmpty();
        }
    }

    private static void replaceInManifest(Path study, String from, String to) throws IOException {
        Path m = study.resolve("manifest.csv");
        String text = Files.readString(m, StandardCharsets.UTF_8);
        assertTrue(text.contains(from), text);
        Files.writeString(m, text.replace(from, to), StandardCharsets.UTF_8);
    }

    /** Creates {@code special} at {@code p} (skipping the test when the system cannot). */
    static void make(Special special, Path p) throws Exception {
        switch (special) {
            case FIFO -> {
                Process proc;
                try {
                    proc = new ProcessBuilder("mkfifo", p.toString()).redirectErrorStream(true).start();
                } catch (IOException e) {
                    assumeTrue(false, "mkfifo is not available: " + e.getMessage());
                    return;
                }
                assumeTrue(proc.waitFor() == 0 && Files.exists(p), "mkfifo failed");
            }
            case DEVICE -> {
                Path dev = Path.of("/dev/zero");
                assumeTrue(Files.exists(dev), "no /dev/zero");
                Files.createSymbolicLink(p, dev);
            }
            case FOLDER -> Files.createDirectories(p);
            case SOCKET -> {
                try {
                    ServerSocketChannel s = ServerSocketChannel.open(StandardProtocolFamily.UNIX);
                    s.bind(UnixDomainSocketAddress.of(p));
                    SOCKETS.add(s);
                } catch (IOException | UnsupportedOperationException e) {
                    assumeTrue(false, "cannot create a Unix domain socket: " + e.getMessage());
                }
            }
            case DANGLING_LINK -> Files.createSymbolicLink(p, p.resolveSibling("nowhere-" + p.getFileName()));
            case LOOPING_LINK -> {
                Path other = p.resolveSibling("loop-" + p.getFileName());
                Files.createSymbolicLink(p, other.getFileName());
                Files.createSymbolicLink(other, p.getFileName());
            }
            default -> throw new IllegalStateException();
        }
    }
}
