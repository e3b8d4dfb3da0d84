using System.Globalization;
using System.Text;
using FitSpec.Analysis.Conflicts;
using FitSpec.Lowering;
using FitSpec.Reporting;
using FitSpec.Results;
using FitSpec.Spec;
using FitSpec.Tests.Penalties;

namespace FitSpec.Tests.Conflicts;

/// <summary>
/// Fits without a solution say why in the user's terms: the smallest conflicting set of their own constraint
/// labels, a free direction, or a time limit with the best point marked as such. The expected sets follow from
/// the constraints' arithmetic (stated beside each case); the data only has to be there.
/// </summary>
public sealed class NoSolutionTests : IDisposable
{
    private readonly PenaltyWorkspace _ws = new();

    public NoSolutionTests() => _ws.WriteCsv("line.csv", ["x", "y"], Enumerable.Range(0, 12).Select(i => new[] { i * 0.5, 1 + (0.8 * i) + (i % 3 == 0 ? 0.3 : -0.2) }));

    public void Dispose() => _ws.Dispose();

    private static string Spec(string loss, params string[] constraints)
    {
        var text = new StringBuilder("""
            fitspec: 1
            name: conflict
            data: {path: line.csv}
            model:
              response: y
              terms: {b0: "1", b1: x, b2: x^2}
            """);
        text.Append(CultureInfo.InvariantCulture, $"\nloss: {loss}\nconstraints:\n");
        foreach (var c in constraints)
        {
            text.Append(CultureInfo.InvariantCulture, $"  - {c}\n");
        }

        return text.ToString();
    }

    [Theory]
    [InlineData("l1")]
    [InlineData("l2")]
    [InlineData("linf")]
    public void Contradictory_relations_and_bounds_name_exactly_the_conflicting_labels(string loss)
    {
        // b1 ≥ 2 and b2 ≥ 0 force b1 + b2 ≥ 2 > 1.5; b0 ≥ 0 and the wide residual band take no part.
        var result = _ws.Run(Spec(loss, "\"b1 >= 2\"", "\"b0 >= 0\"", "{kind: bounds, on: [b2], min: 0, max: 1}", "\"b1 + b2 <= 1.5\"", "{kind: residuals, max-abs: 100}"));
        Assert.Equal("infeasible", result.Status);
        Assert.Equal(3, result.ExitCode);
        var conflict = Assert.IsType<ConflictInfo>(result.Conflict);
        Assert.Equal(["b1 >= 2", "0 <= b2 <= 1", "b1 + b2 <= 1.5"], conflict.Labels);
        Assert.True(conflict.Irreducible);
        Assert.Contains("'b1 >= 2', '0 <= b2 <= 1', 'b1 + b2 <= 1.5' cannot all hold", result.StatusDetail, StringComparison.Ordinal);
    }

    [Fact]
    public void Two_plain_contradictions_give_the_pair_and_leave_the_rest_out()
    {
        var result = _ws.Run(Spec("l1", "\"b0 <= 10\"", "\"b1 >= 2\"", "\"b1 <= 1\"", "\"b2 >= -1\""));
        Assert.Equal(["b1 >= 2", "b1 <= 1"], result.Conflict!.Labels);
        Assert.True(result.Conflict.Irreducible);
    }

    [Fact]
    public void A_residual_band_tighter_than_the_data_allows_conflicts_with_a_shape_on_its_own_rows()
    {
        // y rises by about 0.8 per unit of x; a decreasing curve cannot stay within 0.05 of it. Without the
        // shape the band alone can hold (a quadratic within 0.3 of the points), and without the band any
        // decreasing curve does: both are needed.
        var result = _ws.Run(Spec("l1", "{kind: decreasing, in: x, over: [0, 5.5]}", "{kind: residuals, max-abs: 0.5}", "\"b0 >= -100\""));
        Assert.Equal("infeasible", result.Status);
        Assert.Equal(2, result.Conflict!.Labels.Count);
        Assert.DoesNotContain("b0 >= -100", result.Conflict.Labels);
        Assert.True(result.Conflict.Irreducible);
    }

    [Fact]
    public void The_conflict_is_in_the_result_file_and_both_reports()
    {
        var result = _ws.Run(Spec("l1", "\"b1 >= 2\"", "\"b1 <= 1\""));
        var json = ResultJson.Write(result);
        Assert.Contains("\"conflict\": {", json, StringComparison.Ordinal);
        Assert.Contains("\"b1 >= 2\"", json, StringComparison.Ordinal);
        Assert.Contains("\"irreducible\": true", json, StringComparison.Ordinal);
        var md = ReportRenderer.Render(result, ReportFormat.Md);
        Assert.Contains("## Conflicting constraints", md, StringComparison.Ordinal);
        Assert.Contains("- `b1 <= 1`", md, StringComparison.Ordinal);
        var html = ReportRenderer.Render(result, ReportFormat.Html);
        Assert.Contains("<li><code>b1 &gt;= 2</code></li>", html, StringComparison.Ordinal);
    }

