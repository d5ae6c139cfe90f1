package org.accordia.agreement;

import org.accordia.study.ReaderId;
import org.accordia.study.Structure;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.zip.GZIPInputStream;
import java.util.zip.GZIPOutputStream;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;

/**
 * Not a unit test: a timing harness for the case agreement engine on a synthetic case of nine
 * perturbed ellipsoid masks (256×256×128 voxels, 0.7×0.7×1.5 mm, lesions about 60 mm across,
 * labels 1 = rim and 2 = core). Prints the engine's time against the time to gunzip the nine
 * masks, measured in the same run.
 *
 * <pre>
 * mvn -o -q test-compile &amp;&amp; java -cp target/classes:target/test-classes org.accordia.agreement.AgreementBenchmark [threads] [rounds]
 * </pre>
 */
public final class AgreementBenchmark {
    private AgreementBenchmark() {
    }

    /** Nine readers' masks of one invented lesion: shared shape, each reader shifted, scaled and wobbled. */
    static List<LabelVolume> syntheticCase(long seed, int readers) {
        int nx = 256;
        int ny = 256;
        int nz = 128;
        double sx = 0.7;
        double sy = 0.7;
        double sz = 1.5;
        Geometry g = Geometry.axisAligned(nx, ny, nz, sx, sy, sz);
        Random rnd = new Random(seed);
        List<LabelVolume> out = new ArrayList<>();
        double cx = 120 * sx;
        double cy = 135 * sy;
        double cz = 60 * sz;
        for (int r = 0; r < readers; r++) {
            double ox = cx + rnd.nextGaussian() * 1.0;
            double oy = cy + rnd.nextGaussian() * 1.0;
            double oz = cz + rnd.nextGaussian() * 1.5;
            double ax = 30 * (1 + 0.05 * rnd.nextGaussian());
            double ay = 26 * (1 + 0.05 * rnd.nextGaussian());
            double az = 22 * (1 + 0.05 * rnd.nextGaussian());
            double wob = 0.04 + 0.03 * rnd.nextDouble();
            double ph = rnd.nextDouble() * 6.28;
            byte[] lab = new byte[nx * ny * nz];
            for (int z = 0; z < nz; z++) {
                double dz = (z * sz - oz) / az;
                if (Math.abs(dz) > 1.2) {
                    continue;
                }
                for (int y = 0; y < ny; y++) {
                    double dy = (y * sy - oy) / ay;
                    if (dy * dy + dz * dz > 1.44) {
                        continue;
                    }
                    for (int x = 0; x < nx; x++) {
                        double dx = (x * sx - ox) / ax;
                        double rr = dx * dx + dy * dy + dz * dz;
                        double bump = 1 + wob * Math.sin(5 * Math.atan2(dy, dx) + ph) * Math.cos(3 * dz);
                        if (rr <= bump * bump) {
                            lab[x + nx * (y + ny * z)] = (byte) (rr <= 0.3 * bump ? 2 : 1);
                        }
                    }
                }
            }
            out.add(LabelVolume.ofBytes(g, lab));
        }
        return out;
    }

    static byte[] gzip(byte[] b) throws IOException {
        ByteArrayOutputStream bos = new ByteArrayOutputStream();
        try (GZIPOutputStream gz = new GZIPOutputStream(bos)) {
            gz.write(b);
        }
        return bos.toByteArray();
    }

    static long inflateNanos(List<byte[]> packed, int size) throws IOException {
        long t0 = System.nanoTime();
        long check = 0;
        for (byte[] p : packed) {
            byte[] out = new byte[size];
            try (InputStream in = new GZIPInputStream(new ByteArrayInputStream(p), 1 << 16)) {
                int off = 0;
                int n;
                while (off < size && (n = in.read(out, off, size - off)) > 0) {
                    off += n;
                }
            }
            check += out[size / 2];
        }
        long t = System.nanoTime() - t0;
        return check == Long.MIN_VALUE ? -1 : t;
    }

    public static void main(String[] args) throws IOException {
        int threads = args.length > 0 ? Integer.parseInt(args[0]) : 2;
        int rounds = args.length > 1 ? Integer.parseInt(args[1]) : 15;
        List<LabelVolume> masks = syntheticCase(7L, 9);
        List<ReaderId> ids = new ArrayList<>();
        for (int j = 0; j < 9; j++) {
            ids.add(new ReaderId("reader" + j, "centre" + (j % 3)));
        }
        List<byte[]> packed = new ArrayList<>();
        for (LabelVolume m : masks) {
            packed.add(gzip(m.bytes()));
        }
        List<Structure> structures = List.of(Structure.of("whole", 1, 2), Structure.of("core", 2));
        ExecutorService pool = threads > 1 ? Executors.newFixedThreadPool(threads - 1) : null;
        try {
            CaseAgreementEngine engine = new CaseAgreementEngine(2.0, 2.0, pool);
            long[] engineNs = new long[rounds];
            long[] inflateNs = new long[rounds];
            long[] engineCpuNs = new long[rounds];
            long[] inflateCpuNs = new long[rounds];
            java.lang.management.ThreadMXBean mx = java.lang.management.ManagementFactory.getThreadMXBean();
            List<CaseAgreement> last = null;
            for (int i = 0; i < rounds; i++) {
                long c0 = mx.getCurrentThreadCpuTime();
                inflateNs[i] = inflateNanos(packed, masks.get(0).voxelCount());
                long c1 = mx.getCurrentThreadCpuTime();
                long t0 = System.nanoTime();
                last = engine.evaluate("bench", ids, masks, structures);
                engineNs[i] = System.nanoTime() - t0;
                engineCpuNs[i] = mx.getCurrentThreadCpuTime() - c1;
                inflateCpuNs[i] = c1 - c0;
            }
            Arrays.sort(engineNs);
            Arrays.sort(inflateNs);
            Arrays.sort(engineCpuNs);
            Arrays.sort(inflateCpuNs);
            double e = engineNs[rounds / 2] / 1e6;
            double f = inflateNs[rounds / 2] / 1e6;
            if (threads == 1) {
                System.out.printf(Locale.ROOT, "single thread CPU time: median engine=%.1f ms, gunzip 9 masks=%.1f ms,"
                        + " ratio=%.2f%n", engineCpuNs[rounds / 2] / 1e6, inflateCpuNs[rounds / 2] / 1e6,
                    (double) engineCpuNs[rounds / 2] / inflateCpuNs[rounds / 2]);
            }
            CaseAgreement w = last.get(0);
            System.out.printf(Locale.ROOT, "threads=%d rounds=%d median engine=%.1f ms (min %.1f) | gunzip 9 masks=%.1f ms"
                    + " | ratio engine/gunzip=%.2f%n", threads, rounds, e, engineNs[0] / 1e6, f, e / f);
            System.out.printf(Locale.ROOT, "whole: box=%s volume r0=%.2f ml meanDice=%.4f meanHD95=%.3f mm kappa=%.4f"
                    + " regionVoxels=%d pairs=%d%n", w.unionBox(), w.volumesMl().get(0), w.meanDice(), w.meanHd95Mm(),
                w.fleissKappa(), w.kappaRegionVoxels(), w.pairs().size());
        } finally {
            if (pool != null) {
                pool.shutdown();
            }
        }
    }
}
