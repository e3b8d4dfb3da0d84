using FitSpec.Results;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// Removes the temp files that killed runs left in an out folder and its cache folder. A temp is named
/// ".NAME.PID.32hex.tmp" by the atomic writer; it is stale when process PID is gone, or when it is over a day
/// old (a PID reused since, or a process in another PID namespace). Temps of live writers are left alone.
/// </summary>
public static class StaleTemps
{
    /// <summary>A temp is taken as abandoned after this long whatever its PID says.</summary>
    public static readonly TimeSpan MaxAge = TimeSpan.FromHours(24);

    /// <summary>Deletes the stale temps; returns how many went. Nothing here stops a run.</summary>
    public static int Sweep(string outDir)
    {
        ArgumentNullException.ThrowIfNull(outDir);
        var removed = 0;
        foreach (var folder in new[] { outDir, Path.Combine(outDir, FitCache.FolderName) })
        {
            try
            {
                if (!Directory.Exists(folder))
                {
                    continue;
                }

                foreach (var file in Directory.EnumerateFiles(folder, ".*.tmp").ToList())
                {
                    if (IsStale(file) && TryDelete(file))
                    {
                        removed++;
                    }
                }
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                // An unreadable folder is the probe's to report; a stray temp only costs space.
            }
        }

        return removed;
    }

    private static bool IsStale(string file)
    {
        if (AtomicFile.TempWriter(Path.GetFileName(file)) is not { } pid)
        {
            return false;
        }

        if (DateTime.UtcNow - File.GetLastWriteTimeUtc(file) > MaxAge)
        {
            return true;
        }

        // Without /proc there is no cheap way to tell a live writer: only age counts.
        return pid != Environment.ProcessId && Directory.Exists("/proc/self") && !Directory.Exists($"/proc/{pid}");
    }

    private static bool TryDelete(string file)
    {
        try
        {
            File.Delete(file);
            return true;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return false;
        }
    }
}
