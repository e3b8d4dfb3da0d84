using FitSpec.Analysis;
using FitSpec.Pipeline;
using FitSpec.ReferenceTests.Support;
using FitSpec.Solving;
using FitSpec.Spec;
using Xunit.Abstractions;

namespace FitSpec.ReferenceTests;

/// <summary>
/// Case-resampling bootstrap on NIST StRD Norris (itl.nist.gov/div898/strd/lls, data and certified estimates in the
/// reference folder). Resampling (x, y) pairs estimates the heteroscedasticity-consistent (sandwich) covariance
/// (X'X)⁻¹ X' diag(e²) X (X'X)⁻¹ of the least-squares estimates (Efron and Tibshirani, An Introduction to the
/// Bootstrap, 1993, ch. 9 — from memory), computed here from the data and the certified estimates alone. With
/// 2000 replicates the two agree to within sampling error; 15% allowed (common practice for a check of this size).
/// </summary>
public sealed class BootstrapReferenceTests
{
    private readonly ITestOutputHelper _output;

    public BootstrapReferenceTests(ITestOutputHelper output) => _output = output;

    [ReferenceFact]
    public void Bootstrap_spread_matches_the_sandwich_standard_deviations_of_Norris()
    {
        var certified = ReferenceData.Json("strd-lls/Norris.json");
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("strd-lls/Norris.csv");
        var path = ws.WriteSpec("norris", $"fitspec: 1\nname: norris\ndata: {{path: {data}}}\nmodel:\n  response: y\n  terms: {{B0: 1, B1: x}}\nloss: l2\n");
        var fit = FitRunner.Lower(SpecReader.Read(path).Document!, false);
        var estimates = certified.GetProperty("parameters").EnumerateArray().Select(p => ReferenceData.Number(p.GetProperty("estimate"))).ToArray();
        var info = Bootstrap.Run(fit, estimates, new UncertaintySpec(2000, 20261201, 0.95, new SourcePos(path, 1, 1)), new SolveOptions(SolveMethod.Auto, null), default);
        Assert.Equal(2000, info.Succeeded);
        var sandwich = SandwichStdDevs(Path.Combine(ws.Folder, data), estimates[0], estimates[1]);
        var j = 0;
        foreach (var p in certified.GetProperty("parameters").EnumerateArray())
        {
            var sd = ReferenceData.Number(p.GetProperty("std_dev"));
            var interval = info.Intervals[j];
            _output.WriteLine($"{interval.Name}: bootstrap sd {interval.StdDev:G6}, sandwich {sandwich[j]:G6} (ratio {interval.StdDev / sandwich[j]:F3}), classical certified {sd:G6}; 95% interval [{interval.Low:G6}, {interval.High:G6}]");
            Assert.InRange(interval.StdDev / sandwich[j], 0.85, 1.15);
            Assert.InRange(interval.Value, interval.Low, interval.High);
            j++;
        }
    }

    /// <summary>Sandwich standard deviations of a straight-line fit, from the data file and the estimates.</summary>
    private static double[] SandwichStdDevs(string csv, double b0, double b1)
    {
        double s0 = 0, s1 = 0, s2 = 0, m00 = 0, m01 = 0, m11 = 0;
        foreach (var line in File.ReadLines(csv).Skip(1))
        {
            var f = line.Split(',');
            var y = double.Parse(f[0], System.Globalization.CultureInfo.InvariantCulture);
            var x = double.Parse(f[1], System.Globalization.CultureInfo.InvariantCulture);
            var e2 = Math.Pow(y - b0 - (b1 * x), 2);
            s0 += 1;
            s1 += x;
            s2 += x * x;
            m00 += e2;
            m01 += e2 * x;
            m11 += e2 * x * x;
        }

        // A⁻¹ for A = [[s0, s1], [s1, s2]], then the diagonal of A⁻¹ M A⁻¹.
        var det = (s0 * s2) - (s1 * s1);
        double i00 = s2 / det, i01 = -s1 / det, i11 = s0 / det;
        var v00 = (i00 * i00 * m00) + (2 * i00 * i01 * m01) + (i01 * i01 * m11);
        var v11 = (i01 * i01 * m00) + (2 * i01 * i11 * m01) + (i11 * i11 * m11);
        return [Math.Sqrt(v00), Math.Sqrt(v11)];
    }
}
