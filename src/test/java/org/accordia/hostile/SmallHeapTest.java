package org.accordia.hostile;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.zip.Deflater;
import java.util.zip.GZIPOutputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The command line ({@code inspect} and {@code analyze}) in a separate JVM with a 256 MiB heap, on
 * volumes that would need far more:
 * each must end in the clean refusal (exit 2, one line on stderr naming the problem), never in an
 * OutOfMemoryError and its stack trace.
 */
class SmallHeapTest {
    @TempDir
    Path tmp;

    /** Result of a child JVM. */
    record Child(int code, String out, String err) {
    }

    /** Runs {@code org.accordia.cli.Main} in a new JVM with the test class path and the given heap. */
    static Child runJava(String heap, Path workDir, String... args) throws IOException, InterruptedException {
        List<String> cmd = new ArrayList<>();
        cmd.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        cmd.add("-Xmx" + heap);
        cmd.add("-Djava.awt.headless=true");
        cmd.add("-cp");
        cmd.add(System.getProperty("java.class.path"));
        cmd.add("org.accordia.cli.Main");
        cmd.addAll(List.of(args));
        Path out = Files.createTempFile(workDir, "out", ".txt");
        Path err = Files.createTempFile(workDir, "err", ".txt");
        Process p = new ProcessBuilder(cmd).redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        if (!p.waitFor(120, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            throw new AssertionError("child JVM did not finish");
        }
        return new Child(p.exitValue(), Files.readString(out, StandardCharsets.UTF_8), Files.readString(err, StandardCharsets.UTF_8));
    }

    /**
     * A NIfTI-1 uint8 file of 2048 x 2048 x nz voxels: a valid gzip stream of zeros of exactly
     * the declared size when {@code fullPayload}, else the header and 1 KB only.
     */
    static void bigNifti(Path file, int nz, boolean fullPayload) throws IOException {
        Files.createDirectories(file.getParent());
        byte[] header = HostileCorpus.nifti1Header(ByteOrder.LITTLE_ENDIAN, HostileCorpus.DT_UINT8, 8, 2048, 2048, nz).array();
        if (!fullPayload) {
            Files.write(file, HostileCorpus.concat(header, new byte[1024]));
            return;
        }
        try (OutputStream o = new GZIPOutputStream(new BufferedOutputStream(Files.newOutputStream(file)), 1 << 16) {
            {
                def.setLevel(Deflater.BEST_SPEED);
            }
        }) {
            o.write(header);
            byte[] zeros = new byte[1 << 20];
            for (long n = 0; n < 2048L * 2048 * nz; n += zeros.length) {
                o.write(zeros);
            }
        }
    }

    static void assertCleanRefusal(Child c, String... phrases) {
        assertEquals(2, c.code(), c.out() + c.err());
        assertEquals(1, c.err().lines().count(), "one line on stderr:\n" + c.err());
        String all = c.out() + c.err();
        assertFalse(all.contains("OutOfMemoryError"), all);
        assertFalse(all.contains("\tat "), all);
        for (String p : phrases) {
            assertTrue(all.contains(p), "expected \"" + p + "\" in:\n" + all);
        }
    }

    /** 2048 x 2048 x 1024 uint8 = 4 GiB declared in a 1.4 KB file: refused from the header, nothing allocated. */
    @Test
    void fourGibHeaderWithTinyPayload() throws Exception {
        Path study = tmp.resolve("study");
        bigNifti(study.resolve("c1/r1/case1.nii"), 1024, false);
        bigNifti(study.resolve("c1/r2/case1.nii"), 1024, false);
        Child c = runJava("256m", tmp, "inspect", study.toString());
        assertCleanRefusal(c, "r1/case1.nii", "declares 4294967296 voxels");
        Child a = runJava("256m", tmp, "analyze", study.toString(), "--out", tmp.resolve("out").toString());
        assertCleanRefusal(a, "case1.nii: declares 4294967296 voxels (2048x2048x1024), more than the limit of 2147483631");
        assertFalse(Files.exists(tmp.resolve("out")), "no output folder");
    }

    /**
     * A valid gzip of 2048 x 2048 x 80 zeros (320 MiB of labels, about 0.3 MB on disk) passes
     * every header check; the heap check refuses it before the array is allocated.
     */
    @Test
    void validVolumeLargerThanTheHeap() throws Exception {
        Path study = tmp.resolve("study");
        bigNifti(study.resolve("c1/r1/case1.nii.gz"), 80, true);
        Files.createDirectories(study.resolve("c1/r2"));
        Files.copy(study.resolve("c1/r1/case1.nii.gz"), study.resolve("c1/r2/case1.nii.gz"));
        Child c = runJava("256m", tmp, "inspect", study.toString());
        // the heap's exact size depends on the collector the JVM picks (256 MiB, or a little less)
        assertCleanRefusal(c, "r1/case1.nii.gz", "needs 320 MiB, more than the ", " MiB the Java heap may use");
        Child a = runJava("256m", tmp, "analyze", study.toString(), "--out", tmp.resolve("out").toString());
        assertCleanRefusal(a, "case1.nii.gz: the label volume of 335544320 voxels needs 320 MiB");
        assertFalse(Files.exists(tmp.resolve("out")), "no output folder");
    }

    /**
     * Two masks of 200 MiB each: one fits the 256 MiB heap, the case's two do not. The
     * OutOfMemoryError is caught by the command line: one line, exit 2, nothing left behind.
     */
    @Test
    void caseLargerThanTheHeapEndsInOneLine() throws Exception {
        Path study = tmp.resolve("study");
        bigNifti(study.resolve("c1/r1/case1.nii.gz"), 50, true);
        Files.createDirectories(study.resolve("c1/r2"));
        Files.copy(study.resolve("c1/r1/case1.nii.gz"), study.resolve("c1/r2/case1.nii.gz"));
        Child a = runJava("256m", tmp, "analyze", study.toString(), "--out", tmp.resolve("out").toString(), "--threads", "1");
        assertCleanRefusal(a, "accordia: out of memory (", "raise the heap with -Xmx");
        assertFalse(Files.exists(tmp.resolve("out")), "no output folder");
    }
}
