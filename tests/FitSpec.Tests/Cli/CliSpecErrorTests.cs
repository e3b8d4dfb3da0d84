using static FitSpec.Tests.Cli.CliSpecs;

namespace FitSpec.Tests.Cli;

/// <summary>Invalid specs: exit 2 and one `FILE:LINE:COLUMN: error: message` line pointing at the problem.</summary>
public sealed class CliSpecErrorTests
{
    /// <summary>Malformed YAML; the error must name the line of the defect (a range where parsers may notice it one line late).</summary>
    [Theory]
    [InlineData("mapping-in-scalar", "fitspec: 1\nname: foo: bar\ndata:\n  path: d.csv\n", 2, 2)]
    [InlineData("duplicate-key", "fitspec: 1\nname: dup\ndata:\n  path: d.csv\nmodel:\n  response: y\n  terms:\n    b0: 1\nloss: l2\nloss: l1\n", 10, 10)]
    [InlineData("bad-indentation", "fitspec: 1\nname: ind\ndata:\n  path: d.csv\nmodel:\n  response: y\n  terms:\n    b0: 1\n    b1: x\n   b2: 2\n", 10, 10)]
    [InlineData("tab-indentation", "fitspec: 1\nname: tab\nmodel:\n\tresponse: y\n", 4, 4)]
    [InlineData("unclosed-flow-sequence", "fitspec: 1\nname: flow\nmodel:\n  terms: [a, b\nloss: l2\n", 4, 5)]
    public void Malformed_yaml_exits_2_with_file_line_column(string file, string yaml, int firstLine, int lastLine)
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        var spec = cli.Write(file + ".fit.yaml", yaml);
        var run = cli.Run("solve", spec, "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, SpecError());
        Assert.Equal(spec, error.Groups["file"].Value);
        var line = int.Parse(error.Groups["line"].Value, System.Globalization.CultureInfo.InvariantCulture);
        Assert.True(line >= firstLine && line <= lastLine, $"error reported on line {line}, the defect is on line {firstLine}..{lastLine}: {run}");
        var column = int.Parse(error.Groups["col"].Value, System.Globalization.CultureInfo.InvariantCulture);
        Assert.InRange(column, 1, yaml.Split('\n')[line - 1].Length + 1);

        // The message speaks of the YAML, not of the program's internals.
        Assert.DoesNotContain("current state of the object", error.Groups["msg"].Value, StringComparison.Ordinal);
    }

    [Fact]
    public void Unknown_key_constraint_suggests_constraints_at_its_position()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        var yaml = Linear("unknown", tail: "constraint:\n  - \"b1 >= 0\"\n");
        var spec = cli.Write("unknown.fit.yaml", yaml);
        var (line, column) = Locate(yaml, "constraint:");
        foreach (var args in new[] { new[] { "solve", spec, "--out", "out" }, ["check", spec], ["lower", spec, "--mps", "out/unknown.mps"] })
        {
            var run = cli.Run(args);
            Assert.True(run.ExitCode == 2, $"{args[0]}: {run}");
            var error = SingleError(run, SpecError());
            Assert.Equal($"{spec}:{line}:{column}", $"{error.Groups["file"].Value}:{error.Groups["line"].Value}:{error.Groups["col"].Value}");
            Assert.Contains("did you mean 'constraints'", error.Groups["msg"].Value, StringComparison.Ordinal);
        }

        Assert.False(cli.Exists("out/unknown.mps"), "lower wrote a program for an invalid spec");
    }

    /// <summary>An expression outside the language: the error points into the expression on its spec line.</summary>
    [Theory]
    [InlineData("x^^2")]
    [InlineData("sin(x)")]
    [InlineData("x + (1")]
    public void Bad_expression_exits_2_at_the_spec_line_and_column(string expression)
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        var yaml = Linear("badexpr", b1: expression);
        var spec = cli.Write("badexpr.fit.yaml", yaml);
        var (line, column) = Locate(yaml, "b1: " + expression);
        column += "b1: ".Length;
        var run = cli.Run("solve", spec, "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, SpecError());
        Assert.Equal(spec, error.Groups["file"].Value);
        Assert.Equal(line.ToString(System.Globalization.CultureInfo.InvariantCulture), error.Groups["line"].Value);
        var reported = int.Parse(error.Groups["col"].Value, System.Globalization.CultureInfo.InvariantCulture);
        Assert.True(reported >= column && reported <= column + expression.Length, $"column {reported} is outside '{expression}' (columns {column}..{column + expression.Length}): {run}");
        Assert.Equal("error", cli.Json("out/badexpr.result.json").GetProperty("status").GetString());
    }
}
