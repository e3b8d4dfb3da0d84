using System.Globalization;
using FitSpec.Pipeline;
using FitSpec.Results;

namespace FitSpec.Tests.Penalties;

/// <summary>A temporary folder for a data file and specs, each run through the whole pipeline (FitRunner.Run).</summary>
public sealed class PenaltyWorkspace : IDisposable
{
    private int _specs;

    public PenaltyWorkspace()
    {
        Folder = Path.Combine(Path.GetTempPath(), "fitspec-penalty-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Folder);
    }

    public string Folder { get; }

    /// <summary>Writes a CSV with the given header and rows (round-trip number format); returns its file name.</summary>
    public string WriteCsv(string name, IReadOnlyList<string> header, IEnumerable<double[]> rows)
    {
        var lines = new List<string> { string.Join(',', header) };
        lines.AddRange(rows.Select(r => string.Join(',', r.Select(v => v.ToString("R", CultureInfo.InvariantCulture)))));
        File.WriteAllLines(Path.Combine(Folder, name), lines);
        return name;
    }

    /// <summary>Writes the spec under a fresh name (the YAML's own name: is kept) and runs it.</summary>
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
}

/// <summary>Small helpers the penalty tests share: coefficient lookup, dense algebra written for the tests.</summary>
public static class TestMath
{
    public static double Coefficient(FitResult result, string name) =>
        result.Coefficients.Single(c => c.Name == name).Value;

    /// <summary>Solves A x = b (small dense systems), written in the tests independently of the product.</summary>
    public static double[] Solve(double[,] a, double[] b) => Support.DenseLinear.Solve(a, b);

    /// <summary>Least squares by the normal equations X'X b = X'y (X given by columns); fine for small, well-conditioned tests.</summary>
    public static double[] LeastSquares(IReadOnlyList<double[]> columns, double[] y, double[,]? extraNormal = null)
    {
        var p = columns.Count;
        var normal = new double[p, p];
        var rhs = new double[p];
        for (var a = 0; a < p; a++)
        {
            for (var c = 0; c < p; c++)
            {
                normal[a, c] = Dot(columns[a], columns[c]) + (extraNormal?[a, c] ?? 0);
            }

            rhs[a] = Dot(columns[a], y);
        }

        return Solve(normal, rhs);
    }

    public static double Dot(double[] u, double[] v)
    {
        double s = 0;
        for (var i = 0; i < u.Length; i++)
        {
            s += u[i] * v[i];
        }

        return s;
    }

    /// <summary>Every subset of {0..n-1} with at most k elements.</summary>
    public static IEnumerable<int[]> Subsets(int n, int k)
    {
        for (var mask = 0; mask < 1 << n; mask++)
        {
            var members = Enumerable.Range(0, n).Where(i => (mask & (1 << i)) != 0).ToArray();
            if (members.Length <= k)
            {
                yield return members;
            }
        }
    }
}
