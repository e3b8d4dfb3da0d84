using System.Globalization;
using System.Text;
using FitSpec.Lowering;
using FitSpec.Pipeline;
using FitSpec.Solving;
using FitSpec.Solving.Screening;
using FitSpec.Spec;
using FitSpec.Verification;

namespace FitSpec.Tests.Solving;

/// <summary>
/// The sign-screening backend must give the optimum of the whole LP: same objective as HiGHS on the full LP
/// (to rounding), its assembled primal and dual pass the verification on every row, with weights, a quantile,
/// bounds and an l1 penalty in play. Data are generated (behaviour, not reference values).
/// </summary>
public sealed class SignScreeningTests : IDisposable
{
    private const int Rows = 60_000;
    private readonly Support.TempFolder _temp = new("fitspec-screen");

    public SignScreeningTests()
    {
        var random = new Random(11);
        var csv = new StringBuilder("y,x1,x2,w\n");
        for (var i = 0; i < Rows; i++)
        {
            var x1 = random.NextDouble() * 10;
            var x2 = random.NextDouble() - 0.5;
            // Heavy-tailed noise: a Cauchy draw, as in readings with spikes.
            var noise = 0.05 * Math.Tan(Math.PI * (random.NextDouble() - 0.5));
            var w = 0.5 + random.NextDouble();
            csv.Append(CultureInfo.InvariantCulture, $"{1.5 + (0.8 * x1) - (2 * x2) + noise:R},{x1:R},{x2:R},{w:R}\n");
        }

        _temp.Write("d.csv", csv.ToString());
    }

    private LoweredFit Lower(string body, bool weighted)
    {
        var path = Path.Combine(_temp.Path, "s.fit.yaml");
        var data = weighted ? "{path: d.csv, weight: w}" : "{path: d.csv}";
        File.WriteAllText(path, $"fitspec: 1\nname: s\ndata: {data}\nmodel:\n  response: y\n  terms: {{b0: 1, b1: x1, b2: x2}}\n" + body);
        var read = SpecReader.Read(path);
        Assert.True(read.Document is not null, string.Join("; ", read.Errors.Select(e => e.Message)));
        return FitRunner.Lower(read.Document!, false);
    }

    [Theory]
    [InlineData("loss: l1\n", false)]
    [InlineData("loss: {kind: quantile, tau: 0.9}\n", true)]
    [InlineData("loss: l1\nconstraints:\n  - \"b1 <= 0.79\"\npenalties:\n  - {kind: l1, weight: 50, on: [b2]}\n", false)]
    public void Screening_reaches_the_full_LP_optimum_and_verifies(string body, bool weighted)
    {
        var fit = Lower(body, weighted);
        var options = new SolveOptions(SolveMethod.Auto, null);
        var screening = new SignScreeningSolver();
        Assert.True(screening.CanSolve(fit, options));
        var screened = screening.Solve(fit, options, default);
        Assert.Contains("sign screening", screened.Formulation, StringComparison.Ordinal);
        var check = Verifier.Check(fit, screened);
        Assert.True(check.Verification.Passed, string.Join("; ", check.Verification.Failures));
        Assert.True(check.Verification.DualityGap < 1e-9, $"gap {check.Verification.DualityGap}");

        var direct = new HighsFitSolver().Solve(fit, options, default);
        var directCheck = Verifier.Check(fit, direct);
        Assert.Equal(directCheck.Objective, check.Objective, 1e-9 * Math.Abs(directCheck.Objective));
    }

    [Fact]
    public void Small_fits_are_left_to_the_direct_solve()
    {
        File.WriteAllText(Path.Combine(_temp.Path, "small.csv"), "y,x1,x2,w\n1,0,0,1\n2,1,0,1\n2.9,2,1,1\n4.2,3,0,1\n");
        var path = Path.Combine(_temp.Path, "small.fit.yaml");
        File.WriteAllText(path, "fitspec: 1\ndata: {path: small.csv}\nmodel:\n  response: y\n  terms: {b0: 1, b1: x1}\nloss: l1\n");
        var fit = FitRunner.Lower(SpecReader.Read(path).Document!, false);
        Assert.False(new SignScreeningSolver().CanSolve(fit, new SolveOptions(SolveMethod.Auto, null)));
    }

    public void Dispose() => _temp.Dispose();
}
