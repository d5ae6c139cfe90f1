package org.accordia.io;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.SingularValueDecomposition;

/**
 * The NIfTI qform parameterisation: a rotation stored as the quaternion (b, c, d) with
 * non-negative a, plus qfac = +/-1 flipping the third axis of a left-handed grid. Formulas as in
 * the NIfTI-1 header definition ({@code nifti1.h}, NIfTI Data Format Working Group, "method 2"),
 * following the reference library's {@code nifti_quatern_to_mat44} / {@code nifti_mat44_to_quatern}
 * (from memory), with the nearest proper rotation found by a polar decomposition (SVD).
 */
final class Quaternions {
    private Quaternions() {
    }

    /**
     * The 3x3 rotation of quaternion (b, c, d); a = sqrt(1 - b^2 - c^2 - d^2), or, when that is
     * below 1e-7, a = 0 and (b, c, d) normalised (as the reference library does).
     */
    static double[][] rotation(double b, double c, double d) {
        double a = 1.0 - (b * b + c * c + d * d);
        if (a < 1.0e-7) {
            double norm = Math.sqrt(b * b + c * c + d * d);
            if (norm > 0) {
                b /= norm;
                c /= norm;
                d /= norm;
            }
            a = 0.0;
        } else {
            a = Math.sqrt(a);
        }
        return new double[][] {
            {a * a + b * b - c * c - d * d, 2 * (b * c - a * d), 2 * (b * d + a * c)},
            {2 * (b * c + a * d), a * a + c * c - b * b - d * d, 2 * (c * d - a * b)},
            {2 * (b * d - a * c), 2 * (c * d + a * b), a * a + d * d - c * c - b * b}
        };
    }

    /**
     * The qform affine: rotation times diag(dx, dy, qfac * dz) plus the offset.
     */
    static double[][] qformAffine(double b, double c, double d, double qfac,
                                  double dx, double dy, double dz, double ox, double oy, double oz) {
        double[][] r = rotation(b, c, d);
        double[] s = {dx, dy, qfac < 0 ? -dz : dz};
        double[] o = {ox, oy, oz};
        double[][] m = new double[4][4];
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                m[i][j] = r[i][j] * s[j];
            }
            m[i][3] = o[i];
        }
        m[3][3] = 1;
        return m;
    }

    /**
     * Quaternion parameters {b, c, d, qfac} of the rotation nearest to the 3x3 part of the affine
     * once each column is divided by its length: a left-handed grid gives qfac = -1 and its third
     * column negated; a sheared matrix gives the nearest rotation (polar decomposition).
     */
    static double[] fromAffine(double[][] affine) {
        double[][] m = new double[3][3];
        for (int j = 0; j < 3; j++) {
            double len = Math.sqrt(affine[0][j] * affine[0][j] + affine[1][j] * affine[1][j] + affine[2][j] * affine[2][j]);
            for (int i = 0; i < 3; i++) {
                m[i][j] = len > 0 ? affine[i][j] / len : (i == j ? 1 : 0);
            }
        }
        SingularValueDecomposition svd = new SingularValueDecomposition(new Array2DRowRealMatrix(m, false));
        RealMatrix q = svd.getU().multiply(svd.getVT());
        double[][] r = q.getData();
        double det = r[0][0] * (r[1][1] * r[2][2] - r[1][2] * r[2][1])
            - r[0][1] * (r[1][0] * r[2][2] - r[1][2] * r[2][0])
            + r[0][2] * (r[1][0] * r[2][1] - r[1][1] * r[2][0]);
        double qfac = 1;
        if (det < 0) {
            qfac = -1;
            for (int i = 0; i < 3; i++) {
                r[i][2] = -r[i][2];
            }
        }
        double a = r[0][0] + r[1][1] + r[2][2] + 1;
        double b;
        double c;
        double d;
        if (a > 0.5) {
            a = 0.5 * Math.sqrt(a);
            b = 0.25 * (r[2][1] - r[1][2]) / a;
            c = 0.25 * (r[0][2] - r[2][0]) / a;
            d = 0.25 * (r[1][0] - r[0][1]) / a;
        } else {
            double xd = 1.0 + r[0][0] - (r[1][1] + r[2][2]);
            double yd = 1.0 + r[1][1] - (r[0][0] + r[2][2]);
            double zd = 1.0 + r[2][2] - (r[0][0] + r[1][1]);
            if (xd > 1.0) {
                b = 0.5 * Math.sqrt(xd);
                c = 0.25 * (r[0][1] + r[1][0]) / b;
                d = 0.25 * (r[0][2] + r[2][0]) / b;
                a = 0.25 * (r[2][1] - r[1][2]) / b;
            } else if (yd > 1.0) {
                c = 0.5 * Math.sqrt(yd);
                b = 0.25 * (r[0][1] + r[1][0]) / c;
                d = 0.25 * (r[1][2] + r[2][1]) / c;
                a = 0.25 * (r[0][2] - r[2][0]) / c;
            } else {
                d = 0.5 * Math.sqrt(zd);
                b = 0.25 * (r[0][2] + r[2][0]) / d;
                c = 0.25 * (r[1][2] + r[2][1]) / d;
                a = 0.25 * (r[1][0] - r[0][1]) / d;
            }
            if (a < 0) {
                b = -b;
                c = -c;
                d = -d;
            }
        }
        return new double[] {b, c, d, qfac};
    }
}
