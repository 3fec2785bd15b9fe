package org.lanesift.runner.output;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.FileVisitResult;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.SimpleFileVisitor;
import java.nio.file.StandardCopyOption;
import java.nio.file.attribute.BasicFileAttributes;
import java.nio.file.attribute.FileAttribute;
import java.nio.file.attribute.PosixFilePermission;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.ArrayList;
import java.util.Collection;
import java.util.EnumSet;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import org.lanesift.plugin.OutputException;

/**
 * The output folder of one run ({@code --out}), written so that a run never touches its inputs and
 * never looks complete when it was not (docs/outputs.md, "How a run writes its folder"):
 * <ul>
 * <li>every file is first written into a fresh work folder {@code .lanesift-run-*} inside the
 * output folder, which starts with a {@code report.md} saying the run was interrupted;</li>
 * <li>at the end ({@link #publish}) the old {@code report.md} is removed first, each file is renamed
 * over its destination (a rename replaces a symbolic link planted there; it never writes through
 * it), the list of written files is kept in {@value #MANIFEST}, and the new report comes last;</li>
 * <li>a destination that is one of the run's inputs, also through a link, is refused before anything
 * moves;</li>
 * <li>files an earlier run wrote (its {@value #MANIFEST}) that this run did not write, and work
 * folders of interrupted runs, are listed as stale in the report and left in place: an earlier
 * output may be this run's input, and nothing is deleted that the run did not write.</li>
 * </ul>
 */
public final class OutputFolder {
    /** The list of files the last completed publish wrote, one name a line. */
    public static final String MANIFEST = ".lanesift-manifest";
    /** Prefix of the work folder a run writes into before publishing. */
    public static final String WORK_PREFIX = ".lanesift-run-";
    /** What {@code report.md} says while the run has not finished. */
    static final String INTERRUPTED_REPORT = "# Lanesift run report\n\n- status: interrupted: this run did not finish; "
            + "the files beside this report are partial and the run's folder was never published\n";

    private final Path dir;
    private final Path work;
    private final List<Path> inputs;

    private OutputFolder(Path dir, Path work, List<Path> inputs) {
        this.dir = dir;
        this.work = work;
        this.inputs = inputs;
    }

    /**
     * Creates the output folder if needed and a fresh work folder inside it.
     *
     * @param dir    the output folder ({@code --out})
     * @param inputs every file the run reads (chain file, captures, sidecars, tables)
     * @return the folder
     * @throws OutputException if {@code dir} is not a folder or cannot be created
     */
    public static OutputFolder open(Path dir, Collection<Path> inputs) {
        if (Files.exists(dir) && !Files.isDirectory(dir)) {
            throw new OutputException("--out " + dir + ": exists and is not a directory", null);
        }
        try {
            Files.createDirectories(dir);
            Path work = newWorkFolder(dir, System.nanoTime());
            Files.writeString(work.resolve(RunOutputs.REPORT), INTERRUPTED_REPORT, StandardCharsets.UTF_8);
            return new OutputFolder(dir, work, List.copyOf(inputs));
        } catch (IOException e) {
            throw new OutputException("--out " + dir + ": cannot create the directory: " + e.getMessage(), e);
        }
    }

    /**
     * A new work folder {@code .lanesift-run-<number>} in {@code dir}, readable by its owner only
     * where the file system has POSIX permissions, as {@link Files#createTempDirectory} makes it,
     * but named from the clock instead of a {@code SecureRandom}, whose first use costs every run
     * about 10 ms of provider set-up (DEVELOPERS.md, "Cold start"). The name need not be hard to
     * guess: the folder is created atomically, never through an existing file or link, and a name
     * taken (by a run started at the same moment) is passed over for the next one.
     *
     * @param dir  the output folder
     * @param seed the number tried first
     * @return the folder created
     * @throws IOException if it cannot be created, or the next 1000 names are taken
     */
    static Path newWorkFolder(Path dir, long seed) throws IOException {
        FileAttribute<?>[] ownerOnly = dir.getFileSystem().supportedFileAttributeViews().contains("posix")
                ? new FileAttribute<?>[] {PosixFilePermissions.asFileAttribute(EnumSet.of(
                        PosixFilePermission.OWNER_READ, PosixFilePermission.OWNER_WRITE, PosixFilePermission.OWNER_EXECUTE))}
                : new FileAttribute<?>[0];
        for (int i = 0; ; i++) {
            try {
                return Files.createDirectory(dir.resolve(WORK_PREFIX + Long.toUnsignedString(seed + i)), ownerOnly);
            } catch (FileAlreadyExistsException e) {
                if (i == 999) {
                    throw e;
                }
            }
        }
    }

