using System.Globalization;
using System.Text;
using FitSpec.Pipeline;
using FitSpec.Results;

namespace FitSpec.Tests.Properties;

/// <summary>
/// Laws every fit must obey, whatever the data (the data here is seeded noise): invariance of l1/quantile
/// fits to pushing an observation further out along its residual (its sign, not its size, enters the
/// optimality conditions), homogeneity under scaling of y, and that a constraint inactive at the
/// unconstrained optimum changes nothing.
/// </summary>
public sealed class FitLawTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-law");

    [Theory]
    [InlineData("l1")]
    [InlineData("{kind: quantile, tau: 0.3}")]
    [InlineData("{kind: quantile, tau: 0.8}")]
    public void Moving_an_observation_further_along_its_residual_leaves_the_fit_unchanged(string loss)
    {
        var (x, y) = Data(60, seed: 3);
        var before = Fit("before", x, y, loss);
        var fitted = Fitted(before, x);
        var i = Enumerable.Range(0, y.Length).OrderByDescending(k => Math.Abs(y[k] - fitted[k])).First();
        var moved = (double[])y.Clone();
        moved[i] += 25 * Math.Sign(y[i] - fitted[i]);
        var after = Fit("after", x, moved, loss);
        AssertClose(before, after, 1e-9);
    }

    [Theory]
    [InlineData("l2")]
    [InlineData("l1")]
    [InlineData("{kind: quantile, tau: 0.7}")]
    [InlineData("linf")]
    [InlineData("{kind: lp, p: 1.5}")]
    public void Scaling_y_scales_every_coefficient(string loss)
    {
        var (x, y) = Data(40, seed: 5);
        const double c = 3.5; // positive: a negative factor swaps tau and 1 - tau for quantile losses
        var plain = Fit("plain", x, y, loss);
        var scaled = Fit("scaled", x, y.Select(v => c * v).ToArray(), loss);
        for (var j = 0; j < plain.Coefficients.Count; j++)
        {
            Assert.Equal(c * plain.Coefficients[j].Value, scaled.Coefficients[j].Value, 1e-7 * Math.Max(1, Math.Abs(c * plain.Coefficients[j].Value)));
        }
    }

    [Theory]
    [InlineData("l2")]
    [InlineData("l1")]
    [InlineData("linf")]
    public void A_constraint_inactive_at_the_unconstrained_optimum_changes_nothing(string loss)
    {
        var (x, y) = Data(50, seed: 9);
        var free = Fit("free", x, y, loss);
        var b1 = free.Coefficients[1].Value;
        var bounded = Fit("bounded", x, y, loss, $"constraints:\n  - \"b1 <= {(b1 + 1).ToString("R", CultureInfo.InvariantCulture)}\"\n");
        AssertClose(free, bounded, 1e-8);
        Assert.False(bounded.Constraints[0].Active);
        Assert.Equal(0.0, bounded.Constraints[0].Dual);
    }

    private static (double[] X, double[] Y) Data(int n, int seed)
    {
        var random = new Random(seed);
        var x = new double[n];
        var y = new double[n];
        for (var i = 0; i < n; i++)
        {
            x[i] = random.NextDouble() * 10;
            y[i] = 2 + (0.7 * x[i]) - (0.03 * x[i] * x[i]) + ((random.NextDouble() - 0.5) * 2);
        }

        return (x, y);
    }

    private FitResult Fit(string name, double[] x, double[] y, string loss, string extra = "")
    {
        var csv = new StringBuilder("x,y\n");
        for (var i = 0; i < x.Length; i++)
        {
            csv.Append(CultureInfo.InvariantCulture, $"{x[i]:R},{y[i]:R}\n");
        }

        File.WriteAllText(Path.Combine(_temp.Path, name + ".csv"), csv.ToString());
        var spec = Path.Combine(_temp.Path, name + ".fit.yaml");
        File.WriteAllText(spec, $"fitspec: 1\nname: {name}\ndata: {{path: {name}.csv}}\nmodel:\n  response: y\n  terms: {{b0: 1, b1: x, b2: x^2}}\nloss: {loss}\n{extra}");
        var result = FitRunner.Run(spec);
        Assert.True(result.Status == "optimal", $"{name}: {result.Status} {result.StatusDetail} {string.Join("; ", result.Errors.Select(e => e.Message))}");
        return result;
    }

    private static double[] Fitted(FitResult r, double[] x) =>
        x.Select(v => r.Coefficients[0].Value + (r.Coefficients[1].Value * v) + (r.Coefficients[2].Value * v * v)).ToArray();

    private static void AssertClose(FitResult a, FitResult b, double tolerance)
    {
        for (var j = 0; j < a.Coefficients.Count; j++)
        {
            Assert.Equal(a.Coefficients[j].Value, b.Coefficients[j].Value, tolerance * Math.Max(1, Math.Abs(a.Coefficients[j].Value)));
        }
    }

    public void Dispose() => _temp.Dispose();
}
