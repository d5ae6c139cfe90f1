package org.accordia.hostile;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.zip.Deflater;
import java.util.zip.GZIPOutputStream;
import org.accordia.io.TestFiles;

/**
 * Writes the committed corpus of bad inputs, {@code src/test/resources/hostile/<kind>/}: each
 * kind is a small study (folder layout {@code <centre>/<reader>/<case>.<ext>} or a manifest)
 * holding exactly one hostile thing, plus {@code protocol.yaml} when the protocol is the hostile
 * thing. Deterministic; regenerate after {@code mvn -o -q test-compile} with
 * {@code java -cp target/test-classes:target/classes org.accordia.hostile.HostileCorpus
 * src/test/resources/hostile}. Kinds that cannot be committed (symbolic links, names that are
 * not UTF-8) are built by {@link HostileCorpusTest} itself.
 *
 * <p>NIfTI-1 header offsets from {@code nifti1.h}; NIfTI-2 from {@code nifti2.h} (NIfTI Data
 * Format Working Group).
 */
public final class HostileCorpus {
    private HostileCorpus() {
    }

    /** NIfTI-1 datatype codes (nifti1.h). */
    static final short DT_UINT8 = 2;
    static final short DT_INT16 = 4;
    static final short DT_FLOAT32 = 16;
    static final short DT_RGB24 = 128;
    static final short DT_INT32 = 8;

    /** The valid 4x4x2 mask of every study: two voxels of label 1. */
    static byte[] goodVoxels() {
        byte[] v = new byte[32];
        v[5] = 1;
        v[6] = 1;
        return v;
    }

    /**
     * A little-endian NIfTI-1 header (348 bytes plus the 4-byte extension flag) for the given
     * dims (dim[0] = dims.length), datatype and bitpix; 1 mm voxels, vox_offset 352, mm units.
     */
    static ByteBuffer nifti1Header(ByteOrder order, short datatype, int bitpix, int... dims) {
        ByteBuffer h = ByteBuffer.allocate(352).order(order);
        h.putInt(0, 348);
        h.putShort(40, (short) dims.length);
        for (int i = 0; i < dims.length; i++) {
            h.putShort(42 + 2 * i, (short) dims[i]);
        }
        h.putShort(70, datatype);
        h.putShort(72, (short) bitpix);
        for (int i = 0; i < 8; i++) {
            h.putFloat(76 + 4 * i, 1.0f);
        }
        h.putFloat(108, 352f);
        h.putFloat(112, 1.0f);
        h.put(123, (byte) 2); // NIFTI_UNITS_MM
        h.put(344, (byte) 'n').put(345, (byte) '+').put(346, (byte) '1').put(347, (byte) 0);
        return h;
    }

    static byte[] nifti1(short datatype, int bitpix, byte[] data, int... dims) {
        return concat(nifti1Header(ByteOrder.LITTLE_ENDIAN, datatype, bitpix, dims).array(), data);
    }

    static byte[] goodNifti() {
        return nifti1(DT_UINT8, 8, goodVoxels(), 4, 4, 2);
    }

    /** A little-endian NIfTI-2 header (540 bytes plus 4) with the given dims, uint8. */
    static ByteBuffer nifti2Header(long... dims) {
        ByteBuffer h = ByteBuffer.allocate(544).order(ByteOrder.LITTLE_ENDIAN);
        h.putInt(0, 540);
        h.put(4, new byte[] {'n', '+', '2', 0, '\r', '\n', 0x1a, '\n'});
        h.putShort(12, DT_UINT8);
        h.putShort(14, (short) 8);
        h.putLong(16, dims.length);
        for (int i = 0; i < dims.length; i++) {
            h.putLong(24 + 8 * i, dims[i]);
        }
        for (int i = 0; i < 8; i++) {
            h.putDouble(104 + 8 * i, 1.0);
        }
        h.putLong(168, 544);
        h.putDouble(176, 1.0);
        return h;
    }



