using System.Globalization;
using FitSpec.Results;
using static FitSpec.Tests.Penalties.TestMath;

namespace FitSpec.Tests.Penalties;

/// <summary>
/// The smoothness penalty λ Σ (Δ^k b)² against the normal equations (X'X + λ D'D) b = X'y, built and solved in
/// the test with its own difference matrix D and dense elimination; and the l1-norm variant against the law
/// that a large enough weight makes the differences vanish exactly (an exact penalty), so the fit equals the
/// fit of the model with those coefficients tied by hand.
/// </summary>
public sealed class SmoothnessPenaltyTests
{
    private const int Rows = 25;
    private const int Columns = 6;

    // The closed form (QR) and the QP solve well-conditioned 7-coefficient problems to about 1e-12 relative;
    // the normal equations here lose a few digits more. 1e-8 relative leaves room for both.
    private const double Tolerance = 1e-8;

    private static string WriteData(PenaltyWorkspace ws)
    {
        // Test input from a fixed seed: a1..a6 uniform on [0, 1], y a smooth profile of them plus noise.
        var random = new Random(5150);
        var rows = new List<double[]>();
        for (var i = 0; i < Rows; i++)
        {
            var a = Enumerable.Range(0, Columns).Select(_ => random.NextDouble()).ToArray();
            var y = 1 + a.Select((v, j) => v * (0.5 + (0.3 * j) - (0.04 * j * j))).Sum() + (0.3 * (random.NextDouble() - 0.5));
            rows.Add([.. a, y]);
        }

        return ws.WriteCsv("smooth.csv", [.. Enumerable.Range(1, Columns).Select(j => $"a{j}"), "y"], rows);
    }

    private static double[][] ReadRows(PenaltyWorkspace ws, string data) =>
        File.ReadAllLines(Path.Combine(ws.Folder, data)).Skip(1)
            .Select(l => l.Split(',').Select(v => double.Parse(v, CultureInfo.InvariantCulture)).ToArray()).ToArray();

    private static string Spec(string data, string loss, string penalty, string terms = "    a: {columns: \"a*\"}", string constraints = "") => $"""
        fitspec: 1
        name: smooth-test
        data:
          path: {data}
        model:
          response: y
          terms:
            c0: 1
        {terms}
        loss: {loss}
        penalties:
          - {penalty}
        {constraints}
        report:
          formats: [json]
        """;

    /// <summary>The k-th difference matrix over m coefficients, from its definition Δ^k = Δ(Δ^(k-1)), (Δb)_i = b_(i+1) − b_i.</summary>
    private static double[,] DifferenceMatrix(int m, int k)
    {
        var d = new double[m, m];
        for (var i = 0; i < m; i++)
        {
            d[i, i] = 1;
        }

        var rows = m;
        for (var step = 0; step < k; step++)
        {
            var next = new double[rows - 1, m];
            for (var i = 0; i < rows - 1; i++)
            {
                for (var j = 0; j < m; j++)
                {
                    next[i, j] = d[i + 1, j] - d[i, j];
                }
            }

            d = next;
            rows--;
        }

        return d;
    }

    /// <summary>λ D'D placed on coefficients first..first+m-1 of a p × p matrix.</summary>
    private static double[,] Penalty(int p, int first, int m, int k, double lambda)
    {
        var d = DifferenceMatrix(m, k);
        var result = new double[p, p];
        for (var a = 0; a < m; a++)
        {
            for (var c = 0; c < m; c++)
            {
                double s = 0;
                for (var i = 0; i < d.GetLength(0); i++)
                {
                    s += d[i, a] * d[i, c];
                }

                result[first + a, first + c] = lambda * s;
            }
        }

        return result;
    }

    private static void AssertClose(double expected, double actual, string what) =>
        Assert.True(Math.Abs(actual - expected) <= Tolerance * Math.Max(1, Math.Abs(expected)), $"{what}: {actual} vs normal equations {expected}");

