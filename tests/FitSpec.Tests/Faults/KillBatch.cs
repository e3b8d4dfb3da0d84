using System.Globalization;
using System.Text;
using FitSpec.Tests.Cli;

namespace FitSpec.Tests.Faults;

/// <summary>
/// The batch the kill test runs, in specs/: 12 small fits (milliseconds each), two medium l1 fits solved as
/// the primal LP by simplex (about half a second each, so a kill often lands inside a solve), and one fit that
/// starts quick and is then turned into the 41-second fit of the cancel tests, so that the second run can
/// never finish before it is killed. All data are invented.
/// </summary>
public static class KillBatch
{
    public const int SmallCount = 12;
    public const int MediumRows = 1_500;
    public const string Slow = "slow";

    public static IReadOnlyList<string> Mediums { get; } = ["med0", "med1"];

    public static IReadOnlyList<string> Small { get; } = Enumerable.Range(0, SmallCount).Select(BatchSpecs.Name).ToList();

    /// <summary>The small fits whose data the second run changes (every third).</summary>
    public static IReadOnlyList<string> ChangedSmall { get; } = Enumerable.Range(0, SmallCount).Where(i => i % 3 == 0).Select(BatchSpecs.Name).ToList();

    /// <summary>The fits whose spec or data differ between the first run and the last: small ones and the medium ones.</summary>
    public static IReadOnlySet<string> Changed { get; } = ChangedSmall.Concat(Mediums).ToHashSet(StringComparer.Ordinal);

    /// <summary>The fits the first and last runs see alike (the slow one is changed for the killed run only).</summary>
    public static IReadOnlySet<string> Unchanged { get; } = Small.Except(ChangedSmall).Append(Slow).ToHashSet(StringComparer.Ordinal);

    public static IReadOnlySet<string> All { get; } = Changed.Concat(Unchanged).ToHashSet(StringComparer.Ordinal);

    /// <summary>The first run's batch.</summary>
    public static void WriteFirst(CliHarness cli)
    {
        ArgumentNullException.ThrowIfNull(cli);
        BatchSpecs.WriteBatch(cli, SmallCount);
        for (var m = 0; m < Mediums.Count; m++)
        {
            WriteFit(cli, Mediums[m], CancelFits.SlowSpec(Mediums[m]), MediumCsv(seed: m, shift: 0));
        }

        RevertSlow(cli);
    }

    /// <summary>What the killed run sees: new data for every third small fit and each medium fit, and the slow fit.</summary>
    public static void WriteChanges(CliHarness cli)
    {
        ArgumentNullException.ThrowIfNull(cli);
        for (var i = 0; i < SmallCount; i += 3)
        {
            cli.Write($"specs/{BatchSpecs.Name(i)}.csv", BatchSpecs.DataCsv(i, shift: 0.5));
        }

        for (var m = 0; m < Mediums.Count; m++)
        {
            WriteFit(cli, Mediums[m], CancelFits.SlowSpec(Mediums[m]), MediumCsv(seed: m, shift: 0.25));
        }

        WriteFit(cli, Slow, CancelFits.SlowSpec(Slow), CancelFits.SlowCsv());
    }

    /// <summary>Puts the slow fit back as the first run had it (same bytes, so the same cache key).</summary>
    public static void RevertSlow(CliHarness cli)
    {
        ArgumentNullException.ThrowIfNull(cli);
        WriteFit(cli, Slow, CancelFits.QuickSpec(Slow), CancelFits.QuickCsv);
    }

    /// <summary>y = 1 + 2x + shift + uniform noise in [-1, 1], x evenly spaced in [0, 10) (seeded).</summary>
    private static string MediumCsv(int seed, double shift)
    {
        var random = new Random(seed);
        var csv = new StringBuilder("x,y\n");
        for (var i = 0; i < MediumRows; i++)
        {
            var x = i * 10.0 / MediumRows;
            var y = 1 + shift + (2 * x) + ((2 * random.NextDouble()) - 1);
            csv.Append(CultureInfo.InvariantCulture, $"{x:R},{y:R}\n");
        }

        return csv.ToString();
    }

    private static void WriteFit(CliHarness cli, string name, string spec, string csv)
    {
        cli.Write($"specs/{name}.csv", csv);
        cli.Write($"specs/{name}.fit.yaml", spec);
    }
}
