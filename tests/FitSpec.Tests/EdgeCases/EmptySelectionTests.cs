using System.Globalization;
using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>Nothing left to fit: a spec error, exit 2, pointing at what removed the rows.</summary>
public sealed class EmptySelectionTests
{
    /// <summary>The filter is what emptied the data, so the error points at the filter and says it removed every row.</summary>
    [Fact]
    public void Filter_that_removes_every_row_is_a_spec_error_at_the_filter()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", Csv(Header, Rows));
        var yaml = FitYaml("emptied", Line, dataExtra: "  filter: \"x > 100\"\n");
        var spec = cli.Write("emptied.fit.yaml", yaml);

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 2, run.ToString());
        var error = CliSpecs.SingleError(run, CliSpecs.SpecError());
        Assert.True(error.Groups["file"].Value == spec && error.Groups["line"].Value == KeyOf(yaml, "filter").Line.ToString(CultureInfo.InvariantCulture),
            $"expected the error on the filter's line {KeyOf(yaml, "filter").Line}: {run}");
        Assert.Contains("6 removed by the filter", error.Groups["msg"].Value, StringComparison.Ordinal);
        Assert.Equal("error", Status(cli, "emptied"));
    }

    /// <summary>With `missing: drop`, rows that are all missing leave nothing; the error counts them at the data source.</summary>
    [Fact]
    public void Dropping_every_row_as_missing_is_a_spec_error_at_the_data_source()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", "x,y\n1,\n2,nan\n,3\n");
        var yaml = FitYaml("nothing", Line, dataExtra: "  missing: drop\n");
        var spec = cli.Write("nothing.fit.yaml", yaml);

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 2, run.ToString());
        var error = CliSpecs.SingleError(run, CliSpecs.SpecError());
        Assert.Equal(KeyOf(yaml, "path").Line.ToString(CultureInfo.InvariantCulture), error.Groups["line"].Value);
        Assert.Contains("3 dropped as missing", error.Groups["msg"].Value, StringComparison.Ordinal);
    }

    [Fact]
    public void Data_file_with_only_a_header_is_a_spec_error_at_the_data_path()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", "x,y\n");
        var yaml = FitYaml("headeronly", Line);
        var spec = cli.Write("headeronly.fit.yaml", yaml);

        var run = cli.Run("check", spec);

        Assert.True(run.ExitCode == 2, run.ToString());
        var error = CliSpecs.SingleError(run, CliSpecs.SpecError());
        Assert.Equal(KeyOf(yaml, "path").Line.ToString(CultureInfo.InvariantCulture), error.Groups["line"].Value);
        Assert.Contains("no rows", error.Groups["msg"].Value, StringComparison.Ordinal);
    }

    /// <summary>A data file of zero bytes has no header at all: the error says the file is empty, not which columns it lacks.</summary>
    [Fact]
    public void Empty_data_file_is_an_error_saying_it_is_empty()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", "");
        var spec = cli.Write("blank.fit.yaml", FitYaml("blank", Line));

        var run = cli.Run("check", spec);

        Assert.True(run.ExitCode == 2, run.ToString());
        var line = Assert.Single(run.StderrLines);
        Assert.True(line.Contains("d.csv", StringComparison.Ordinal) && line.Contains("empty", StringComparison.Ordinal), $"the error does not say that d.csv is empty: {run}");
    }
}
