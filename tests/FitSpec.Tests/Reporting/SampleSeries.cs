using FitSpec.Results;

namespace FitSpec.Tests.Reporting;

/// <summary>
/// Made-up per-row series for plot and report tests (a straight line with a deterministic wiggle, and optional
/// planted outliers). The numbers check behaviour, not values, and have no source to name.
/// </summary>
internal static class SampleSeries
{
    public static ResidualSeries Line(int rows, string response = "reading_mv", string? input = "load_kg", bool curve = true, params int[] outliers)
    {
        var x = new double[rows];
        var observed = new double[rows];
        var fitted = new double[rows];
        var residuals = new double[rows];
        var lines = new int[rows];
        for (var i = 0; i < rows; i++)
        {
            x[i] = 500.0 * i / Math.Max(1, rows - 1);
            fitted[i] = 0.002 * x[i];
            residuals[i] = 0.001 * Math.Sin(1.7 * i) * Math.Cos(0.31 * i);
            observed[i] = fitted[i] + residuals[i];
            lines[i] = i + 2;
        }

        foreach (var k in outliers)
        {
            residuals[k] += 0.05 * (k % 2 == 0 ? 1 : -1);
            observed[k] = fitted[k] + residuals[k];
        }

        double[]? cx = null;
        double[]? cy = null;
        if (curve && input is not null)
        {
            cx = Enumerable.Range(0, 101).Select(k => 5.0 * k).ToArray();
            cy = cx.Select(v => 0.002 * v).ToArray();
        }

        return new ResidualSeries(response, input, input is null ? null : x, observed, fitted, residuals, lines, cx, cy);
    }

    public static LossCurve Huber(double width) => new(
        "huber",
        Enumerable.Range(0, 81).Select(k => -0.06 + (0.0015 * k)).ToArray(),
        Enumerable.Range(0, 81).Select(k =>
        {
            var r = Math.Abs(-0.06 + (0.0015 * k));
            return r <= width ? r * r : (2 * width * r) - (width * width);
        }).ToArray());

    /// <summary>The optimal sample with every diagnostic member filled in.</summary>
    public static FitResult Full(FitResult? basis = null, ResidualSeries? series = null)
    {
        var result = basis ?? SampleResults.Optimal();
        return result with
        {
            Series = series ?? Line(40, outliers: [7]),
            Guides = [new ResidualGuide("huber width", 0.004), new ResidualGuide("residual band", 0.06)],
            LossCurve = Huber(0.004),
            OutsideWidthLines = [9, 17, 23],
            Leverage = new LeverageSummary(0.075, 0.15, [new LeverageRow(1, 2, 0.1936), new LeverageRow(40, 41, 0.1412)]),
            DualReadings = [new DualReading("f(25) == 10000", -3.25, "raising the constant side of `f(25) == 10000` by 0.1 would raise the objective by about 0.325")],
            Ranging = new RangingInfo(
                [new BoundRange("f(25) == 10000", 10000, 9990.5, 10011.25, 1.17, 1.29)],
                [new CostRange("a1", -0.75, 2.5)],
                "ranging is valid while the basis is unchanged"),
            Uncertainty = new UncertaintyInfo(
                [new StandardError("a0", 9876.54321012345, 0.012345678, 800012.3456)],
                new BootstrapInfo(200, 20240611, 198, 0.95, [new BootstrapInterval("a0", 9876.54321012345, 9876.5, 9876.6, 0.0251234)], "2 replicates failed to solve and were left out")),
            Provenance = result.Provenance with
            {
                Commit = "0123456789abcdef0123456789abcdef01234567",
                CommandLine = "fitspec solve specs/thermistor.fit.yaml --out out",
                Stamp = "2024-06-11T08:30:00Z",
            },
        };
    }
}