    /**
     * Refuses a file name the run will write when the file already there is one of its inputs.
     *
     * @param names names relative to the output folder
     * @throws OutputException naming the first such file and the input it is
     */
    public void refuseInputs(Collection<String> names) {
        for (String name : names) {
            Path dest = dir.resolve(name);
            if (!Files.exists(dest, LinkOption.NOFOLLOW_LINKS)) {
                continue;
            }
            for (Path in : inputs) {
                if (same(dest, in)) {
                    throw new OutputException("--out " + dir + ": output " + name + " would replace the input " + in
                            + (Files.isSymbolicLink(dest) ? " (through a link)" : "")
                            + "; choose another --out folder or move the input", null);
                }
            }
        }
    }

    private static boolean same(Path a, Path b) {
        try {
            return Files.exists(b) && Files.exists(a) && Files.isSameFile(a, b);
        } catch (IOException e) {
            return false;
        }
    }

    /**
     * The folder the run writes into until {@link #publish}.
     *
     * @return the work folder
     */
    public Path work() {
        return work;
    }

    /**
     * The output folder.
     *
     * @return {@code --out}
     */
    public Path dir() {
        return dir;
    }

    /**
     * Files in the output folder left by an earlier run that this run does not write: names from the
     * earlier {@value #MANIFEST} that still exist, and the work folders of runs that never finished.
     *
     * @param written the names this run writes
     * @return sorted names, relative to the output folder
     */
    public List<String> stale(Collection<String> written) {
        Set<String> out = new TreeSet<>();
        Path m = dir.resolve(MANIFEST);
        if (Files.isRegularFile(m, LinkOption.NOFOLLOW_LINKS)) {
            try {
                for (String n : Files.readAllLines(m, StandardCharsets.UTF_8)) {
                    if (!n.isBlank() && !written.contains(n) && safeName(n) && Files.exists(dir.resolve(n), LinkOption.NOFOLLOW_LINKS)) {
                        out.add(n);
                    }
                }
            } catch (IOException | java.io.UncheckedIOException e) {
                // an unreadable manifest lists nothing; it is rewritten by this run
            }
        }
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(dir, WORK_PREFIX + "*")) {
            for (Path p : ds) {
                if (!p.equals(work)) {
                    out.add(p.getFileName().toString() + "/");
                }
            }
        } catch (IOException e) {
            // nothing listed
        }
        return new ArrayList<>(out);
    }

    private static boolean safeName(String n) {
        return !n.contains("/") && !n.contains("\\") && !n.equals("..") && !n.equals(".");
    }

    /**
     * Moves every written file from the work folder into the output folder, the report last, and
     * removes the work folder.
     *
     * @param names the names written (the report among them), relative to the work folder
     * @throws OutputException if a destination is an input or a file cannot be moved
     */
    public void publish(Collection<String> names) {
        refuseInputs(names);
        Set<String> ordered = new LinkedHashSet<>(names);
        boolean report = ordered.remove(RunOutputs.REPORT);
        try {
            Files.deleteIfExists(dir.resolve(RunOutputs.REPORT));
            for (String n : ordered) {
                move(n);
            }
            Path manifest = work.resolve(MANIFEST);
            Set<String> all = new LinkedHashSet<>(ordered);
            if (report) {
                all.add(RunOutputs.REPORT);
            }
            Files.write(manifest, all, StandardCharsets.UTF_8);
            move(MANIFEST);
            if (report) {
                move(RunOutputs.REPORT);
            }
            removeWork();
        } catch (IOException e) {
            throw new OutputException("cannot move the outputs into " + dir + " (" + e.getMessage()
                    + "); what was not moved is in " + work, e);
        }
    }

    private void move(String name) throws IOException {
        Path from = work.resolve(name);
        if (!Files.exists(from, LinkOption.NOFOLLOW_LINKS)) {
            return;
        }
        Files.move(from, dir.resolve(name), StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
    }

    /**
     * Removes the work folder and what is left in it (used when the run is refused or published).
     *
     * @throws IOException if it cannot be removed
     */
    public void removeWork() throws IOException {
        if (!Files.exists(work, LinkOption.NOFOLLOW_LINKS)) {
            return;
        }
        Files.walkFileTree(work, new SimpleFileVisitor<>() {
            @Override
            public FileVisitResult visitFile(Path file, BasicFileAttributes attrs) throws IOException {
                Files.delete(file);
                return FileVisitResult.CONTINUE;
            }

            @Override
            public FileVisitResult postVisitDirectory(Path d, IOException exc) throws IOException {
                Files.delete(d);
                return FileVisitResult.CONTINUE;
            }
        });
    }
}
