using System.Globalization;
using System.Text;
using FitSpec.Pipeline;

namespace FitSpec.Tests.Solving;

/// <summary>
/// QPs that HiGHS's QP solver fails on when given every row at once (a residual band beside an l1-type
/// loss and a quadratic penalty); they must still solve, and pass their own verification.
/// </summary>
public sealed class QpRobustnessTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-qp");

    [Theory]
    [InlineData("{kind: quantile, tau: 0.5}", "{kind: l2, weight: 1.0e-4, on: [t*]}")]
    [InlineData("l1", "{kind: l2, weight: 0.5}")]
    public void Residual_band_with_a_quadratic_penalty_solves_and_verifies(string loss, string penalty)
    {
        var random = new Random(1);
        var csv = new StringBuilder("load_kg,temp_c,reading_mv\n");
        for (var i = 0; i < 30; i++)
        {
            var load = i * 10.0;
            var temp = 20 + (random.NextDouble() * 5);
            var reading = 0.5 + (0.04 * load) - (1e-5 * load * load) + (0.01 * temp) + ((random.NextDouble() - 0.5) * 0.02);
            csv.Append(CultureInfo.InvariantCulture, $"{load},{temp:R},{reading:R}\n");
        }

        File.WriteAllText(Path.Combine(_temp.Path, "d.csv"), csv.ToString());
        var spec = Path.Combine(_temp.Path, "band.fit.yaml");
        File.WriteAllText(spec, $"""
            fitspec: 1
            data: {"{"}path: d.csv{"}"}
            model:
              response: reading_mv
              terms:
                b0: 1
                b1: load_kg
                b2: load_kg^2
                t: {"{"}polynomial: temp_c, degree: 2{"}"}
            loss: {loss}
            penalties:
              - {penalty}
            constraints:
              - "b1 >= 0"
              - {"{"}kind: residuals, max-abs: 0.5{"}"}
            """);
        var result = FitRunner.Run(spec);
        Assert.True(result.Status == "optimal", $"{result.Status}: {result.StatusDetail}");
        Assert.True(result.Verification!.Passed);
        Assert.True(result.Verification.DualityGap <= 1e-9, $"gap {result.Verification.DualityGap}");
    }

    public void Dispose() => _temp.Dispose();
}
