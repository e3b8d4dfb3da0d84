using FitSpec.Results;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// Checks, before any fit is solved, that the out folder can be written: makes it, then makes and removes an
/// empty file in it. A folder that refuses (read-only, not ours, under a regular file) would otherwise be
/// found only once every fit had been solved. A full disk usually passes (an empty file takes no data block)
/// and is reported per fit.
/// </summary>
public static class OutFolderProbe
{
    /// <exception cref="OutFolderException">The folder cannot be written; the message is the one line to print.</exception>
    public static void Check(string outDir)
    {
        ArgumentNullException.ThrowIfNull(outDir);
        // Named as the atomic writer names temps, so a probe a killed run left is swept like them.
        var probe = AtomicFile.TempPath(Path.Combine(outDir, "fitspec-probe"));
        try
        {
            Directory.CreateDirectory(outDir);
            using (new FileStream(probe, FileMode.CreateNew, FileAccess.Write, FileShare.None))
            {
            }

            File.Delete(probe);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new OutFolderException($"{outDir}: error: cannot write the out folder: {WriteFailure.Reason(outDir, e)}; choose another --out", e);
        }
    }
}