    [Theory]
    [InlineData(1, 3.0, "")]
    [InlineData(2, 3.0, "")]
    [InlineData(1, 0.7, "constraints:\n  - \"a1 <= 1000\"")]
    [InlineData(2, 40.0, "constraints:\n  - \"a1 <= 1000\"")]
    public void Squared_differences_equal_the_penalised_normal_equations(int order, double lambda, string constraints)
    {
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        var rows = ReadRows(ws, data);
        var y = rows.Select(r => r[Columns]).ToArray();
        var columns = new List<double[]> { Enumerable.Repeat(1.0, Rows).ToArray() };
        columns.AddRange(Enumerable.Range(0, Columns).Select(j => rows.Select(r => r[j]).ToArray()));
        // The default on: skips the constant c0, so the differences run over a1..a6 (coefficients 1..6).
        var expected = LeastSquares(columns, y, Penalty(Columns + 1, 1, Columns, order, lambda));

        var result = ws.Run(Spec(data, "l2", $"{{kind: smoothness, order: {order}, weight: {lambda.ToString(CultureInfo.InvariantCulture)}}}", constraints: constraints));
        Assert.Equal("optimal", result.Status);
        Assert.True(result.Verification!.Passed, string.Join("; ", result.Verification.Failures));
        // Without constraints the squared smoothness joins the closed form as ridge rows; a constraint (inactive
        // here) sends it to the QP, which must give the same answer.
        Assert.Equal(constraints.Length == 0 ? "closed-form" : "QP", result.Problem!.Class);
        AssertClose(expected[0], Coefficient(result, "c0"), "c0");
        for (var j = 0; j < Columns; j++)
        {
            AssertClose(expected[j + 1], Coefficient(result, $"a{j + 1}"), $"a{j + 1}");
        }
    }

    [Theory]
    [InlineData(1, "")]
    [InlineData(2, "")]
    [InlineData(2, "constraints:\n  - \"p1 <= 1000\"")]
    public void Differences_are_of_the_raw_polynomial_coefficients(int order, string constraints)
    {
        // The tool fits polynomials in a centred, scaled basis internally (β = Mθ); the penalty must still act on the
        // user's raw coefficients p1..p4 of x, x², x³, x⁴.
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        var rows = ReadRows(ws, data);
        var y = rows.Select(r => r[Columns]).ToArray();
        var x = rows.Select(r => r[0]).ToArray();
        var columns = new List<double[]> { Enumerable.Repeat(1.0, Rows).ToArray() };
        columns.AddRange(Enumerable.Range(1, 4).Select(d => x.Select(v => Math.Pow(v, d)).ToArray()));
        const double lambda = 2.5;
        var expected = LeastSquares(columns, y, Penalty(5, 1, 4, order, lambda));

        var result = ws.Run(Spec(data, "l2", $"{{kind: smoothness, order: {order}, weight: 2.5, on: [\"p*\"]}}", "    p: {polynomial: a1, degree: 4}", constraints));
        Assert.Equal("optimal", result.Status);
        Assert.True(result.Verification!.Passed, string.Join("; ", result.Verification.Failures));
        AssertClose(expected[0], Coefficient(result, "c0"), "c0");
        for (var d = 1; d <= 4; d++)
        {
            AssertClose(expected[d], Coefficient(result, $"p{d}"), $"p{d}");
        }
    }

