package org.accordia.io;

import java.nio.ByteBuffer;

/**
 * The sample types a mask or image file may store, with their size in bytes, and bulk decoders
 * from a byte buffer (whose byte order the caller has set) into wide Java arrays.
 */
public enum SampleType {
    INT8(1, true, false),
    UINT8(1, false, false),
    INT16(2, true, false),
    UINT16(2, false, false),
    INT32(4, true, false),
    UINT32(4, false, false),
    INT64(8, true, false),
    UINT64(8, false, false),
    FLOAT32(4, true, true),
    FLOAT64(8, true, true);

    private final int bytes;
    private final boolean signed;
    private final boolean floating;

    SampleType(int bytes, boolean signed, boolean floating) {
        this.bytes = bytes;
        this.signed = signed;
        this.floating = floating;
    }

    /** Size of one sample in bytes. */
    public int bytes() {
        return bytes;
    }

    public boolean isSigned() {
        return signed;
    }

    public boolean isFloating() {
        return floating;
    }

    /**
     * Decodes {@code n} integer samples starting at the buffer's position into {@code dst}. For
     * {@link #UINT64} a value above {@link Long#MAX_VALUE} comes out negative (two's complement);
     * callers treat it as out of range. Not for floating types.
     */
    void decodeLongs(ByteBuffer src, long[] dst, int n) {
        int p = src.position();
        switch (this) {
            case INT8 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.get(p + i);
                }
            }
            case UINT8 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.get(p + i) & 0xFF;
                }
            }
            case INT16 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.getShort(p + 2 * i);
                }
            }
            case UINT16 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.getShort(p + 2 * i) & 0xFFFF;
                }
            }
            case INT32 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.getInt(p + 4 * i);
                }
            }
            case UINT32 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.getInt(p + 4 * i) & 0xFFFFFFFFL;
                }
            }
            case INT64, UINT64 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.getLong(p + 8 * i);
                }
            }
            default -> throw new IllegalStateException("not an integer type: " + this);
        }
    }

    /** Decodes {@code n} samples starting at the buffer's position into doubles (exact for all but 64-bit integers beyond 2^53). */
    void decodeDoubles(ByteBuffer src, double[] dst, int n) {
        int p = src.position();
        switch (this) {
            case FLOAT32 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.getFloat(p + 4 * i);
                }
            }
            case FLOAT64 -> {
                for (int i = 0; i < n; i++) {
                    dst[i] = src.getDouble(p + 8 * i);
                }
            }
            case UINT64 -> {
                for (int i = 0; i < n; i++) {
                    long v = src.getLong(p + 8 * i);
                    dst[i] = v >= 0 ? (double) v : (double) (v >>> 1) * 2.0 + (v & 1);
                }
            }
            default -> {
                long[] tmp = new long[n];
                decodeLongs(src, tmp, n);
                for (int i = 0; i < n; i++) {
                    dst[i] = tmp[i];
                }
            }
        }
    }
}