    /** Writes the whole corpus under {@code out}. */
    public static void write(Path out) throws IOException {
        Corpus c = new Corpus(out);
        byte[] good = goodNifti();

        // ---- NIfTI masks: reader r1 is good, reader r2's mask is the hostile file.
        c.pair("nifti-truncated-header", "case1.nii", Arrays.copyOf(good, 200));
        c.pair("nifti-truncated-data", "case1.nii", Arrays.copyOf(good, 352 + 10));
        byte[] magic = good.clone();
        magic[344] = 'x';
        magic[345] = 'y';
        magic[346] = 'z';
        c.pair("nifti-bad-magic", "case1.nii", magic);
        byte[] sizeof = good.clone();
        ByteBuffer.wrap(sizeof).order(ByteOrder.LITTLE_ENDIAN).putInt(0, 349);
        c.pair("nifti-sizeof-hdr-wrong", "case1.nii", sizeof);
        c.pair("nifti-negative-dimension", "case1.nii", nifti1(DT_UINT8, 8, goodVoxels(), 4, -4, 2));
        c.pair("nifti-zero-dimension", "case1.nii", nifti1(DT_UINT8, 8, new byte[0], 4, 4, 0));
        long big = 1L << 40;
        c.pair("nifti-dimension-overflow", "case1.nii", concat(nifti2Header(big, big, big).array(), new byte[64]));
        // 10^12 voxels declared, 1 KB on disk.
        c.pair("nifti-trillion-voxels", "case1.nii", concat(nifti2Header(10_000, 10_000, 10_000).array(), new byte[1024 - 544]));
        byte[] offset = good.clone();
        ByteBuffer.wrap(offset).order(ByteOrder.LITTLE_ENDIAN).putFloat(108, 100_000f);
        c.pair("nifti-vox-offset-beyond-file", "case1.nii", offset);
        byte[] gz = gzip(good);
        for (int i = 20; i < gz.length - 12; i += 3) {
            gz[i] = (byte) 0xFF; // damage the deflate blocks, keep the gzip header and trailer
        }
        c.pair("nifti-corrupt-gzip", "case1.nii.gz", gz);
        // gzip bomb: declares 32 voxels, the stream inflates to 256 MiB (about 250 KB on disk).
        c.pair("nifti-gzip-bomb", "case1.nii.gz", bomb(good, 256 << 20));
        c.pair("nifti-unsupported-datatype", "case1.nii", nifti1(DT_RGB24, 24, new byte[96], 4, 4, 2));
        float[] half = new float[32];
        half[3] = 0.5f;
        c.pair("nifti-non-integral-float-labels", "case1.nii",
            nifti1(DT_FLOAT32, 32, floats(ByteOrder.LITTLE_ENDIAN, half), 4, 4, 2));
        float[] nan = new float[32];
        nan[7] = Float.NaN;
        c.pair("nifti-nan-in-float-mask", "case1.nii",
            nifti1(DT_FLOAT32, 32, floats(ByteOrder.LITTLE_ENDIAN, nan), 4, 4, 2));
        // Big-endian header whose sizeof_hdr was written little-endian: the byte order flag lies.
        ByteBuffer be = nifti1Header(ByteOrder.BIG_ENDIAN, DT_UINT8, 8, 4, 4, 2);
        be.order(ByteOrder.LITTLE_ENDIAN).putInt(0, 348);
        c.pair("nifti-big-endian-wrong-flag", "case1.nii", concat(be.array(), goodVoxels()));
        c.pair("nifti-4d-series", "case1.nii", nifti1(DT_UINT8, 8, new byte[96], 4, 4, 2, 3));
        byte[] neg = new byte[64];
        ByteBuffer.wrap(neg).order(ByteOrder.LITTLE_ENDIAN).putShort(10, (short) -1);
        c.pair("nifti-negative-label", "case1.nii", nifti1(DT_INT16, 16, neg, 4, 4, 2));
        byte[] pair = good.clone();
        pair[345] = 'i';
        c.pair("nifti-detached-pair", "case1.nii", pair);

        // ---- NRRD and MetaImage masks.
        c.pair("nrrd-missing-sizes", "case1.nrrd", concat(ascii("NRRD0004\ntype: uchar\ndimension: 3\nencoding: raw\n\n"),
            goodVoxels()));
        c.pair("nrrd-detached-data-missing", "case1.nhdr",
            ascii("NRRD0004\ntype: uchar\ndimension: 3\nsizes: 4 4 2\nencoding: raw\ndata file: case1.raw\n"));
        c.pair("nrrd-unsupported-encoding", "case1.nrrd", concat(ascii(
            "NRRD0004\ntype: uchar\ndimension: 3\nsizes: 4 4 2\nencoding: bzip2\n\n"), goodVoxels()));
        c.pair("nrrd-data-file-escape", "case1.nhdr",
            ascii("NRRD0004\ntype: uchar\ndimension: 3\nsizes: 4 4 2\nencoding: raw\ndata file: ../../case1.raw\n"));
        c.file("nrrd-data-file-escape", "study/case1.raw", goodVoxels());
        float[] ones = new float[32];
        ones[5] = 1;
        c.pair("nrrd-big-endian-wrong-flag", "case1.nrrd", concat(ascii(
            "NRRD0004\ntype: float\ndimension: 3\nsizes: 4 4 2\nendian: little\nencoding: raw\n\n"),
            floats(ByteOrder.BIG_ENDIAN, ones)));
        c.pair("metaimage-missing-raw", "case1.mhd", ascii(
            "ObjectType = Image\nNDims = 3\nDimSize = 4 4 2\nElementType = MET_UCHAR\nElementDataFile = case1.raw\n"));
        c.pair("metaimage-compressed-size-beyond-file", "case1.mha", concat(ascii(
            "ObjectType = Image\nNDims = 3\nDimSize = 4 4 2\nElementType = MET_UCHAR\nCompressedData = True\n"
                + "CompressedDataSize = 99999\nElementDataFile = LOCAL\n"), gzip(goodVoxels())));

        // ---- TIFF and PNG (read through ImageJ): a directory declaring no height; a PNG cut after its header.
        c.pair("tiff-zero-dimension", "case1.tif", new byte[] {'I', 'I', 42, 0, 8, 0, 0, 0, 5, 0, 0, 1, 3, 0, 1, 0, 0, 0, 4, 0,
            -1, -1, -1, -1, -1, -1, -1, -1});
        c.pair("png-truncated", "case1.png", concat(new byte[] {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1a, '\n',
            0, 0, 0, 13, 'I', 'H', 'D', 'R', 0, 0, 0, 4, 0, 0, 0, 4, 8, 0, 0, 0, 0}));

        // TIFF directories that ImageJ's decoder would follow for ever, allocate gigabytes for, or
        // read pixels from beyond the end of the file (the last two were fuzzing findings).
        Path tiffSeeds = Path.of("src/test/resources/org/accordia/io/TiffFuzzTestInputs/read");
        c.pair("tiff-directory-loop", "case1.tif", Files.readAllBytes(tiffSeeds.resolve("hand-directory-loop")));
        c.pair("tiff-value-count-beyond-file", "case1.tif",
            Files.readAllBytes(tiffSeeds.resolve("crash-2994e416880e3c3e57121e832622af56b9af3d22")));
        c.pair("tiff-pixels-beyond-file", "case1.tif",
            Files.readAllBytes(tiffSeeds.resolve("crash-848d3faec08f82758b7c53c6be4f2e1122dbd578")));

        // ---- Labels beyond the supported range (valid int32 masks).
        c.pair("label-above-65535", "case1.nii", nifti1(DT_INT32, 32, ints(70_000), 4, 4, 2));
        c.pair("label-int-max", "case1.nii", nifti1(DT_INT32, 32, ints(Integer.MAX_VALUE), 4, 4, 2));

        // ---- Study level.
        c.pair("mismatched-geometry", "case1.nii", nifti1(DT_UINT8, 8, new byte[48], 4, 4, 3));
        c.file("reader-under-two-centres", "study/c1/r1/case1.nii", good);
        c.file("reader-under-two-centres", "study/c1/r2/case1.nii", good);
        c.file("reader-under-two-centres", "study/c2/r1/case1.nii", good);
        c.file("one-reader", "study/c1/r1/case1.nii", good);
        c.file("one-reader", "study/c1/r1/case2.nii", good);
        c.file("empty-study", "study/.gitkeep", new byte[0]);
        c.file("max-voxels-exceeded", "study/c1/r1/case1.nii", good);
        c.file("max-voxels-exceeded", "study/c1/r2/case1.nii", good);
        c.file("max-voxels-exceeded", "protocol.yaml", ascii("max_voxels: 16\n"));

        // ---- Manifests (the study root holds manifest.csv and two good masks).
        c.manifest("manifest-too-few-columns", "case,centre,reader,path\ncase1,c1,r1,a.nii\ncase1,c1,b.nii\n");
        c.manifest("manifest-path-escape", "case,centre,reader,path\ncase1,c1,r1,a.nii\ncase1,c1,r2,../../b.nii\n");
        c.manifest("manifest-duplicate-row", "case,centre,reader,path\ncase1,c1,r1,a.nii\ncase1,c1,r1,b.nii\n");
        c.manifest("manifest-unknown-column", "case,centre,reader,path,colour\ncase1,c1,r1,a.nii,red\n");
        c.manifest("manifest-bad-quoting", "case,centre,reader,path\ncase1,c1,r1,a.nii\ncase1,c1,\"r2,b.nii\n");
        c.manifest("manifest-unknown-extension", "case,centre,reader,path\ncase1,c1,r1,a.nii\ncase1,c1,r2,b.txt\n");
        c.file("manifest-unknown-extension", "study/b.txt", ascii("not a mask\n"));
        c.manifest("manifest-reader-under-two-centres", "case,centre,reader,path\ncase1,c1,r1,a.nii\ncase2,c2,r1,b.nii\n");
        c.manifest("manifest-long-file-name",
            "case,centre,reader,path\ncase1,c1,r1,a.nii\ncase1,c1,r2," + "n".repeat(300) + ".nii\n");
        c.manifest("manifest-not-utf8", "case,centre,reader,path\ncase1,c1,r1,a.nii\n");
        c.file("manifest-not-utf8", "study/manifest.csv",
            concat(ascii("case,centre,reader,path\ncase1,c1,r1,a.nii\ncase1,c1,"), new byte[] {(byte) 0xE9}, ascii("r2,b.nii\n")));

        // ---- Protocols (the study itself is good).
        c.goodStudy("protocol-unknown-key");
        c.file("protocol-unknown-key", "protocol.yaml", ascii("study: x\nshift:\n  alpha: 0.05\n  alpah: 0.01\n"));
        c.goodStudy("protocol-wrong-type");
        c.file("protocol-wrong-type", "protocol.yaml", ascii("geometry_tolerance_mm: [1, 2]\n"));
        c.goodStudy("protocol-alias-bomb");
        StringBuilder y = new StringBuilder("a0: &a0 [x, x, x, x, x, x, x, x, x]\n");
        for (int i = 1; i < 12; i++) {
            y.append("a").append(i).append(": &a").append(i).append(" [");
            for (int k = 0; k < 9; k++) {
                y.append(k > 0 ? ", " : "").append("*a").append(i - 1);
            }
            y.append("]\n");
        }
        c.file("protocol-alias-bomb", "protocol.yaml", ascii(y.toString()));
        c.goodStudy("protocol-huge-resamples");
        c.file("protocol-huge-resamples", "protocol.yaml", ascii("consensus:\n  bootstrap_resamples: 2000000000\n"));
        c.goodStudy("protocol-label-above-65535");
        c.file("protocol-label-above-65535", "protocol.yaml", ascii("structures:\n  - name: big\n    labels: [70000]\n"));
        c.goodStudy("protocol-max-voxels-out-of-range");
        c.file("protocol-max-voxels-out-of-range", "protocol.yaml", ascii("max_voxels: 99999999999\n"));

        // ---- The study's own protocol.yaml (read by inspect and analyze alike when --protocol is not given).
        c.goodStudy("study-protocol-bad");
        c.file("study-protocol-bad", "study/protocol.yaml", ascii("shift:\n  alpah: 0.01\n"));
        c.goodStudy("study-protocol-folder");
        c.file("study-protocol-folder", "study/protocol.yaml/.gitkeep", new byte[0]);

        // ---- Readable studies with nothing to analyse.
        byte[] empty = nifti1(DT_UINT8, 8, new byte[32], 4, 4, 2);
        c.file("every-mask-empty", "study/c1/r1/case1.nii", empty);
        c.file("every-mask-empty", "study/c1/r2/case1.nii", empty);
        c.file("every-mask-empty-named-structures", "study/c1/r1/case1.nii", empty);
        c.file("every-mask-empty-named-structures", "study/c1/r2/case1.nii", empty);
        c.file("every-mask-empty-named-structures", "study/protocol.yaml",
            ascii("structures:\n  - name: lesion\n    labels: [1]\n"));
    }

