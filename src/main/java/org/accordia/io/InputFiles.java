package org.accordia.io;

import java.io.IOException;
import java.nio.file.FileSystemException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;

/**
 * The checks every input file passes before anything opens it: it must be a regular file
 * (following symbolic links), so that a named pipe (FIFO), a device, a socket, a folder, a
 * dangling link or a link loop is refused with one line instead of blocking a read or reading
 * something that never ends. The check reads the file's attributes only; it never opens the
 * file.
 */
public final class InputFiles {
    private InputFiles() {
    }

    /**
     * What is wrong with {@code file} as an input file, or {@code null} when it is a regular file.
     * Never opens the file.
     */
    public static String problem(Path file) {
        BasicFileAttributes a;
        try {
            // one system call for the usual cases (a regular file, a missing one); links are followed after
            a = Files.readAttributes(file, BasicFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
            if (a.isSymbolicLink()) {
                a = Files.readAttributes(file, BasicFileAttributes.class);
            }
        } catch (NoSuchFileException e) {
            return Files.isSymbolicLink(file) ? "dangling symbolic link (its target does not exist)" : "file not found";
        } catch (FileSystemException e) {
            if (Files.isSymbolicLink(file)) {
                return "symbolic link that cannot be resolved (a link loop?): " + reason(e);
            }
            return "cannot read: " + reason(e);
        } catch (IOException | SecurityException e) {
            return "cannot read: " + e.getMessage();
        }
        if (a.isRegularFile()) {
            return null;
        }
        if (a.isDirectory()) {
            return "a folder, not a file";
        }
        return "not a regular file (a named pipe, device or socket); refused without opening it";
    }

    /** Throws an {@link InputException} naming {@code file} unless it is a regular file. */
    public static void requireRegular(Path file) throws InputException {
        String p = problem(file);
        if (p != null) {
            throw new InputException(file, p);
        }
    }

    /**
     * Whether something exists at {@code file} without following a final symbolic link: a dangling
     * or looping link exists (and must then be refused by {@link #requireRegular}), a missing name
     * does not.
     */
    public static boolean present(Path file) {
        return Files.exists(file, LinkOption.NOFOLLOW_LINKS);
    }

    /**
     * The real path of {@code file} (symbolic links resolved), checked to lie inside {@code folder}
     * (also resolved) unless {@code allowOutside}; the file must be a regular file.
     *
     * @param referrer the file named in errors (for instance the header naming a data file)
     * @param what how the file is named in errors ("data file")
     */
    public static Path realInside(Path file, Path folder, boolean allowOutside, Path referrer, String what)
            throws InputException {
        String p = problem(file);
        if (p != null) {
            throw new InputException(referrer, p.equals("file not found") ? what + " not found: " + file : what + " " + file + ": " + p);
        }
        Path real;
        Path folderReal;
        try {
            real = file.toRealPath();
            folderReal = folder.toRealPath();
        } catch (IOException e) {
            throw new InputException(referrer, what + " " + file + ": cannot resolve: " + e.getMessage(), e);
        }
        if (!allowOutside && !real.startsWith(folderReal)) {
            throw new InputException(referrer, what + " " + file.getFileName() + " lies outside the header's folder through a"
                + " symbolic link (to " + real + "; refused unless path escape is allowed)");
        }
        return real;
    }

    private static String reason(FileSystemException e) {
        return e.getReason() != null ? e.getReason() : String.valueOf(e.getMessage());
    }
}
