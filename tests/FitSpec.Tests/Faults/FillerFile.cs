namespace FitSpec.Tests.Faults;

/// <summary>Fills a (small, mounted) file system with one file, so that the next writes there fail with ENOSPC.</summary>
public static class FillerFile
{
    /// <summary>
    /// Writes <paramref name="path"/> until the file system is full, or until only about
    /// <paramref name="leaveFree"/> bytes are left when that is given.
    /// </summary>
    public static void Fill(string path, long leaveFree = 0)
    {
        var folder = Path.GetDirectoryName(Path.GetFullPath(path))!;
        var toWrite = leaveFree > 0 ? new DriveInfo(folder).AvailableFreeSpace - leaveFree : long.MaxValue;
        var chunk = new byte[4096];
        // Unbuffered, so that the write that fails is the one that hit the limit and closing writes nothing.
        using var stream = new FileStream(path, FileMode.CreateNew, FileAccess.Write, FileShare.None, bufferSize: 0);
        try
        {
            for (long written = 0; written < toWrite; written += chunk.Length)
            {
                stream.Write(chunk, 0, (int)Math.Min(chunk.Length, toWrite - written));
            }
        }
        catch (IOException)
        {
            // Full: the last page may still take a few bytes, so fill it byte by byte.
            try
            {
                while (true)
                {
                    stream.WriteByte(0);
                }
            }
            catch (IOException)
            {
            }
        }
    }
}
