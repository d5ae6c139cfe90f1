package org.accordia.io;

import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.zip.GZIPInputStream;

/**
 * Times reading gzip'ed 256x256x128 uint8 masks (written by {@link NiftiWriter}) against plain
 * decompression of the same files, in one run. Not a unit test (no assertion on time). Run:
 * <pre>
 * mvn -o -q test-compile
 * java -cp target/classes:target/test-classes:$(ls ~/.m2/repository/org/apache/commons/commons-math3/3.6.1/*.jar) \
 *     org.accordia.io.ReadBenchmark /tmp/accordia-bench
 * </pre>
 */
final class ReadBenchmark {
    private ReadBenchmark() {
    }

    public static void main(String[] args) throws Exception {
        Path dir = Files.createDirectories(Path.of(args.length > 0 ? args[0] : "target/bench"));
        int nx = 256;
        int ny = 256;
        int nz = 128;
        Path[] files = new Path[9];
        for (int m = 0; m < files.length; m++) {
            byte[] labels = new byte[nx * ny * nz];
            // An ellipsoid with two labels, shifted per mask (invented data).
            for (int z = 0; z < nz; z++) {
                for (int y = 0; y < ny; y++) {
                    for (int x = 0; x < nx; x++) {
                        double dx = (x - 128 - m) / 70.0;
                        double dy = (y - 120) / 60.0;
                        double dz = (z - 64) / 40.0;
                        double r = dx * dx + dy * dy + dz * dz;
                        labels[x + nx * (y + ny * z)] = (byte) (r < 0.3 ? 2 : r < 1 ? 1 : 0);
                    }
                }
            }
            files[m] = dir.resolve("mask" + m + ".nii.gz");
            NiftiWriter.writeLabels(files[m], LabelVolume.ofBytes(Geometry.axisAligned(nx, ny, nz, 0.8, 0.8, 1.5), labels));
        }
        long total = 0;
        for (Path f : files) {
            total += Files.size(f);
        }
        System.out.printf("9 masks, %d bytes compressed in total (%.0f KB each)%n", total, total / 9 / 1024.0);
        var bean = java.lang.management.ManagementFactory.getThreadMXBean();
        double bestRead = Double.MAX_VALUE;
        double bestGunzip = Double.MAX_VALUE;
        for (int round = 0; round < 12; round++) {
            long c0 = bean.getCurrentThreadCpuTime();
            long t0 = System.nanoTime();
            long sum = 0;
            for (Path f : files) {
                sum += Volumes.readLabels(f, ReadLimits.DEFAULT).maxLabel();
            }
            long t1 = System.nanoTime();
            long c1 = bean.getCurrentThreadCpuTime();
            long bytes = 0;
            byte[] buf = new byte[1 << 20];
            for (Path f : files) {
                try (InputStream in = new GZIPInputStream(Files.newInputStream(f), 1 << 16)) {
                    int r;
                    while ((r = in.read(buf)) > 0) {
                        bytes += r;
                    }
                }
            }
            long t2 = System.nanoTime();
            long c2 = bean.getCurrentThreadCpuTime();
            bestRead = Math.min(bestRead, (c1 - c0) / 1e6);
            bestGunzip = Math.min(bestGunzip, (c2 - c1) / 1e6);
            System.out.printf("round %d: read 9 masks %.1f ms wall / %.1f ms CPU, plain gunzip %.1f ms wall / %.1f ms CPU"
                    + " [%d %d]%n", round, (t1 - t0) / 1e6, (c1 - c0) / 1e6, (t2 - t1) / 1e6, (c2 - c1) / 1e6, sum, bytes);
        }
        System.out.printf("best CPU time: read 9 masks %.1f ms (%.1f ms per mask); gunzip alone %.1f ms; ratio %.2f%n",
            bestRead, bestRead / 9, bestGunzip, bestRead / bestGunzip);
    }
}
