package org.accordia.bench;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Runs a class of this program in a child JVM (same Java, same class path, a given maximum heap)
 * and collects the {@code key value} lines it prints to standard output, so that each measurement
 * of peak memory starts from a fresh process.
 */
public final class ChildJvm {
    private ChildJvm() {
    }

    /** What the child printed (lines of the form {@code KEY value}) and its exit code. */
    public record Outcome(int exitCode, Map<String, String> values, String stderr) {
        public Outcome {
            values = Map.copyOf(values);
        }

        public long number(String key) {
            String v = values.get(key);
            if (v == null) {
                throw new IllegalStateException("the child did not report " + key + " (exit code " + exitCode + "): "
                    + stderr.strip());
            }
            return Long.parseLong(v.trim().split("\\s+")[0]);
        }
    }

    /**
     * Runs {@code mainClass} with {@code args} in a new JVM with {@code -Xmx<xmx>} and waits for it.
     */
    public static Outcome run(String xmx, Class<?> mainClass, List<String> args) throws IOException, InterruptedException {
        Path java = Path.of(System.getProperty("java.home"), "bin", "java");
        List<String> cmd = new ArrayList<>();
        cmd.add(java.toString());
        cmd.add("-Xmx" + xmx);
        cmd.add("-Djava.awt.headless=true");
        cmd.add("-cp");
        cmd.add(System.getProperty("java.class.path"));
        cmd.add(mainClass.getName());
        cmd.addAll(args);
        Path err = Files.createTempFile("accordia-child", ".err");
        try {
            ProcessBuilder pb = new ProcessBuilder(cmd).redirectError(err.toFile());
            Process p = pb.start();
            p.getOutputStream().close();
            String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
            int code = p.waitFor();
            Map<String, String> values = new HashMap<>();
            for (String line : out.split("\n")) {
                String[] kv = line.trim().split("\\s+", 2);
                if (kv.length == 2 && kv[0].matches("[A-Z_]+")) {
                    values.put(kv[0], kv[1]);
                }
            }
            String e = Files.readString(err, StandardCharsets.UTF_8);
            return new Outcome(code, values, e.length() > 2000 ? e.substring(e.length() - 2000) : e);
        } finally {
            Files.deleteIfExists(err);
        }
    }

    /**
     * Peak resident set size of this process in KiB: VmHWM from /proc/self/status; -1 where the
     * system does not provide it.
     */
    public static long peakResidentKib() {
        Path status = Path.of("/proc/self/status");
        try {
            for (String line : Files.readAllLines(status, StandardCharsets.US_ASCII)) {
                if (line.startsWith("VmHWM:")) {
                    return Long.parseLong(line.substring(6).trim().split("\\s+")[0]);
                }
            }
        } catch (IOException | RuntimeException e) {
            return -1;
        }
        return -1;
    }
}
