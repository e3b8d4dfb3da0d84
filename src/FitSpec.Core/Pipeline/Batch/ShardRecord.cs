using System.Text.Json;
using System.Text.Json.Serialization;
using FitSpec.Results;

namespace FitSpec.Pipeline.Batch;

/// <summary>A spec of the whole batch, in batch order, with the shard its fit belongs to.</summary>
public sealed record BatchMember(string Spec, string Name, int Shard);

/// <summary>One fit as a shard ran it: what the index pages and the summary need of a <see cref="FitRun"/>.</summary>
public sealed record ShardFit(FitSummary Summary, string Source, IReadOnlyList<string> Outputs, IReadOnlyList<string> Problems);

/// <summary>
/// What a shard leaves for the merge, OUT/.fitspec-shards/shard-I-of-N.json: the whole batch as it saw it
/// (so a merge knows every fit, even of shards that never reported), how the run was invoked, and its own
/// fits. Written atomically when the shard's fits are done; a shard that died leaves no (new) record.
/// </summary>
public sealed record ShardRecord(string Format, int Shard, int Count, string CommandLine, bool Stamp, IReadOnlyList<BatchMember> Batch, IReadOnlyList<ShardFit> Fits)
{
    public const string CurrentFormat = "fitspec-shard/1";

    public const string FolderName = ".fitspec-shards";

    private static readonly JsonSerializerOptions Options = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
        WriteIndented = true,
    };

    public static string FileName(int shard, int count) => $"shard-{shard}-of-{count}.json";

    public static string PathIn(string outDir, int shard, int count) => System.IO.Path.Combine(outDir, FolderName, FileName(shard, count));

    public static ShardRecord Of(Shard shard, RunSettings settings, IReadOnlyList<BatchMember> batch, IReadOnlyList<FitRun> runs)
    {
        ArgumentNullException.ThrowIfNull(shard);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(runs);
        var fits = runs.Select(r => new ShardFit(r.Summary, r.Source.ToString().ToLowerInvariant(), r.Outputs, r.Problems)).ToList();
        return new ShardRecord(CurrentFormat, shard.Index, shard.Count, settings.CommandLine, settings.Stamp, batch, fits);
    }

    public void Write(string outDir)
    {
        Directory.CreateDirectory(System.IO.Path.Combine(outDir, FolderName));
        AtomicFile.Write(PathIn(outDir, Shard, Count), JsonSerializer.Serialize(this, Options) + "\n");
    }

    /// <summary>The record in a file, or null when it is not a complete record of this format.</summary>
    public static ShardRecord? Read(string path)
    {
        try
        {
            var record = JsonSerializer.Deserialize<ShardRecord>(File.ReadAllText(path), Options);
            return record is { Format: CurrentFormat, Batch: not null, Fits: not null, CommandLine: not null }
                && record.Fits.All(f => f is { Summary: not null, Outputs: not null, Problems: not null, Source: not null })
                ? record : null;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or JsonException or NotSupportedException)
        {
            return null;
        }
    }

    /// <summary>The fit as a batch run of this process would have returned it (times are not kept).</summary>
    public static FitRun ToRun(ShardFit fit)
    {
        ArgumentNullException.ThrowIfNull(fit);
        var source = Enum.TryParse<FitSource>(fit.Source, ignoreCase: true, out var s) ? s : FitSource.Solved;
        return new FitRun(fit.Summary, source, fit.Outputs, fit.Problems, TimeSpan.Zero);
    }
}
