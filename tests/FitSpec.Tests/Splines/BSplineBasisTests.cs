using FitSpec.Design;

namespace FitSpec.Tests.Splines;

/// <summary>
/// The basis against laws that hold for every B-spline basis (partition of unity, non-negativity, local
/// support, Σ B_i' = Σ B_i'' = 0), against their definition evaluated independently, against the Bernstein
/// polynomials (a clamped basis with no inner knots is exactly Bernstein), and its derivatives against
/// central differences of its values.
/// </summary>
public sealed class BSplineBasisTests
{
    public static TheoryData<int, bool> Cases()
    {
        var data = new TheoryData<int, bool>();
        for (var d = 0; d <= 4; d++)
        {
            data.Add(d, false);
            data.Add(d, true);
        }

        return data;
    }

    private static BSplineBasis Make(int degree, bool uneven) => uneven
        ? new BSplineBasis([-2.0, -1.7, 0.0, 0.05, 1.3, 4.0, 4.5], degree)
        : new BSplineBasis(BSplineBasis.UniformBreakpoints(-2, 4.5, 7), degree);

    private static IEnumerable<double> Dense(BSplineBasis b, int count = 2001) =>
        Enumerable.Range(0, count).Select(k => k == count - 1 ? b.Upper : b.Lower + ((b.Upper - b.Lower) * k / (count - 1)));

    [Theory]
    [MemberData(nameof(Cases))]
    public void Sums_to_one_and_is_non_negative_on_the_knot_range(int degree, bool uneven)
    {
        var b = Make(degree, uneven);
        Assert.Equal(7 + degree - 1, b.Count);
        foreach (var x in Dense(b).Concat(b.Breakpoints))
        {
            var v = b.All(x);
            Assert.True(Math.Abs(v.Sum() - 1) <= 1e-14, $"degree {degree}, x = {x}: sum {v.Sum():R}");
            Assert.All(v, value => Assert.True(value >= 0, $"degree {degree}, x = {x}: {value}"));
        }
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Agrees_with_the_recursive_definition_and_is_zero_outside_each_support(int degree, bool uneven)
    {
        var b = Make(degree, uneven);
        var u = NaiveBSpline.ClampedKnots(b.Breakpoints, degree);
        foreach (var x in Dense(b, 997).Where(x => x < b.Upper))
        {
            var v = b.All(x);
            for (var i = 0; i < b.Count; i++)
            {
                Assert.Equal(NaiveBSpline.B(u, i, degree, x), v[i], 1e-13);
                var (from, to) = b.Support(i);
                if (x < from || x > to)
                {
                    Assert.Equal(0.0, v[i]);
                }
            }
        }
    }

    [Fact]
    public void Without_inner_knots_the_cubic_basis_is_Bernstein()
    {
        // On [a, b] with t = (x - a)/(b - a): B_i = C(3, i) t^i (1 - t)^(3 - i).
        var b = new BSplineBasis([2.0, 5.0], 3);
        double[] binomial = [1, 3, 3, 1];
        for (var k = 0; k <= 60; k++)
        {
            var x = 2 + (3.0 * k / 60);
            var t = (x - 2) / 3;
            var v = b.All(x);
            var d1 = b.All(x, 1);
            var d2 = b.All(x, 2);
            for (var i = 0; i <= 3; i++)
            {
                Assert.Equal(binomial[i] * Math.Pow(t, i) * Math.Pow(1 - t, 3 - i), v[i], 1e-15);
            }

            // Derivatives in x of the Bernstein form, written out: dt/dx = 1/3.
            double[] e1 = [-3 * (1 - t) * (1 - t), 3 * (1 - t) * (1 - (3 * t)), 3 * t * (2 - (3 * t)), 3 * t * t];
            double[] e2 = [6 * (1 - t), (18 * t) - 12, 6 - (18 * t), 6 * t];
            for (var i = 0; i <= 3; i++)
            {
                Assert.Equal(e1[i] / 3, d1[i], 1e-13);
                Assert.Equal(e2[i] / 9, d2[i], 1e-13);
            }
        }
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Derivatives_match_central_differences_and_sum_to_zero(int degree, bool uneven)
    {
        var b = Make(degree, uneven);

        // Away from knots, where the pieces join and a difference would straddle a kink.
        const double h = 1e-4;
        var points = Dense(b, 1501).Where(x => b.Breakpoints.All(t => Math.Abs(x - t) > 3 * h)).ToList();
        Assert.True(points.Count > 1000);
        foreach (var x in points)
        {
            var d1 = b.All(x, 1);
            var d2 = b.All(x, 2);
            var plus = b.All(x + h);
            var minus = b.All(x - h);
            var mid = b.All(x);
            var scale1 = Math.Max(1, d1.Max(Math.Abs));
            var scale2 = Math.Max(1, d2.Max(Math.Abs));
            for (var i = 0; i < b.Count; i++)
            {
                // Central differences: errors O(h²)·f''' and O(h²)·f'''' plus rounding ε/h and ε/h².
                var c1 = (plus[i] - minus[i]) / (2 * h);
                var c2 = (plus[i] - (2 * mid[i]) + minus[i]) / (h * h);
                Assert.True(Math.Abs(c1 - d1[i]) <= 1e-6 * scale1, $"degree {degree}, x = {x}, B{i}': {d1[i]} vs {c1}");
                Assert.True(Math.Abs(c2 - d2[i]) <= 1e-3 * scale2, $"degree {degree}, x = {x}, B{i}'': {d2[i]} vs {c2}");
            }

            Assert.True(Math.Abs(d1.Sum()) <= 1e-12 * scale1, $"degree {degree}, x = {x}: Σ B' = {d1.Sum()}");
            Assert.True(Math.Abs(d2.Sum()) <= 1e-12 * scale2, $"degree {degree}, x = {x}: Σ B'' = {d2.Sum()}");
            if (degree < 2)
            {
                Assert.All(d2, v => Assert.Equal(0.0, v));
            }
        }
    }

    [Fact]
    public void A_spline_term_of_an_expression_follows_the_chain_rule()
    {
        // B(g(x)) with g = log(x): d/dx = B'(g)/x, d²/dx² = B''(g)/x² - B'(g)/x².
        var b = new BSplineBasis([0.0, 0.5, 1.2, 2.0], 3);
        var g = new FitSpec.Expressions.Jet(Math.Log(3.0), 1 / 3.0, -1 / 9.0);
        var jets = SplineColumns.Jets(b, g);
        var v1 = b.All(Math.Log(3.0), 1);
        var v2 = b.All(Math.Log(3.0), 2);
        for (var i = 0; i < b.Count; i++)
        {
            Assert.Equal(v1[i] / 3, jets[i].D1, 1e-14);
            Assert.Equal((v2[i] / 9) - (v1[i] / 9), jets[i].D2, 1e-14);
        }
    }
}