    [Theory]
    [InlineData("l1")]
    [InlineData("l2")]
    public void L1_norm_with_a_large_weight_ties_adjacent_coefficients(string loss)
    {
        // Order 1: Σ|a_(j+1) − a_j| with λ far above any price the data can pay forces a1 = … = a6 = b, so the fit
        // is that of y ~ c0 + b·(a1 + … + a6), run here as its own spec without the penalty.
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        var penalised = ws.Run(Spec(data, loss, "{kind: smoothness, order: 1, weight: 1.0e6, norm: l1}"));
        var tied = ws.Run(Spec(data, loss, "{kind: l2, weight: 0}", "    b: a1 + a2 + a3 + a4 + a5 + a6"));
        Assert.Equal("optimal", penalised.Status);
        Assert.True(penalised.Verification!.Passed, string.Join("; ", penalised.Verification.Failures));
        var b = Coefficient(tied, "b");
        for (var j = 1; j <= Columns; j++)
        {
            Assert.True(Math.Abs(Coefficient(penalised, $"a{j}") - b) <= 1e-6 * Math.Max(1, Math.Abs(b)), $"a{j} = {Coefficient(penalised, $"a{j}")}, tied fit b = {b}");
        }

        Assert.True(Math.Abs(penalised.Objective!.Value - tied.Objective!.Value) <= 1e-6 * tied.Objective.Value, $"objective {penalised.Objective} vs tied {tied.Objective}");
    }

    [Fact]
    public void L1_norm_of_second_differences_with_a_large_weight_gives_a_linear_sequence()
    {
        // Order 2: every second difference vanishes, so a_j = u + v·j: the fit of y ~ c0 + u·Σ a_j + v·Σ j·a_j.
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        var penalised = ws.Run(Spec(data, "l1", "{kind: smoothness, order: 2, weight: 1.0e6, norm: l1}"));
        var linear = ws.Run(Spec(data, "l1", "{kind: l2, weight: 0}", "    u: a1 + a2 + a3 + a4 + a5 + a6\n    v: a1 + 2*a2 + 3*a3 + 4*a4 + 5*a5 + 6*a6"));
        Assert.Equal("optimal", penalised.Status);
        var u = Coefficient(linear, "u");
        var v = Coefficient(linear, "v");
        for (var j = 1; j <= Columns; j++)
        {
            var expected = u + (v * j);
            Assert.True(Math.Abs(Coefficient(penalised, $"a{j}") - expected) <= 1e-6 * Math.Max(1, Math.Abs(expected)), $"a{j} = {Coefficient(penalised, $"a{j}")}, expected {expected}");
        }

        Assert.True(Math.Abs(penalised.Objective!.Value - linear.Objective!.Value) <= 1e-6 * linear.Objective.Value);
    }

    [Fact]
    public void L1_norm_objective_is_the_loss_plus_lambda_times_absolute_differences()
    {
        // A moderate weight: the reported objective (recomputed by the verifier) must be Σ|e| + λ Σ|Δ²a|, computed
        // here from the reported coefficients and the data.
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        var rows = ReadRows(ws, data);
        var result = ws.Run(Spec(data, "l1", "{kind: smoothness, order: 2, weight: 0.05, norm: l1}"));
        Assert.Equal("optimal", result.Status);
        Assert.True(result.Verification!.Passed, string.Join("; ", result.Verification.Failures));
        var a = Enumerable.Range(1, Columns).Select(j => Coefficient(result, $"a{j}")).ToArray();
        var c0 = Coefficient(result, "c0");
        var loss = rows.Sum(r => Math.Abs(r[Columns] - c0 - a.Select((v, j) => v * r[j]).Sum()));
        var penalty = 0.05 * Enumerable.Range(0, Columns - 2).Sum(i => Math.Abs(a[i + 2] - (2 * a[i + 1]) + a[i]));
        Assert.True(Math.Abs(result.Objective!.Value - (loss + penalty)) <= 1e-9 * (loss + penalty));
    }

    [Fact]
    public void Too_few_coefficients_for_the_order_is_an_error()
    {
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        var result = ws.Run(Spec(data, "l2", "{kind: smoothness, order: 3, weight: 1, on: [a1, a2, a3]}"));
        Assert.Equal("error", result.Status);
        var error = Assert.Single(result.Errors);
        Assert.Contains("smoothness of order 3 needs at least 4 coefficients", error.Message, StringComparison.Ordinal);
        Assert.Contains("a1, a2, a3", error.Message, StringComparison.Ordinal);
    }
}
