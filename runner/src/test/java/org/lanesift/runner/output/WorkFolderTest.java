package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The work folder of a run ({@link OutputFolder#open}) is new, owner-only, and never a folder,
 * file or link that is already there: a name taken is passed over.
 */
class WorkFolderTest {
    @TempDir
    Path out;

    @Test
    void aTakenNameIsPassedOverAndNothingThereIsTouched() throws Exception {
        Path taken = Files.createDirectory(out.resolve(OutputFolder.WORK_PREFIX + "41"));
        Files.writeString(taken.resolve("keep.txt"), "earlier run");
        Path target = Files.createDirectory(out.resolve("elsewhere"));
        Files.createSymbolicLink(out.resolve(OutputFolder.WORK_PREFIX + "42"), target);

        Path work = OutputFolder.newWorkFolder(out, 41);

        assertEquals(out.resolve(OutputFolder.WORK_PREFIX + "43"), work);
        assertTrue(Files.isDirectory(work, LinkOption.NOFOLLOW_LINKS));
        assertEquals("rwx------", PosixFilePermissions.toString(Files.getPosixFilePermissions(work)));
        assertEquals("earlier run", Files.readString(taken.resolve("keep.txt")));
        assertEquals(List.of(), Files.list(target).toList());
    }

    @Test
    void numbersAreUnsignedAndTwoRunsGetTwoFolders() throws Exception {
        Path a = OutputFolder.newWorkFolder(out, -1);
        Path b = OutputFolder.newWorkFolder(out, -1);
        assertEquals(OutputFolder.WORK_PREFIX + "18446744073709551615", a.getFileName().toString());
        assertEquals(OutputFolder.WORK_PREFIX + "0", b.getFileName().toString());
        assertNotEquals(a, b);
    }

    @Test
    void aThousandTakenNamesAreAnError() throws Exception {
        for (int i = 0; i < 1000; i++) {
            Files.createDirectory(out.resolve(OutputFolder.WORK_PREFIX + (7 + i)));
        }
        assertThrows(FileAlreadyExistsException.class, () -> OutputFolder.newWorkFolder(out, 7));
    }

    @Test
    void openStartsTheWorkFolderWithTheInterruptedReport() throws Exception {
        OutputFolder f = OutputFolder.open(out.resolve("new"), List.of());
        assertTrue(f.work().getFileName().toString().matches("\\.lanesift-run-[0-9]+"), f.work().toString());
        assertEquals(OutputFolder.INTERRUPTED_REPORT, Files.readString(f.work().resolve(RunOutputs.REPORT)));
    }
}