    /** A NIfTI gzip whose stream holds {@code header + data} followed by zeros up to {@code total} bytes. */
    /** The good study's 32 voxels as little-endian int32, with {@code label} where the good mask has 1. */
    static byte[] ints(int label) {
        ByteBuffer b = ByteBuffer.allocate(32 * 4).order(ByteOrder.LITTLE_ENDIAN);
        byte[] v = goodVoxels();
        for (int i = 0; i < v.length; i++) {
            b.putInt(v[i] == 0 ? 0 : label);
        }
        return b.array();
    }

    static byte[] floats(ByteOrder order, float... v) {
        return TestFiles.floats(order, v);
    }

    static byte[] concat(byte[]... parts) {
        return TestFiles.concat(parts);
    }

    static byte[] gzip(byte[] data) throws IOException {
        return TestFiles.gzip(data);
    }

    static byte[] ascii(String s) {
        return TestFiles.ascii(s);
    }

    static byte[] bomb(byte[] niftiFile, int total) throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        try (OutputStream gz = new GZIPOutputStream(out, 1 << 16) {
            {
                def.setLevel(Deflater.BEST_COMPRESSION);
            }
        }) {
            gz.write(niftiFile);
            byte[] zeros = new byte[1 << 20];
            for (long done = niftiFile.length; done < total; done += zeros.length) {
                gz.write(zeros, 0, (int) Math.min(zeros.length, total - done));
            }
        }
        return out.toByteArray();
    }

    /** Writes files of the corpus. */
    private static final class Corpus {
        private final Path out;

        Corpus(Path out) {
            this.out = out;
        }

        void file(String kind, String relative, byte[] content) throws IOException {
            Path p = out.resolve(kind).resolve(relative);
            Files.createDirectories(p.getParent());
            Files.write(p, content);
        }

        /** Layout study: c1/r1/case1.nii good, c1/r2/{name} hostile. */
        void pair(String kind, String name, byte[] hostile) throws IOException {
            file(kind, "study/c1/r1/case1.nii", goodNifti());
            file(kind, "study/c1/r2/" + name, hostile);
        }

        void goodStudy(String kind) throws IOException {
            file(kind, "study/c1/r1/case1.nii", goodNifti());
            file(kind, "study/c1/r2/case1.nii", goodNifti());
        }

        /** Manifest study: a.nii and b.nii good, manifest.csv as given. */
        void manifest(String kind, String csv) throws IOException {
            file(kind, "study/a.nii", goodNifti());
            file(kind, "study/b.nii", goodNifti());
            file(kind, "study/manifest.csv", csv.getBytes(StandardCharsets.UTF_8));
        }
    }

    public static void main(String[] args) throws IOException {
        write(Path.of(args.length > 0 ? args[0] : "src/test/resources/hostile"));
    }
}
