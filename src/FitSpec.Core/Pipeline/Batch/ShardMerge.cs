namespace FitSpec.Pipeline.Batch;

/// <summary>
/// What the shards of one sharded batch left: every fit of the batch in batch order (those of shards that
/// never reported are missing), the shards that did not report, and the settings the shards ran with.
/// </summary>
public sealed record MergedBatch(int Count, IReadOnlyList<FitRun> Runs, IReadOnlyList<BatchMember> Missing, IReadOnlyList<int> MissingShards, RunSettings Settings);

/// <summary>
/// Reads the shard records of an out folder and puts the batch back together. The newest record decides
/// the shard count and the batch (an earlier run with another count or other specs leaves records that are
/// then ignored, or reported when they contradict).
/// </summary>
public static class ShardMerge
{
    /// <summary>The merged batch, or null with a message when the folder holds no usable shard record.</summary>
    public static MergedBatch? Read(string outDir, out string? error)
    {
        ArgumentNullException.ThrowIfNull(outDir);
        error = null;
        var folder = Path.Combine(outDir, ShardRecord.FolderName);
        var files = Directory.Exists(folder)
            ? Directory.EnumerateFiles(folder, "shard-*-of-*.json").OrderByDescending(File.GetLastWriteTimeUtc).ThenBy(f => f, StringComparer.Ordinal).ToList()
            : [];
        var records = files.Select(ShardRecord.Read).Where(r => r is not null).Select(r => r!).ToList();
        if (records.Count == 0)
        {
            error = $"{outDir}: error: no shard records in {folder}; run 'fitspec solve ... --shard I/N --out {outDir}' for each shard first";
            return null;
        }

        var newest = records[0];
        var batch = newest.Batch;
        var byShard = new Dictionary<int, ShardRecord>();
        foreach (var r in records.Where(r => r.Count == newest.Count))
        {
            if (!byShard.ContainsKey(r.Shard))
            {
                byShard[r.Shard] = r;
            }
        }

        var disagreeing = byShard.Values.Where(r => !SameBatch(r.Batch, batch) || r.CommandLine != newest.CommandLine || r.Stamp != newest.Stamp).Select(r => r.Shard).Order().ToList();
        if (disagreeing.Count > 0)
        {
            error = $"{outDir}: error: shard{(disagreeing.Count > 1 ? "s" : "")} {string.Join(", ", disagreeing)} of {newest.Count} ran on other specs or another command line than shard {newest.Shard}; run {(disagreeing.Count > 1 ? "them" : "it")} again with the same specs and options";
            return null;
        }

        var fits = new Dictionary<string, FitRun>(StringComparer.Ordinal);
        foreach (var record in byShard.Values)
        {
            foreach (var fit in record.Fits)
            {
                fits[fit.Summary.SpecFile] = ShardRecord.ToRun(fit);
            }
        }

        var runs = new List<FitRun>();
        var missing = new List<BatchMember>();
        foreach (var member in batch)
        {
            if (fits.TryGetValue(member.Spec, out var run))
            {
                runs.Add(run);
            }
            else
            {
                missing.Add(member);
            }
        }

        var missingShards = Enumerable.Range(0, newest.Count).Where(i => !byShard.ContainsKey(i)).ToList();
        return new MergedBatch(newest.Count, runs, missing, missingShards, new RunSettings(newest.CommandLine, newest.Stamp));
    }

    private static bool SameBatch(IReadOnlyList<BatchMember> a, IReadOnlyList<BatchMember> b) =>
        a.Count == b.Count && a.Zip(b).All(p => p.First == p.Second);
}
