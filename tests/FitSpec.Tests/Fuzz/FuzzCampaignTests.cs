using FitSpec.Fuzz.Harness;
using FitSpec.Fuzz.Targets;
using Xunit.Abstractions;

namespace FitSpec.Tests.Fuzz;

/// <summary>
/// Short seeded fuzzing runs of the three targets (the long runs are tools/FitSpec.Fuzz): every input must
/// end in a result or a clean, located error within its time and memory budget. Inputs come from a fixed
/// seed, so a failure here repeats on every run; its message carries the shrunk input and its CsCheck seed.
/// </summary>
public sealed class FuzzCampaignTests(ITestOutputHelper output)
{
    private const ulong Seed = 20_261_202;

    private static readonly Corpus Seeds = Corpus.Load();

    [Fact(Timeout = 180_000)]
    public async Task Mutated_and_composed_specs_end_in_a_document_or_located_errors() =>
        await Task.Run(() => AssertClean(Campaign.Run(new SpecTarget(Seeds, 0.002), Seeds, Short(2500))));

    [Fact(Timeout = 180_000)]
    public async Task Mutated_csv_files_end_in_a_consistent_table_or_data_errors() =>
        await Task.Run(() => AssertClean(Campaign.Run(new CsvTarget(Seeds, 0.002), Seeds, Short(2000))));

    [Fact(Timeout = 180_000)]
    public async Task Generated_expressions_parse_evaluate_and_compile_cleanly() =>
        await Task.Run(() => AssertClean(Campaign.Run(new ExpressionTarget(Seeds, 0.002), Seeds, Short(3000))));

    [Fact]
    public void The_same_seed_gives_the_same_inputs()
    {
        var target = new SpecTarget(Seeds, 0.05);
        var first = Campaign.Run(target, Seeds, Short(150));
        var second = Campaign.Run(target, Seeds, Short(150) with { Threads = 1 });
        Assert.Equal(first.Results, second.Results);
        Assert.Equal(first.CleanErrors, second.CleanErrors);
        Assert.Equal(first.FullFits, second.FullFits);
        Assert.Equal(first.Tally, second.Tally);
    }

    // Budgets are scaled up: CI shares its two cores with the rest of the suite, and a slow input here
    // would be a flaky failure; the long runs keep the real budgets.
    private static CampaignOptions Short(int count) => new()
    {
        Count = count,
        Seed = Seed,
        Threads = 2,
        ShrinkIterations = 300,
        MinimizeTime = TimeSpan.FromSeconds(5),
        MaxFindings = 3,
        TimeScale = 5,
    };

    private void AssertClean(CampaignReport report)
    {
        output.WriteLine(report.Summary());
        var findings = string.Join(
            "\n",
            report.Findings.Select(f => $"{f.Kind} ({f.Occurrences} inputs) {f.Signature}: {f.Message}\n  shrunk: {f.Shrunk.Preview(400)}\n  CsCheck seed: {f.Seed}"));
        Assert.True(report.Failures == 0, $"{report.Summary()}\n{findings}");

        // Both endings are reached: a generator that only ever produced garbage (or only valid input) tests little.
        Assert.True(report.Results > 0 && report.CleanErrors > 0, report.Summary());
    }
}
