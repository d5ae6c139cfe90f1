package org.accordia.io;

import java.io.IOException;
import java.nio.file.Path;

/**
 * The volumes behind the committed Java-written NIfTI fixtures
 * ({@code src/test/resources/fixtures/nifti/java_*.nii.gz}), which {@code make_fixtures.py} reads
 * back with nibabel. Regenerate with:
 * <pre>
 * mvn -o -q test-compile
 * java -cp target/classes:target/test-classes:$(ls ~/.m2/repository/org/apache/commons/commons-math3/3.6.1/*.jar) \
 *     org.accordia.io.NiftiWriterFixtures src/test/resources/fixtures/nifti
 * </pre>
 */
final class NiftiWriterFixtures {
    private NiftiWriterFixtures() {
    }

    /** Oblique (30 degrees about z, 10 degrees about x), anisotropic, right-handed; uint8 labels. */
    static LabelVolume obliqueUint8() {
        double cz = Math.cos(Math.toRadians(30));
        double sz = Math.sin(Math.toRadians(30));
        double cx = Math.cos(Math.toRadians(10));
        double sx = Math.sin(Math.toRadians(10));
        // R = Rx(10) * Rz(30); columns scaled by spacing 0.8, 0.9, 2.5.
        double[][] rz = {{cz, -sz, 0}, {sz, cz, 0}, {0, 0, 1}};
        double[][] rx = {{1, 0, 0}, {0, cx, -sx}, {0, sx, cx}};
        double[] sp = {0.8, 0.9, 2.5};
        double[][] a = new double[4][4];
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                double v = 0;
                for (int k = 0; k < 3; k++) {
                    v += rx[i][k] * rz[k][j];
                }
                a[i][j] = v * sp[j];
            }
        }
        a[0][3] = -12.5;
        a[1][3] = 30.25;
        a[2][3] = -7;
        a[3][3] = 1;
        Geometry g = new Geometry(new int[] {7, 6, 5}, sp, a);
        byte[] labels = new byte[(int) g.voxelCount()];
        for (int i = 0; i < labels.length; i++) {
            labels[i] = (byte) ((i * 7 + i / 13) % 5);
        }
        return LabelVolume.ofBytes(g, labels);
    }

    /** Left-handed (x flipped) grid with labels above 255 (written as uint16). */
    static LabelVolume leftHandedUint16() {
        double[][] a = {
            {-1.5, 0, 0, 40},
            {0, 1.25, 0, -20},
            {0, 0, 3, 5},
            {0, 0, 0, 1}
        };
        Geometry g = new Geometry(new int[] {4, 3, 2}, new double[] {1.5, 1.25, 3}, a);
        int[] labels = new int[24];
        for (int i = 0; i < 24; i++) {
            labels[i] = i % 3 == 0 ? 0 : 250 + 1000 * i;
        }
        return LabelVolume.ofInts(g, labels);
    }

    /** A sheared affine (sform exact, qform only the nearest rotation) with float32 values. */
    static Geometry shearedGeometry() {
        double[][] a = {
            {1.0, 0.3, 0, -5},
            {0, 1.0, 0, 6},
            {0, 0, 2.0, 7},
            {0, 0, 0, 1}
        };
        return new Geometry(new int[] {3, 3, 2}, new double[] {1.0, Math.sqrt(1.09), 2.0}, a);
    }

    static float[] shearedValues() {
        float[] v = new float[18];
        for (int i = 0; i < v.length; i++) {
            v[i] = i * 0.125f - 1f;
        }
        return v;
    }

    public static void main(String[] args) throws IOException {
        Path dir = Path.of(args[0]);
        NiftiWriter.writeLabels(dir.resolve("java_oblique_uint8.nii.gz"), obliqueUint8());
        NiftiWriter.writeLabels(dir.resolve("java_lefthanded_uint16.nii.gz"), leftHandedUint16());
        NiftiWriter.writeProbability(dir.resolve("java_sheared_float32.nii.gz"), shearedGeometry(), shearedValues());
    }
}
