using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;

namespace FitSpec.Tests.Cli;

/// <summary>
/// Small generated batches for the batch tests: invented straight-line data (no check values come from it;
/// the tests check behaviour), alternately fitted with l2 and l1, one data file per spec.
/// </summary>
public static partial class BatchSpecs
{
    // A fixed wiggle so that residuals are non-zero and every fit differs a little.
    private static readonly double[] Wiggle = [0.03, -0.02, 0.05, -0.04, 0.01, -0.03, 0.02, -0.01];

    public static string Name(int i) => "fit" + i.ToString("D2", CultureInfo.InvariantCulture);

    /// <summary>Data for fit <paramref name="i"/>: y = (1 + i/10) + (2 + i/20)·x + wiggle, x = 1..8.</summary>
    public static string DataCsv(int i, double shift = 0)
    {
        var sb = new StringBuilder("x,y\n");
        for (var k = 0; k < Wiggle.Length; k++)
        {
            var x = k + 1;
            var y = 1 + (i / 10.0) + ((2 + (i / 20.0)) * x) + Wiggle[(k + i) % Wiggle.Length] + (k == 3 ? shift : 0);
            sb.Append(CultureInfo.InvariantCulture, $"{x},{y:R}\n");
        }

        return sb.ToString();
    }

    public static string SpecYaml(int i, string tail = "") =>
        $"fitspec: 1\nname: {Name(i)}\ndata:\n  path: {Name(i)}.csv\nmodel:\n  response: y\n  terms:\n    b0: 1\n    b1: x\nloss: {(i % 2 == 0 ? "l2" : "l1")}\n{tail}";

    /// <summary>Writes specs/fitNN.fit.yaml and specs/fitNN.csv for i = 0..count-1; returns the names.</summary>
    public static IReadOnlyList<string> WriteBatch(CliHarness cli, int count, string folder = "specs")
    {
        ArgumentNullException.ThrowIfNull(cli);
        var names = new List<string>();
        for (var i = 0; i < count; i++)
        {
            cli.Write($"{folder}/{Name(i)}.csv", DataCsv(i));
            cli.Write($"{folder}/{Name(i)}.fit.yaml", SpecYaml(i));
            names.Add(Name(i));
        }

        return names;
    }

    /// <summary>An acceptance rule no noisy fit passes: a bound far below the data's wiggle, not a check value.</summary>
    public const string FailingAcceptance = "report:\n  accept:\n    - \"max_abs_residual <= 1e-9\"\n    - \"observations >= 8\"\n";

    /// <summary>YAML that does not parse.</summary>
    public const string Unparseable = "fitspec: 1\nname: foo: bar\n";

    /// <summary>The progress lines of a redirected run, by fit name.</summary>
    public static Dictionary<string, Match> ProgressLines(CliRun run)
    {
        ArgumentNullException.ThrowIfNull(run);
        return run.Stdout.Split('\n', StringSplitOptions.TrimEntries)
            .Select(l => ProgressLine().Match(l))
            .Where(m => m.Success)
            .ToDictionary(m => m.Groups["name"].Value, m => m, StringComparer.Ordinal);
    }

    /// <summary>Names of the fits that a run took from the cache.</summary>
    public static HashSet<string> Cached(CliRun run) =>
        ProgressLines(run).Where(p => p.Value.Groups["cached"].Success).Select(p => p.Key).ToHashSet(StringComparer.Ordinal);

    /// <summary>Every file under <paramref name="folder"/> (relative path → bytes and last write time).</summary>
    public static Dictionary<string, (byte[] Bytes, DateTime Written)> Snapshot(string folder) =>
        Directory.EnumerateFiles(folder, "*", SearchOption.AllDirectories)
            .ToDictionary(f => Path.GetRelativePath(folder, f), f => (File.ReadAllBytes(f), File.GetLastWriteTimeUtc(f)), StringComparer.Ordinal);

    /// <summary>"[12/30] fit07: optimal objective 0.1 (cached)" or "(0.05 s)".</summary>
    [GeneratedRegex(@"^\[(?<done>\d+)/(?<total>\d+)\] (?<name>[^:\s]+): (?<status>[a-z-]+)(?<rest>.*?) \((?:(?<cached>cached)|(?<seconds>\d+\.\d\d) s|not run)\)$")]
    public static partial Regex ProgressLine();
}
