package org.accordia.bench;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * The machine a measurement ran on: processors visible to the JVM, Java version, operating system
 * and the load average when the measurement started (the machine may be shared, and the load
 * changes every ratio).
 *
 * @param cores processors available to the JVM
 * @param javaVersion {@code java.version} and VM name
 * @param os operating system name and architecture
 * @param loadAverage 1-, 5- and 15-minute load averages (from /proc/loadavg; NaN where unknown)
 * @param maxHeapMb the JVM's maximum heap, MiB
 */
public record Machine(int cores, String javaVersion, String os, double[] loadAverage, long maxHeapMb) {

    /** The machine as it is now. */
    public static Machine now() {
        return new Machine(Runtime.getRuntime().availableProcessors(),
            System.getProperty("java.version") + " (" + System.getProperty("java.vm.name") + ")",
            System.getProperty("os.name") + " " + System.getProperty("os.arch"), currentLoadAverage(),
            Runtime.getRuntime().maxMemory() >> 20);
    }

    /** 1-, 5- and 15-minute load averages; NaN entries when the system does not say. */
    public static double[] currentLoadAverage() {
        Path p = Path.of("/proc/loadavg");
        try {
            if (Files.isReadable(p)) {
                String[] f = Files.readString(p, StandardCharsets.US_ASCII).trim().split("\\s+");
                return new double[] {Double.parseDouble(f[0]), Double.parseDouble(f[1]), Double.parseDouble(f[2])};
            }
        } catch (IOException | RuntimeException e) {
            // fall through to the management bean
        }
        double one = ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
        return new double[] {one >= 0 ? one : Double.NaN, Double.NaN, Double.NaN};
    }

    /** One line for a report. */
    public String describe() {
        return String.format(Locale.ROOT, "%d cores, Java %s, %s, max heap %d MiB, load average %.2f %.2f %.2f",
            cores, javaVersion, os, maxHeapMb, loadAverage[0], loadAverage[1], loadAverage[2]);
    }

    /** Load average now, as text. */
    public static String loadNow() {
        double[] l = currentLoadAverage();
        return String.format(Locale.ROOT, "%.2f %.2f %.2f", l[0], l[1], l[2]);
    }
}
