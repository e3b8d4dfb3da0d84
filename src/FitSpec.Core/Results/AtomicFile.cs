namespace FitSpec.Results;

/// <summary>
/// Writes a file so that it is either as it was or complete: a temp file in the same folder, then rename. A
/// process that dies (crash, kill, Ctrl-C) leaves no half-written file. The data is not forced to disk per file
/// (an fsync costs milliseconds, two thirds of a small fit's time in a batch, measured); the rename-replace is
/// ordered after the data by the usual Linux file systems (ext4's auto_da_alloc, xfs, btrfs), so a power cut
/// loses at most the newest files, each old or new, not torn.
/// </summary>
public static class AtomicFile
{
    public static void Write(string path, string contents)
    {
        ArgumentNullException.ThrowIfNull(path);
        var folder = Path.GetDirectoryName(Path.GetFullPath(path))!;
        var temp = Path.Combine(folder, $".{Path.GetFileName(path)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
        try
        {
            using (var stream = new FileStream(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None))
            using (var writer = new StreamWriter(stream, new System.Text.UTF8Encoding(false)))
            {
                writer.Write(contents);
                writer.Flush();
            }

            File.Move(temp, path, overwrite: true);
        }
        finally
        {
            if (File.Exists(temp))
            {
                File.Delete(temp);
            }
        }
    }
}
