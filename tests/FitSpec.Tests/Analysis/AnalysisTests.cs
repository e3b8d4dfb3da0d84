using FitSpec.Analysis;
using FitSpec.Pipeline;
using FitSpec.Solving;
using FitSpec.Spec;

namespace FitSpec.Tests.Analysis;

/// <summary>
/// Laws the diagnostics must obey (behaviour, not reference numbers): leverages sum to p, a dual sentence
/// predicts a re-solve with the constant moved, ranging agrees with the dual, the bootstrap is the same for
/// any thread count, and the two standard-error paths agree.
/// </summary>
public sealed class AnalysisTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-analysis");

    public AnalysisTests()
    {
        // Invented readings of a sensor with a slight curvature and one bad reading (row 7).
        _temp.Write("d.csv", "x,y\n0,0.02\n1,1.11\n2,2.05\n3,3.21\n4,4.18\n5,5.33\n6,9.00\n7,7.52\n8,8.49\n9,9.71\n10,10.83\n");
    }

    private string Spec(string name, string body)
    {
        var path = Path.Combine(_temp.Path, name + ".fit.yaml");
        File.WriteAllText(path, $"fitspec: 1\nname: {name}\ndata: {{path: d.csv}}\nmodel:\n  response: y\n{body}");
        return path;
    }

    [Fact]
    public void Leverages_lie_in_0_1_and_sum_to_the_number_of_coefficients()
    {
        var fit = FitRunner.Lower(SpecReader.Read(Spec("lev", "  terms: {b0: 1, b: {polynomial: x, degree: 2}}\nloss: l2\n")).Document!, false);
        var lev = LeverageCalculator.Compute(fit.Design)!;
        Assert.Equal(3.0 / 11, lev.Mean, 12);
        Assert.All(lev.Highest, h => Assert.InRange(h.Value, 0, 1));
        // The ends of a quadratic fit on an even grid carry the most leverage.
        Assert.Contains(lev.Highest.Take(2), h => h.Line == 2);
        Assert.Contains(lev.Highest.Take(2), h => h.Line == 12);
        var all = LeverageCalculator.Values(fit.Design)!;
        Assert.Equal(3.0, all.Sum(), 10);
    }

    [Theory]
    [InlineData("l2", "b1 <= 1.0")]
    [InlineData("l1", "b1 <= 1.0")]
    [InlineData("l1", "b0 >= 0.1")]
    public void A_dual_sentence_predicts_the_objective_after_relaxing_the_constraint(string loss, string rule)
    {
        var before = FitRunner.Run(Spec("d0", $"  terms: {{b0: 1, b1: x}}\nloss: {loss}\nconstraints:\n  - \"{rule}\"\n"));
        var reading = Assert.Single(before.DualReadings);
        Assert.Contains($"`{rule}`", reading.Sentence, StringComparison.Ordinal);
        var op = rule.Contains("<=", StringComparison.Ordinal) ? "<=" : ">=";
        var parts = rule.Split(op);
        var bound = double.Parse(parts[1], System.Globalization.CultureInfo.InvariantCulture);
        var range = before.Ranging?.Constraints.SingleOrDefault();
        var step = DualSentences.StepFor(bound, range);
        Assert.Contains($" by {step.ToString("G3", System.Globalization.CultureInfo.InvariantCulture)} ", reading.Sentence, StringComparison.Ordinal);
        var relaxed = op == "<=" ? bound + step : bound - step;
        var after = FitRunner.Run(Spec("d1", $"  terms: {{b0: 1, b1: x}}\nloss: {loss}\nconstraints:\n  - \"{parts[0].Trim()} {op} {relaxed.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}\"\n"));
        var predicted = reading.Dual * step;
        var actual = before.Objective!.Value - after.Objective!.Value;
        Assert.True(actual > 0, $"relaxing must lower the objective: {actual}");
        // Exact for an LP inside the ranging interval; first order (plus a small quadratic term) for l2.
        Assert.True(Math.Abs(actual - predicted) <= 0.1 * Math.Abs(predicted) + 1e-9, $"predicted {predicted}, actual {actual}");
    }

    [Fact]
    public void Lp_ranging_of_an_active_row_agrees_with_its_dual()
    {
        var r = FitRunner.Run(Spec("rg", "  terms: {b0: 1, b1: x}\nloss: l1\nconstraints:\n  - \"b1 <= 1.0\"\n"));
        var dual = Assert.Single(r.DualReadings).Dual;
        var range = Assert.Single(r.Ranging!.Constraints);
        Assert.Equal(1.0, range.Value, 12);
        Assert.True(range.Low <= 1.0 && range.High >= 1.0);
        // Moving the bound up to the top of its range lowers the objective at the dual's rate (LP: linear there).
        if (double.IsFinite(range.High))
        {
            Assert.Equal(r.Objective!.Value - (dual * (range.High - 1.0)), range.ObjectiveAtHigh, 8);
        }
    }

    [Fact]
    public void Bootstrap_intervals_are_the_same_for_any_thread_count()
    {
        var fit = FitRunner.Lower(SpecReader.Read(Spec("bs", "  terms: {b0: 1, b1: x}\nloss: l1\n")).Document!, false);
        var options = new SolveOptions(SolveMethod.Auto, null);
        var beta = new double[] { 0, 1 };
        var request = new UncertaintySpec(200, 42, 0.9, new SourcePos("x", 1, 1));
        var one = Bootstrap.Run(fit, beta, request, options, default, threads: 1);
        var four = Bootstrap.Run(fit, beta, request, options, default, threads: 4);
        Assert.Equal(200, one.Succeeded);
        Assert.Equal(one.Intervals, four.Intervals);
        var other = Bootstrap.Run(fit, beta, request with { Seed = 43 }, options, default, threads: 2);
        Assert.NotEqual(one.Intervals, other.Intervals);
        Assert.All(one.Intervals, i => Assert.True(i.Low <= i.High));
    }

    [Fact]
    public void Draws_cover_every_row_evenly()
    {
        var counts = new int[10];
        foreach (var i in Bootstrap.Draw(100_000, 7, 3))
        {
            counts[i / 10_000]++;
        }

        Assert.All(counts, c => Assert.InRange(c, 9_500, 10_500));
        Assert.Equal(Bootstrap.Draw(50, 7, 3), Bootstrap.Draw(50, 7, 3));
        Assert.NotEqual(Bootstrap.Draw(50, 7, 3), Bootstrap.Draw(50, 7, 4));
    }

    [Fact]
    public void Standard_errors_in_double_double_and_from_the_internal_basis_agree()
    {
        var fit = FitRunner.Lower(SpecReader.Read(Spec("se", "  terms: {b0: 1, b: {polynomial: x, degree: 2}}\nloss: l2\n")).Document!, false);
        var beta = new double[] { 0.1, 1, 0.01 };
        var dd = ClassicalErrors.Compute(fit.Design, beta, 0.5)!;
        var plain = ClassicalErrors.InternalRowNorms(fit.Design)!.Select(v => 0.5 * v).ToArray();
        for (var j = 0; j < 3; j++)
        {
            Assert.Equal(dd[j].StdError, plain[j], 1e-9 * dd[j].StdError);
        }
    }

    public void Dispose() => _temp.Dispose();
}
