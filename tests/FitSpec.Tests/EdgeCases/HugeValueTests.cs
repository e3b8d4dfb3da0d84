using System.Globalization;
using System.Text.RegularExpressions;
using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>
/// Finite values so large that their squares or products overflow double precision (≈1.8e308): a data error at the
/// row's file line naming the column and the magnitude limit, exit 2, whatever the loss and whether the fit is closed
/// form (l2), a QP (l2 with a constraint) or an LP (l1, linf).
/// </summary>
public sealed partial class HugeValueTests(HugeValueTests.Batch batch) : IClassFixture<HugeValueTests.Batch>
{
    /// <summary>Fit name, column, value (on file line 4), loss, whether b1 >= 0 is added (so l2 becomes a QP).</summary>
    public static readonly TheoryData<string, string, string, string, bool> Overflowing = new()
    {
        { "y-closed-form", "y", "1e308", "l2", false },
        { "y-qp", "y", "1e308", "l2", true },
        { "y-l1", "y", "-1e308", "l1", false },
        { "y-linf", "y", "1e308", "linf", false },
        { "x-closed-form", "x", "1e308", "l2", false },
        { "x-qp", "x", "1e308", "l2", true },
        { "x-l1", "x", "1e308", "l1", false },
        { "x-linf", "x", "-1e308", "linf", false },
    };

    [Fact]
    public void Batch_of_overflowing_values_exits_2()
    {
        Assert.True(batch.Run.ExitCode == 2, batch.Run.ToString());
    }

    [Theory]
    [MemberData(nameof(Overflowing))]
    public void Overflowing_value_is_a_data_error_naming_row_column_and_limit(string name, string column, string value, string loss, bool constrained)
    {
        var run = batch.RunOf(name);

        Assert.True(run.ExitCode == 2, $"{loss}{(constrained ? " with a constraint" : "")}: {run}");
        var error = DataErrorAt(run, name + "/d.csv", 4);
        Assert.True(error.Value.Contains($"'{column}'", StringComparison.Ordinal), $"the error does not name column '{column}': {run}");
        AssertStatesALimitBelow(double.Parse(value, CultureInfo.InvariantCulture), error.Groups["msg"].Value);
        var result = batch.Result(name);
        Assert.Equal("error", result.GetProperty("status").GetString());
        Assert.Equal(4, Assert.Single(result.GetProperty("errors").EnumerateArray()).GetProperty("line").GetInt32());
    }

    [Fact]
    public void Check_refuses_an_overflowing_value_as_solve_does()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleWith("y", 6, "1.5e308"));
        var spec = cli.Write("huge.fit.yaml", FitYaml("huge", Line, tail: PositiveSlope));

        var run = cli.Run("check", spec);

        Assert.True(run.ExitCode == 2, run.ToString());
        AssertStatesALimitBelow(1.5e308, DataErrorAt(run, "d.csv", 6).Groups["msg"].Value);
    }

    /// <summary>The input (1e60) is representable, but its sixth power in a polynomial term (1e360) is not.</summary>
    [Fact]
    public void Polynomial_power_that_overflows_is_a_data_error_on_its_row()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleWith("x", 5, "1e60"));
        var spec = cli.Write("power.fit.yaml", FitYaml("power", ["b0: 1", "p: {polynomial: x, degree: 6}"]));

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 2, run.ToString());
        var errors = run.StderrLines.Where(l => l.Contains(": error: ", StringComparison.Ordinal)).ToList();
        Assert.NotEmpty(errors);
        Assert.All(errors, l => Assert.True(l.StartsWith("d.csv:5: error: ", StringComparison.Ordinal) && l.Contains("'x'", StringComparison.Ordinal),
            $"not an error at d.csv:5 naming 'x': {l}"));
    }

    // The message must say how large a value may be: some number in it, below the value refused.
    private static void AssertStatesALimitBelow(double value, string message)
    {
        var numbers = NumberInText().Matches(message)
            .Select(m => double.Parse(m.Value, NumberStyles.Float, CultureInfo.InvariantCulture))
            .Where(v => double.IsFinite(v) && Math.Abs(v) >= 1e10 && Math.Abs(v) < Math.Abs(value));
        Assert.True(numbers.Any(), $"the message states no magnitude limit below {value:R}: {message}");
    }

    [GeneratedRegex(@"\d+(\.\d+)?[eE][-+]?\d+")]
    private static partial Regex NumberInText();

    /// <summary>Every case of <see cref="Overflowing"/>, solved in one run.</summary>
    public sealed class Batch() : CaseBatch(Overflowing.Select(c => new EdgeCase(
        (string)c[0], FitYaml((string)c[0], Line, (string)c[3], tail: (bool)c[4] ? PositiveSlope : ""), SampleWith((string)c[1], 4, (string)c[2]))));
}
