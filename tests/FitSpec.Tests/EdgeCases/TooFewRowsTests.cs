using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>
/// Fewer rows than coefficients: a spec error at `model.terms` saying how many rows and coefficients there are,
/// exit 2, unless an l2 penalty makes the objective strictly convex (SPEC.md: rank deficiency is an error "unless a
/// penalty makes the problem strictly convex"; an l1 penalty does not, bounds do not).
/// </summary>
public sealed class TooFewRowsTests(TooFewRowsTests.Batch batch) : IClassFixture<TooFewRowsTests.Batch>
{
    private static readonly string[] Cubic = ["b0: 1", "c: {polynomial: x, degree: 3}"];

    private static readonly string ThreeRows = Csv(Header, Rows.Take(3));

    /// <summary>Fit name, loss, top-level YAML added (penalties, constraints): none of them makes the fit unique.</summary>
    public static readonly TheoryData<string, string, string> Undetermined = new()
    {
        { "plain", "l2", "" },
        { "l1-loss", "l1", "" },
        { "linf-loss", "linf", "" },
        { "l1-penalty", "l2", "penalties:\n  - {kind: l1, weight: 0.01}\n" },
        { "bounded", "l2", "constraints:\n  - {kind: bounds, min: -10, max: 10}\n" },
    };

    [Fact]
    public void Batch_of_undetermined_fits_exits_2()
    {
        Assert.True(batch.Run.ExitCode == 2, batch.Run.ToString());
    }

    [Theory]
    [MemberData(nameof(Undetermined))]
    public void Three_rows_for_four_coefficients_is_a_spec_error_at_the_terms(string name, string loss, string tail)
    {
        var run = batch.RunOf(name);

        Assert.True(run.ExitCode == 2, run.ToString());
        var message = SpecErrorAt(run, $"{name}/{name}.fit.yaml", KeyOf(FitYaml(name, Cubic, loss, tail: tail), "terms")).Groups["msg"].Value;
        Assert.Contains("3 rows", message, StringComparison.Ordinal);
        Assert.Contains("4 coefficients", message, StringComparison.Ordinal);
        Assert.Contains("l2 penalty", message, StringComparison.Ordinal);
        Assert.Equal("model.terms", Assert.Single(batch.Result(name).GetProperty("errors").EnumerateArray()).GetProperty("field").GetString());
    }

    [Theory]
    [InlineData("ridge-closed-form", "l2", "closed-form")]
    [InlineData("ridge-l1-loss", "l1", "QP")]
    public void Ridge_penalty_lets_three_rows_determine_four_coefficients(string name, string loss, string problemClass)
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", ThreeRows);
        var spec = cli.Write(name + ".fit.yaml", FitYaml(name, Cubic, loss, tail: "penalties:\n  - {kind: l2, weight: 0.01}\n"));

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 0, run.ToString());
        var result = Result(cli, name);
        Assert.Equal("optimal", result.GetProperty("status").GetString());
        Assert.Equal(problemClass, result.GetProperty("problem").GetProperty("class").GetString());
        Assert.Equal(["b0", "c1", "c2", "c3"], result.GetProperty("coefficients").EnumerateObject().Select(p => p.Name));
    }

    /// <summary>Every case of <see cref="Undetermined"/>, solved in one run.</summary>
    public sealed class Batch() : CaseBatch(Undetermined.Select(c => new EdgeCase((string)c[0], FitYaml((string)c[0], Cubic, (string)c[1], tail: (string)c[2]), ThreeRows)));
}
