using FitSpec.Results;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// The content-addressed cache in the out folder: one entry per key, OUT/.fitspec-cache/KEY.json. Entries
/// are written atomically (several runs into one folder at once: the last writer wins and nobody reads a
/// half-written entry); an entry that cannot be read is a miss.
/// </summary>
public sealed class FitCache
{
    public const string FolderName = ".fitspec-cache";

    private readonly string outFolder;

    public FitCache(string outDir)
    {
        ArgumentNullException.ThrowIfNull(outDir);
        outFolder = Path.GetFullPath(outDir);
        Folder = Path.Combine(outFolder, FolderName);
    }

    public string Folder { get; }

    /// <summary>The entry for <paramref name="key"/> when every file it lists is still there with the same hash.</summary>
    public CacheEntry? Find(string key)
    {
        ArgumentNullException.ThrowIfNull(key);
        var path = EntryPath(key);
        string text;
        try
        {
            if (!File.Exists(path))
            {
                return null;
            }

            text = File.ReadAllText(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return null;
        }

        var entry = CacheEntry.Parse(text);
        if (entry is null || !string.Equals(entry.Key, key, StringComparison.Ordinal))
        {
            return null;
        }

        foreach (var output in entry.Outputs)
        {
            var full = FullPath(output.Path);
            if (!File.Exists(full) || !string.Equals(CacheKey.FileDigest(full), output.Sha256, StringComparison.Ordinal))
            {
                return null;
            }
        }

        return entry;
    }

    /// <summary>Records a fit's summary and the files it wrote (paths as the writer returned them).</summary>
    public CacheEntry Store(string key, FitSummary summary, IReadOnlyList<string> written)
    {
        ArgumentNullException.ThrowIfNull(written);
        var outputs = written.Select(p => new CachedOutput(RelativePath(p), CacheKey.FileDigest(p))).ToList();
        var entry = new CacheEntry(CacheEntry.CurrentFormat, key, summary, outputs);
        Directory.CreateDirectory(Folder);
        AtomicFile.Write(EntryPath(key), entry.ToJson());
        return entry;
    }

    /// <summary>
    /// Removes entries, other than <paramref name="current"/>, of fits named in <paramref name="names"/>:
    /// their files have since been rewritten, so they can never be hit again. Unreadable entries go too.
    /// </summary>
    public void Prune(IReadOnlySet<string> current, IReadOnlySet<string> names)
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(names);
        if (!Directory.Exists(Folder))
        {
            return;
        }

        foreach (var path in Directory.EnumerateFiles(Folder, "*.json").ToList())
        {
            var key = Path.GetFileNameWithoutExtension(path);
            if (current.Contains(key))
            {
                continue;
            }

            try
            {
                var entry = CacheEntry.Parse(File.ReadAllText(path));
                if (entry is null || names.Contains(entry.Summary.Name))
                {
                    File.Delete(path);
                }
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                // Another run may be replacing it; leaving a stale entry only costs a later miss.
            }
        }
    }

    /// <summary>A written file's path relative to the out folder, '/'-separated.</summary>
    public string RelativePath(string path) =>
        Path.GetRelativePath(outFolder, Path.GetFullPath(path)).Replace('\\', '/');

    private string FullPath(string relative) => Path.Combine(outFolder, relative.Replace('/', Path.DirectorySeparatorChar));

    private string EntryPath(string key) => Path.Combine(Folder, key + ".json");
}
