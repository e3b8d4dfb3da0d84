namespace FitSpec.Results;

/// <summary>
/// Writes a file so that it is either as it was or complete: a temp file in the same folder, then rename. A
/// process that dies (crash, kill, Ctrl-C) leaves no half-written file. The data is not forced to disk per file
/// (an fsync costs milliseconds, two thirds of a small fit's time in a batch, measured); the rename-replace is
/// ordered after the data by the usual Linux file systems (ext4's auto_da_alloc, xfs, btrfs), so a power cut
/// loses at most the newest files, each old or new, not torn.
/// A failure is thrown as a <see cref="FileWriteException"/> naming the final path, never the temp one.
/// </summary>
public static partial class AtomicFile
{
    public static void Write(string path, string contents) => WriteAll([(path, contents)]);

    /// <summary>
    /// Writes several files as one: every temp file first, and only when all are written does any get its final
    /// name. A failure while writing (a full disk, say) removes every temp and leaves all final files as they were.
    /// A rename that fails (rare once the data is down: a file made immutable) leaves those before it renamed.
    /// </summary>
    public static void WriteAll(IReadOnlyList<(string Path, string Contents)> files)
    {
        ArgumentNullException.ThrowIfNull(files);
        var temps = new List<(string Temp, string Path)>(files.Count);
        try
        {
            foreach (var (path, contents) in files)
            {
                ArgumentNullException.ThrowIfNull(path);
                var temp = TempPath(path);
                temps.Add((temp, path));
                WriteTemp(path, temp, contents);
            }

            foreach (var (temp, path) in temps)
            {
                Rename(temp, path);
            }
        }
        finally
        {
            foreach (var (temp, _) in temps)
            {
                DeleteQuietly(temp);
            }
        }
    }

    /// <summary>The temp name for <paramref name="path"/>: ".NAME.PID.32hex.tmp" beside it (the sweep of stale temps relies on it).</summary>
    public static string TempPath(string path)
    {
        var folder = Path.GetDirectoryName(Path.GetFullPath(path))!;
        return Path.Combine(folder, $".{Path.GetFileName(path)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
    }

    /// <summary>The writing process's id when <paramref name="fileName"/> is a temp name of <see cref="TempPath"/>'s form.</summary>
    public static int? TempWriter(string fileName)
    {
        ArgumentNullException.ThrowIfNull(fileName);
        var match = TempName().Match(fileName);
        return match.Success && int.TryParse(match.Groups["pid"].Value, System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture, out var pid) ? pid : null;
    }

    [System.Text.RegularExpressions.GeneratedRegex(@"^\.(?<final>.+)\.(?<pid>\d+)\.[0-9a-f]{32}\.tmp$", System.Text.RegularExpressions.RegexOptions.CultureInvariant)]
    private static partial System.Text.RegularExpressions.Regex TempName();

    private static void WriteTemp(string path, string temp, string contents)
    {
        try
        {
            using var stream = new FileStream(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None);
            using var writer = new StreamWriter(stream, new System.Text.UTF8Encoding(false));
            writer.Write(contents);
            writer.Flush();
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw WriteFailure.For(path, e);
        }
    }

    private static void Rename(string temp, string path)
    {
        try
        {
            File.Move(temp, path, overwrite: true);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw WriteFailure.For(path, e);
        }
    }

    private static void DeleteQuietly(string temp)
    {
        try
        {
            File.Delete(temp);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // Left for the sweep of stale temps at the next run's start.
        }
    }
}
