package org.accordia.io;

/**
 * An intensity image (for example the case's scan, used only as a backdrop for overlay
 * pictures): one float per voxel on a {@link Geometry}, x fastest. Immutable by contract.
 */
public record ImageVolume(Geometry geometry, float[] data) {
    public ImageVolume {
        if (geometry.voxelCount() != data.length) {
            throw new IllegalArgumentException(
                "data has " + data.length + " voxels, geometry " + geometry.dimsText() + " needs " + geometry.voxelCount());
        }
    }

    public float value(int x, int y, int z) {
        return data[x + geometry.nx() * (y + geometry.ny() * z)];
    }
}
