namespace FitSpec.Cluster;

/// <summary>
/// A batch to run across machines: the spec arguments and out folder as the workers will see them, the
/// number of shards, the command that runs the tool on a worker, and the fits each worker runs at once.
/// </summary>
public sealed record ClusterJob(IReadOnlyList<string> Specs, string OutDir, int Tasks, string Tool, int Jobs, string Name)
{
    /// <summary>The arguments of one shard's solve (without the tool), in the order a single run would take them.</summary>
    public IReadOnlyList<string> SolveArguments(string shard) =>
        ["solve", .. Specs, "--out", OutDir, "--shard", shard, "--jobs", Jobs.ToString(System.Globalization.CultureInfo.InvariantCulture)];
}

/// <summary>Quoting for a POSIX shell: plain words stay as they are.</summary>
public static class ShellWords
{
    public static string Quote(string word)
    {
        ArgumentNullException.ThrowIfNull(word);
        return word.Length > 0 && word.All(c => char.IsAsciiLetterOrDigit(c) || "-_./:=,@%+".Contains(c, StringComparison.Ordinal))
            ? word
            : "'" + word.Replace("'", "'\\''", StringComparison.Ordinal) + "'";
    }

    public static string Join(IEnumerable<string> words) => string.Join(' ', words.Select(Quote));
}
