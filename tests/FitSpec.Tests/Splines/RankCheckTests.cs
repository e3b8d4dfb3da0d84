namespace FitSpec.Tests.Splines;

/// <summary>
/// The rank test names the coefficients of a dependency in the user's raw basis, and lets through exactly the
/// designs a quadratic penalty makes strictly convex.
/// </summary>
public sealed class RankCheckTests : IDisposable
{
    private readonly SplineWorkspace _ws = new();

    public RankCheckTests()
    {
        var x = Enumerable.Range(0, 30).Select(i => 1 + (0.3 * i)).ToArray();
        _ws.WriteXy(x, x.Select(v => Math.Log(v) + (0.01 * Math.Sin(7 * v))).ToArray());
    }

    public void Dispose() => _ws.Dispose();

    [Fact]
    public void A_column_repeated_inside_a_centred_polynomial_names_only_the_two_coefficients()
    {
        // Internally the polynomial is centred (x - c)/s, so θ-wise q = x depends on b0 and p1; in the raw
        // basis only p1·x and q·x cancel, and those two are the ones named.
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                p: {polynomial: x, degree: 2}
                q: x
            """);
        var error = Assert.Single(result.Errors);
        Assert.Contains("coefficients 'p1' and 'q' are linearly dependent", error.Message, StringComparison.Ordinal);
        Assert.Equal(8, error.Line);
    }

    [Fact]
    public void A_constant_and_two_nested_splines_give_one_error_per_dependent_column()
    {
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                s: {spline: x, knots: 4}
                u: {spline: x, knots: 2, degree: 1}
            """);

        // u1 and u2 are straight lines, which the cubic spline s already spans: with s6 (beside b0), three.
        Assert.Equal(3, result.Errors.Count);
        Assert.Contains("'u1'", result.Errors[1].Message, StringComparison.Ordinal);
        Assert.Contains("'u2'", result.Errors[2].Message, StringComparison.Ordinal);
        Assert.Contains("the spline basis of 's' sums to one, like the constant 'b0'", result.Errors[0].Message, StringComparison.Ordinal);
        Assert.All(result.Errors, e => Assert.Equal("model.terms", e.Field));
    }

    [Fact]
    public void A_loss_of_none_is_not_rank_tested()
    {
        // Only penalties and constraints count there; the data's rank says nothing about uniqueness.
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                s: {spline: x, knots: 4}
            loss: none
            penalties:
              - {kind: l2, weight: 1, on: [b0, s*]}
            constraints:
              - {kind: residuals, max-abs: 0.5}
            """);
        Assert.True(result.Status == "optimal", string.Join("; ", result.Errors.Select(e => e.Message)) + result.StatusDetail);
    }

    [Fact]
    public void Too_few_rows_for_the_coefficients_is_said_so()
    {
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv, filter: "x < 2"}
            model:
              response: y
              terms:
                s: {spline: x, knots: 4}
            """);
        var error = Assert.Single(result.Errors);
        Assert.Contains("4 rows cannot determine 6 coefficients", error.Message, StringComparison.Ordinal);
    }
}