    [Fact]
    public void A_time_limit_on_a_hard_count_fit_returns_the_best_point_marked_as_not_proven()
    {
        // 40 candidate columns, at most 6 non-zero: the branch and bound cannot finish in a tenth of a second.
        var random = new Random(7);
        var header = Enumerable.Range(0, 40).Select(j => $"x{j}").Append("y").ToList();
        _ws.WriteCsv("wide.csv", header, Enumerable.Range(0, 60).Select(_ =>
        {
            var x = Enumerable.Range(0, 40).Select(_ => random.NextDouble() - 0.5).ToArray();
            return x.Append(x.Select((v, j) => v * ((j % 7) - 3)).Sum() + random.NextDouble() - 0.5).ToArray();
        }));
        var result = _ws.Run("""
            fitspec: 1
            name: wide
            data: {path: wide.csv}
            model:
              response: y
              terms: {x: {columns: "x*"}}
            loss: l1
            penalties:
              - {kind: count, max: 6}
            constraints:
              - {kind: bounds, min: -5, max: 5}
            solve: {time-limit: 0.1}
            """);
        Assert.True(result.Status == "time-limit", $"{result.Status}: {result.StatusDetail}");
        Assert.Equal(3, result.ExitCode);
        if (result.Coefficients.Count == 0)
        {
            // A loaded machine may stop before the first incumbent: then no point, and the detail says so.
            Assert.Contains("before any feasible point was found", result.StatusDetail, StringComparison.Ordinal);
        }
        else
        {
            Assert.Contains("not a proven optimum", result.StatusDetail, StringComparison.Ordinal);
            // The best point is reported, verified, and keeps the count limit.
            Assert.True(result.Verification!.Passed);
            Assert.True(result.Coefficients.Count(c => c.Value != 0) <= 6);
            Assert.True(result.Problem!.MipGap > 0);
        }
    }

    [Fact]
    public void A_free_direction_is_found_and_a_bounded_program_has_none()
    {
        // min -x0 subject to x0 - x1 <= 5: moving both up by the same amount keeps the row and lowers the cost.
        var free = Program([-1, 0], [(0, 0, 1), (0, 1, -1)], [double.NegativeInfinity], [5]);
        var d = DirectionFinder.Find(free);
        Assert.NotNull(d);
        Assert.Equal(1, d![0], 12);
        Assert.Equal(1, d[1], 12);

        // With x1 <= 3 as well, x0 <= 8: no direction.
        var bounded = Program([-1, 0], [(0, 0, 1), (0, 1, -1)], [double.NegativeInfinity], [5]) with { Upper = [double.PositiveInfinity, 3] };
        Assert.Null(DirectionFinder.Find(bounded));
    }

    [Fact]
    public void Curvature_closes_a_direction_only_where_it_acts()
    {
        // min ½·2·x1² - x0: x0 is free of curvature and falls for ever; min ½·2·x0² - x0 has its minimum at 0.5.
        var linearInX0 = Program([-1, 0], [], [], []) with { QStart = [0, 0, 1], QIndex = [1], QValue = [2] };
        var d = DirectionFinder.Find(linearInX0);
        Assert.NotNull(d);
        Assert.Equal(1, d![0], 12);
        Assert.Equal(0, d[1], 12);
        var curved = Program([-1, 0], [], [], []) with { QStart = [0, 1, 1], QIndex = [0], QValue = [2] };
        Assert.Null(DirectionFinder.Find(curved));
    }

    private static FitProgram Program(double[] cost, (int Row, int Col, double Value)[] entries, double[] rowLower, double[] rowUpper)
    {
        var n = cost.Length;
        var start = new int[n + 1];
        var index = new List<int>();
        var values = new List<double>();
        for (var j = 0; j < n; j++)
        {
            foreach (var e in entries.Where(e => e.Col == j))
            {
                index.Add(e.Row);
                values.Add(e.Value);
            }

            start[j + 1] = index.Count;
        }

        return new FitProgram(
            n, Enumerable.Range(0, n).Select(j => $"x{j}").ToArray(), cost,
            Enumerable.Repeat(double.NegativeInfinity, n).ToArray(), Enumerable.Repeat(double.PositiveInfinity, n).ToArray(),
            new bool[n], Enumerable.Range(0, n).Select(j => new Origin(OriginKind.Coefficient, j)).ToArray(),
            rowLower.Select((_, i) => $"r{i}").ToArray(), rowLower, rowUpper,
            rowLower.Select((_, i) => new Origin(OriginKind.Constraint, i)).ToArray(),
            start, [.. index], [.. values], [0], [], [], 0);
    }
}
