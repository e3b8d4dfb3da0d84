using System.Text;
using FitSpec.Spec;

namespace FitSpec.Tests.Spec;

public sealed class UncertaintyReaderTests
{
    private const string Minimal = """
        fitspec: 1
        data:
          path: d.csv
        model:
          response: y
          terms:
            b0: 1
            b1: x

        """;

    private static SpecReadResult Parse(string report) =>
        SpecReader.Parse("demo.fit.yaml", Encoding.UTF8.GetBytes(Minimal + report));

    [Fact]
    public void Bootstrap_and_seed_are_read_with_the_default_level()
    {
        var r = Parse("report:\n  uncertainty: {bootstrap: 500, seed: 7}\n");
        Assert.Empty(r.Errors);
        var u = r.Document!.Report.Uncertainty!;
        Assert.Equal(500, u.Bootstrap);
        Assert.Equal(7, u.Seed);
        Assert.Equal(0.95, u.Level);
        Assert.Equal(new SourcePos("demo.fit.yaml", 10, 16), u.Pos);
    }

    [Fact]
    public void Level_is_read_when_given()
    {
        var r = Parse("report:\n  formats: [json]\n  uncertainty:\n    bootstrap: 10\n    seed: 0\n    level: 0.9\n");
        Assert.Empty(r.Errors);
        Assert.Equal(0.9, r.Document!.Report.Uncertainty!.Level);
        Assert.Equal([ReportFormat.Json], r.Document.Report.Formats);
    }

    [Fact]
    public void Without_uncertainty_there_is_none()
    {
        Assert.Null(Parse("report: {formats: [html]}\n").Document!.Report.Uncertainty);
        Assert.Null(SpecReader.Parse("demo.fit.yaml", Encoding.UTF8.GetBytes(Minimal)).Document!.Report.Uncertainty);
    }

    [Theory]
    [InlineData("{bootstrap: 9, seed: 1}", 10, 28, "report.uncertainty.bootstrap", "report.uncertainty.bootstrap must be between 10 and 100000 resamples, got 9")]
    [InlineData("{bootstrap: 100001, seed: 1}", 10, 28, "report.uncertainty.bootstrap", "report.uncertainty.bootstrap must be between 10 and 100000 resamples, got 100001")]
    [InlineData("{bootstrap: 2.5, seed: 1}", 10, 28, "report.uncertainty.bootstrap", "'report.uncertainty.bootstrap' must be a whole number, got '2.5'")]
    [InlineData("{bootstrap: 50, seed: -3}", 10, 38, "report.uncertainty.seed", "report.uncertainty.seed must be a whole number, 0 or more, got -3")]
    [InlineData("{bootstrap: 50, seed: x}", 10, 38, "report.uncertainty.seed", "'report.uncertainty.seed' must be a whole number, got 'x'")]
    [InlineData("{bootstrap: 50, seed: 1, level: 1}", 10, 48, "report.uncertainty.level", "report.uncertainty.level must be strictly between 0 and 1 (0.95 gives 95% intervals), got 1")]
    [InlineData("{bootstrap: 50, seed: 1, level: 0}", 10, 48, "report.uncertainty.level", "report.uncertainty.level must be strictly between 0 and 1 (0.95 gives 95% intervals), got 0")]
    [InlineData("{bootstrap: 50, seed: 1, levl: 0.9}", 10, 41, "levl", "unknown key 'levl' in report.uncertainty (did you mean 'level'?); allowed: bootstrap, seed, level")]
    [InlineData("500", 10, 16, "report.uncertainty", "'report.uncertainty' must be a mapping (key: value lines)")]
    public void Wrong_values_are_located_errors(string value, int line, int column, string field, string message)
    {
        var r = Parse($"report:\n  uncertainty: {value}\n");
        Assert.Null(r.Document);
        var e = Assert.Single(r.Errors);
        Assert.Equal((line, column, field, message), (e.Line!.Value, e.Column!.Value, e.Field, e.Message));
    }

    [Fact]
    public void Seed_is_required_so_that_runs_repeat()
    {
        var r = Parse("report:\n  uncertainty: {bootstrap: 500}\n");
        var e = Assert.Single(r.Errors);
        Assert.Equal("report.uncertainty.seed", e.Field);
        Assert.Equal((10, 16), (e.Line, e.Column));
        Assert.Contains("needs 'seed:'", e.Message, StringComparison.Ordinal);
        Assert.Contains("the same spec always gives the same intervals", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Bootstrap_is_required()
    {
        var e = Assert.Single(Parse("report:\n  uncertainty:\n    seed: 3\n").Errors);
        Assert.Equal("report.uncertainty.bootstrap", e.Field);
        Assert.Equal("report.uncertainty needs 'bootstrap:' (the number of resamples, between 10 and 100000)", e.Message);
    }
}
