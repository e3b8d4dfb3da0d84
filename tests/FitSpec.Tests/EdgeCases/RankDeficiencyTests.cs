using System.Text.RegularExpressions;
using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>
/// Terms the data cannot tell apart: a spec error at the later term of the dependency, naming every coefficient in it
/// and the way out (remove a term or add an l2 penalty), exit 2, for every loss; an l2 penalty makes the fit unique.
/// </summary>
public sealed partial class RankDeficiencyTests(RankDeficiencyTests.Batch batch) : IClassFixture<RankDeficiencyTests.Batch>
{
    /// <summary>Columns: c is constant 5, z is all zero, x3 = 3x + 1.</summary>
    private static readonly string Data = Csv("x,y,c,z,x3", Rows.Select((r, i) => $"{r},5,0,{(3 * (i + 1)) + 1}"));

    /// <summary>Fit name, loss, terms (split at '|'), the later term of the dependency, the coefficients it involves.</summary>
    public static readonly TheoryData<string, string, string, string, string> Dependent = new()
    {
        { "constant-column", "l2", "b0: 1|b1: x|bc: c", "bc", "b0,bc" },
        { "zero-column", "l2", "b0: 1|b1: x|bz: z", "bz", "bz" },
        { "scaled-copy", "l2", "b0: 1|b1: x|b2: 2*x", "b2", "b1,b2" },
        { "affine-copy", "l2", "b0: 1|b1: x|b3: x3", "b3", "b0,b1,b3" },
        { "scaled-copy-l1", "l1", "b0: 1|b1: x|b2: 2*x", "b2", "b1,b2" },
        { "zero-column-linf", "linf", "b0: 1|b1: x|bz: z", "bz", "bz" },
        { "constant-expression", "l2", "b0: 1|b1: x|b2: 1+1", "b2", "b0,b2" },
    };

    [Fact]
    public void Batch_of_dependent_terms_exits_2()
    {
        Assert.True(batch.Run.ExitCode == 2, batch.Run.ToString());
    }

    [Theory]
    [MemberData(nameof(Dependent))]
    public void Dependent_terms_are_a_spec_error_naming_the_coefficients(string name, string loss, string terms, string laterTerm, string involved)
    {
        var run = batch.RunOf(name);

        Assert.True(run.ExitCode == 2, $"{loss}: {run}");
        var message = SpecErrorAt(run, $"{name}/{name}.fit.yaml", KeyOf(YamlOf(name, loss, terms), laterTerm)).Groups["msg"].Value;
        var named = QuotedName().Matches(message).Select(m => m.Groups[1].Value).ToList();
        Assert.True(named.SequenceEqual(involved.Split(',')), $"the message names [{string.Join(", ", named)}], expected [{involved}]: {message}");
        Assert.Contains("l2 penalty", message, StringComparison.Ordinal);
        Assert.Equal("error", batch.Result(name).GetProperty("status").GetString());
    }

    /// <summary>
    /// x and 2x under a ridge penalty on both: only s = b1 + 2·b2 is fixed by the data, and the penalty picks the
    /// least-norm split of s, (s/5, 2s/5) (minimise b1² + b2² on the line b1 + 2·b2 = s), so b2 = 2·b1.
    /// </summary>
    [Fact]
    public void Ridge_penalty_makes_dependent_terms_solve_with_the_least_norm_split()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", Data);
        var spec = cli.Write("ridge.fit.yaml", FitYaml("ridge", ["b0: 1", "b1: x", "b2: 2*x"], tail: "penalties:\n  - {kind: l2, weight: 0.01}\n"));

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 0, run.ToString());
        var coefficients = Result(cli, "ridge").GetProperty("coefficients");
        var b1 = coefficients.GetProperty("b1").GetDouble();
        var b2 = coefficients.GetProperty("b2").GetDouble();
        Assert.True(b1 > 0, $"b1 = {b1}");
        Assert.Equal(2 * b1, b2, 1e-9 * Math.Abs(b2));
    }

    private static string YamlOf(string name, string loss, string terms) => FitYaml(name, terms.Split('|'), loss);

    /// <summary>Every case of <see cref="Dependent"/>, solved in one run.</summary>
    public sealed class Batch() : CaseBatch(Dependent.Select(c => new EdgeCase((string)c[0], YamlOf((string)c[0], (string)c[1], (string)c[2]), Data)));

    [GeneratedRegex("'([A-Za-z_][A-Za-z0-9_]*)'")]
    private static partial Regex QuotedName();
}
