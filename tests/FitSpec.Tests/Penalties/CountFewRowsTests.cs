using System.Globalization;
using System.Text;
using FitSpec.Pipeline;

namespace FitSpec.Tests.Penalties;

/// <summary>
/// A count fit may have more candidate terms than rows: only the chosen support has to be determined. With a
/// 2-sparse truth and 8 rows of 12 Gaussian candidates (seeded), the exact MILP must find that support — the
/// law: any other 2-support leaves residuals far above the noise, so the l1 objective separates them.
/// </summary>
public sealed class CountFewRowsTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-count-few");

    [Fact]
    public void More_candidates_than_rows_selects_the_true_support()
    {
        var random = new Random(5);
        var csv = new StringBuilder("y," + string.Join(",", Enumerable.Range(1, 12).Select(j => $"c{j}")) + "\n");
        for (var i = 0; i < 8; i++)
        {
            var x = Enumerable.Range(0, 12).Select(_ => (random.NextDouble() * 2) - 1).ToArray();
            var y = (2 * x[2]) - (1.5 * x[7]) + ((random.NextDouble() - 0.5) * 1e-3);
            csv.Append(y.ToString("R", CultureInfo.InvariantCulture)).Append(',').AppendJoin(',', x.Select(v => v.ToString("R", CultureInfo.InvariantCulture))).Append('\n');
        }

        _temp.Write("few.csv", csv.ToString());
        var spec = _temp.Write("few.fit.yaml", "fitspec: 1\ndata: {path: few.csv}\nmodel: {response: y, terms: {c: {columns: \"c*\"}}}\nloss: l1\npenalties: [{kind: count, max: 2}]\nconstraints: [{kind: bounds, min: -5, max: 5}]\n");
        var result = FitRunner.Run(spec);
        Assert.True(result.Status == "optimal", $"{result.Status} {result.StatusDetail} {string.Join("; ", result.Errors.Select(e => e.Message))}");
        var support = result.Coefficients.Where(c => c.Value != 0).Select(c => c.Name).ToArray();
        Assert.Equal(["c3", "c8"], support);
    }

    public void Dispose() => _temp.Dispose();
}
