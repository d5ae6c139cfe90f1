package org.accordia.io;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.HashSet;
import java.util.Set;

/**
 * Walks the chain of image file directories (IFDs) of a classic TIFF file before ImageJ does,
 * so that a chain ImageJ would follow forever is refused first.
 *
 * <p>A TIFF file (TIFF 6.0, Adobe 1992, section 2) starts with a byte-order mark ({@code II} or
 * {@code MM}), the number 42 and the offset of the first IFD; each IFD holds a 2-byte entry count,
 * 12 bytes per entry and the 4-byte offset of the next IFD (0 ends the chain). ImageJ's
 * {@code TiffDecoder} follows the next-IFD offsets while they are positive and its IFD parser
 * accepts the directory (1 to 1000 entries); a next-IFD offset that points back at an IFD already
 * visited makes that loop endless. This walk follows the chain the same way, with a bound:
 * it refuses a chain that revisits an offset (a loop), and a chain longer than the file could
 * hold (each IFD is at least 18 bytes) or than {@code maxDirectories}. It also refuses an entry
 * declaring more values than the file holds, which ImageJ would allocate before reading.
 */
final class TiffDirectories {
    /** Entries ImageJ's IFD parser accepts in one directory. */
    private static final int MAX_ENTRIES = 1000;
    /** Smallest directory: the entry count, one entry and the next offset. */
    private static final int MIN_IFD_BYTES = 2 + 12 + 4;

    private TiffDirectories() {
    }

    /**
     * Follows the IFD chain of {@code file} and returns the number of directories ImageJ would
     * accept (0 when the header is not a TIFF header or the first directory is not acceptable:
     * ImageJ then reports the file as unreadable).
     *
     * @throws InputException the chain loops, or is longer than {@code maxDirectories}, or the
     *     file cannot be read
     */
    static long count(Path file, long maxDirectories) throws InputException {
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.READ)) {
            long size = ch.size();
            ByteBuffer head = read(ch, 0, 8);
            if (head.remaining() < 8) {
                return 0;
            }
            short bom = head.getShort(0);
            if (bom == 0x4949) {
                head.order(ByteOrder.LITTLE_ENDIAN);
            } else if (bom != 0x4D4D) {
                return 0;
            }
            long bound = Math.min(maxDirectories, size / MIN_IFD_BYTES + 1);
            Set<Long> seen = new HashSet<>();
            long offset = head.getInt(4) & 0xFFFFFFFFL;
            long n = 0;
            while (offset > 0) {
                if (!seen.add(offset)) {
                    throw new InputException(file, "TIFF image directory chain loops: directory " + (n + 1)
                        + " points back to offset " + offset);
                }
                ByteBuffer count = read(ch, offset, 2).order(head.order());
                int entries = count.remaining() < 2 ? 0 : count.getShort(0);
                if (entries < 1 || entries > MAX_ENTRIES) {
                    break; // ImageJ's parser rejects this directory and ends the chain here
                }
                n++;
                if (n > bound) {
                    throw new InputException(file, "TIFF declares more than " + bound + " image directories"
                        + (bound == maxDirectories ? " (the voxel limit)" : " (more than the file can hold)"));
                }
                if (offset + 2 + 12L * entries > size) {
                    // ImageJ would read the missing entries as -1 bytes and act on them (a fuzzing finding)
                    throw new InputException(file, "truncated TIFF: image directory " + n + " at offset " + offset
                        + " declares " + entries + " entries, the file ends before them");
                }
                checkEntries(file, read(ch, offset + 2, 12 * entries).order(head.order()), size, n);
                ByteBuffer next = read(ch, offset + 2 + 12L * entries, 4).order(head.order());
                // ImageJ reads past the end of the file as -1 bytes: an offset of 0xFFFFFFFF, beyond
                // the file, where the next directory is rejected. Stop there too.
                offset = next.remaining() < 4 ? 0 : next.getInt(0) & 0xFFFFFFFFL;
                if (offset >= size) {
                    offset = 0;
                }
            }
            return n;
        } catch (NoSuchFileException e) {
            throw new InputException(file, "file not found");
        } catch (IOException e) {
            throw new InputException(file, "cannot read: " + e.getMessage(), e);
        }
    }

    /**
     * Refuses a directory entry whose values could not fit in the file: ImageJ allocates an array
     * of the declared count before reading it (a count of 7 × 10^8 costs gigabytes), whereas every
     * value of a well-formed file is stored in the file (or inline in the entry).
     */
    private static void checkEntries(Path file, ByteBuffer entries, long size, long directory) throws InputException {
        for (int at = 0; at + 12 <= entries.limit(); at += 12) {
            int tag = entries.getShort(at) & 0xFFFF;
            int type = entries.getShort(at + 2) & 0xFFFF;
            long count = entries.getInt(at + 4) & 0xFFFFFFFFL;
            if (count * typeBytes(type) > size) {
                throw new InputException(file, "TIFF directory " + directory + ": tag " + tag + " declares " + count
                    + " values, more than the file's " + size + " bytes hold");
            }
        }
    }

    /** Bytes per value of a TIFF field type (TIFF 6.0 section 2; 16-18 from BigTIFF); 1 when unknown. */
    private static int typeBytes(int type) {
        return switch (type) {
            case 3, 8 -> 2;        // SHORT, SSHORT
            case 4, 9, 11, 13 -> 4; // LONG, SLONG, FLOAT, IFD
            case 5, 10, 12, 16, 17, 18 -> 8; // RATIONAL, SRATIONAL, DOUBLE, LONG8, SLONG8, IFD8
            default -> 1;          // BYTE, ASCII, SBYTE, UNDEFINED and unknown types
        };
    }

    /** Up to {@code n} bytes at {@code position} (fewer at the end of the file), flipped for reading. */
    private static ByteBuffer read(FileChannel ch, long position, int n) throws IOException {
        ByteBuffer b = ByteBuffer.allocate(n);
        long p = position;
        while (b.hasRemaining()) {
            int k = ch.read(b, p);
            if (k < 0) {
                break;
            }
            p += k;
        }
        b.flip();
        return b;
    }
}
