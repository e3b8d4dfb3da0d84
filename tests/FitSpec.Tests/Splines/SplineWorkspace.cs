using System.Globalization;
using FitSpec.Pipeline;
using FitSpec.Results;

namespace FitSpec.Tests.Splines;

/// <summary>A temporary folder for a data file and specs, each run through the whole pipeline (FitRunner.Run).</summary>
public sealed class SplineWorkspace : IDisposable
{
    private int _specs;

    public SplineWorkspace()
    {
        Folder = Path.Combine(Path.GetTempPath(), "fitspec-spline-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Folder);
    }

    public string Folder { get; }

    /// <summary>Writes data.csv with columns x, y (round-trip number format).</summary>
    public void WriteXy(IReadOnlyList<double> x, IReadOnlyList<double> y)
    {
        var lines = new List<string> { "x,y" };
        lines.AddRange(x.Select((v, i) => $"{v.ToString("R", CultureInfo.InvariantCulture)},{y[i].ToString("R", CultureInfo.InvariantCulture)}"));
        File.WriteAllLines(Path.Combine(Folder, "data.csv"), lines);
    }

    public FitResult Run(string yaml)
    {
        var path = Path.Combine(Folder, $"spec{Interlocked.Increment(ref _specs)}.fit.yaml");
        File.WriteAllText(path, yaml);
        return FitRunner.Run(path);
    }

    public void Dispose()
    {
        try
        {
            Directory.Delete(Folder, recursive: true);
        }
        catch (IOException)
        {
        }
    }

    public static double Coefficient(FitResult result, string name) => result.Coefficients.Single(c => c.Name == name).Value;

    /// <summary>The coefficients of a term named key1, key2, … in order.</summary>
    public static double[] Term(FitResult result, string key) =>
        result.Coefficients.Where(c => c.Name.StartsWith(key, StringComparison.Ordinal) && int.TryParse(c.Name.AsSpan(key.Length), out _))
            .Select(c => c.Value).ToArray();
}

/// <summary>
/// B-splines straight from their definition (de Boor, "A Practical Guide to Splines": B_{i,0} = 1 on
/// [u_i, u_{i+1}), then the two-term recursion with 0/0 taken as 0), evaluated by plain recursion over an
/// explicitly written clamped knot vector — independent of the product's table-based evaluation.
/// </summary>
public static class NaiveBSpline
{
    public static double[] ClampedKnots(IReadOnlyList<double> breaks, int degree)
    {
        var u = new List<double>();
        for (var i = 0; i < degree; i++)
        {
            u.Add(breaks[0]);
        }

        u.AddRange(breaks);
        for (var i = 0; i < degree; i++)
        {
            u.Add(breaks[^1]);
        }

        return [.. u];
    }

    /// <summary>B_{i,p}(x) for x strictly below the last knot.</summary>
    public static double B(double[] u, int i, int p, double x)
    {
        if (p == 0)
        {
            return u[i] <= x && x < u[i + 1] ? 1 : 0;
        }

        double left = 0, right = 0;
        if (u[i + p] > u[i])
        {
            left = (x - u[i]) / (u[i + p] - u[i]) * B(u, i, p - 1, x);
        }

        if (u[i + p + 1] > u[i + 1])
        {
            right = (u[i + p + 1] - x) / (u[i + p + 1] - u[i + 1]) * B(u, i + 1, p - 1, x);
        }

        return left + right;
    }

    /// <summary>Σ c_i B_{i,d}(x), x strictly below the last breakpoint.</summary>
    public static double Curve(IReadOnlyList<double> breaks, int degree, IReadOnlyList<double> c, double x)
    {
        var u = ClampedKnots(breaks, degree);
        double s = 0;
        for (var i = 0; i < c.Count; i++)
        {
            s += c[i] * B(u, i, degree, x);
        }

        return s;
    }
}
