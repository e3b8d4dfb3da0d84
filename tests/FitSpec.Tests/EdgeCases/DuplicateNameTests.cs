using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>Two coefficients of one name: a spec error at the second of them, naming it, exit 2.</summary>
public sealed class DuplicateNameTests
{
    [Fact]
    public void Term_key_written_twice_is_a_spec_error_at_the_second()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", Csv(Header, Rows));
        var yaml = FitYaml("twice", ["b0: 1", "b1: x", "b1: x^2"]);
        var spec = cli.Write("twice.fit.yaml", yaml);

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 2, run.ToString());
        var message = SpecErrorAt(run, spec, KeyOf(yaml, "b1", occurrence: 2)).Groups["msg"].Value;
        Assert.Contains("b1", message, StringComparison.Ordinal);
        Assert.Equal("error", Status(cli, "twice"));
    }

    /// <summary>
    /// Expanders name their coefficients (`p` of degree 2 gives p1, p2; `columns: "a*"` gives a1, a2): a plain term
    /// of one of those names is a clash, reported at the term that repeats the name.
    /// </summary>
    [Theory]
    [InlineData("polynomial", "x,y", "p: {polynomial: x, degree: 2}|p1: x^3", "p1")]
    [InlineData("columns", "x,y,a1,a2", "a: {columns: \"a*\"}|a1: x", "a1")]
    public void Expanded_name_that_another_term_also_gives_is_a_spec_error_at_that_term(string name, string header, string terms, string clash)
    {
        using var cli = new CliHarness();
        var extra = header.Split(',').Length - 2;
        cli.Write("d.csv", Csv(header, Rows.Select((r, i) => r + string.Concat(Enumerable.Range(0, extra).Select(k => $",{((i * 7) + (k * 3)) % 5}")))));
        var yaml = FitYaml(name, ["b0: 1", .. terms.Split('|')]);
        var spec = cli.Write(name + ".fit.yaml", yaml);

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 2, run.ToString());
        var message = SpecErrorAt(run, spec, KeyOf(yaml, clash)).Groups["msg"].Value;
        Assert.Contains($"'{clash}'", message, StringComparison.Ordinal);
    }
}
