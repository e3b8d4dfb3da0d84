using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>
/// A value at the magnitude limit (1e10, the largest a fit takes) is not refused: every loss solves it to a verified
/// optimum, closed form, QP (l2 with b1 >= 0) and LP (l1, linf) alike; just past it, it is a located data error.
/// </summary>
public sealed class LimitValueTests(LimitValueTests.Batch batch) : IClassFixture<LimitValueTests.Batch>
{
    /// <summary>Fit name, column, value (on file line 4), loss, whether b1 >= 0 is added.</summary>
    public static readonly TheoryData<string, string, string, string, bool> AtLimit = new()
    {
        { "y-l2", "y", "1e10", "l2", false },
        { "y-qp", "y", "-1e10", "l2", true },
        { "y-l1", "y", "1e10", "l1", false },
        { "y-linf", "y", "1e10", "linf", false },
        { "x-l2", "x", "1e10", "l2", false },
        { "x-qp", "x", "1e10", "l2", true },
        { "x-l1", "x", "-1e10", "l1", false },
        { "x-linf", "x", "1e10", "linf", false },
    };

    [Theory]
    [MemberData(nameof(AtLimit))]
    public void Value_at_the_limit_solves_to_a_verified_optimum(string name, string column, string value, string loss, bool constrained)
    {
        var run = batch.RunOf(name);

        Assert.True(batch.Result(name).GetProperty("status").GetString() == "optimal",
            $"{column} = {value}, {loss}{(constrained ? " with a constraint" : "")}: {run}");
    }

    [Fact]
    public void Value_just_past_the_limit_is_a_data_error_on_its_row()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleWith("x", 3, "1.0001e10"));
        var spec = cli.Write("past.fit.yaml", FitYaml("past", Line, "l1"));

        var run = cli.Run("check", spec);

        Assert.True(run.ExitCode == 2, run.ToString());
        Assert.Contains("'x'", DataErrorAt(run, "d.csv", 3).Value, StringComparison.Ordinal);
    }

    /// <summary>Every case of <see cref="AtLimit"/>, solved in one run.</summary>
    public sealed class Batch() : CaseBatch(AtLimit.Select(c => new EdgeCase(
        (string)c[0], FitYaml((string)c[0], Line, (string)c[3], tail: (bool)c[4] ? PositiveSlope : ""), SampleWith((string)c[1], 4, (string)c[2]))));
}
