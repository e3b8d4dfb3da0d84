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

    /// <summary>Solves A x = b by Gaussian elimination with partial pivoting (A square, small, non-singular).</summary>
    public static double[] Solve(double[,] a, double[] b)
    {
        var n = b.Length;
        var m = (double[,])a.Clone();
        var x = (double[])b.Clone();
        for (var k = 0; k < n; k++)
        {
            var pivot = k;
            for (var i = k + 1; i < n; i++)
            {
                if (Math.Abs(m[i, k]) > Math.Abs(m[pivot, k]))
                {
                    pivot = i;
                }
            }

            for (var j = 0; j < n; j++)
            {
                (m[k, j], m[pivot, j]) = (m[pivot, j], m[k, j]);
            }

            (x[k], x[pivot]) = (x[pivot], x[k]);
            for (var i = k + 1; i < n; i++)
            {
                var f = m[i, k] / m[k, k];
                for (var j = k; j < n; j++)
                {
                    m[i, j] -= f * m[k, j];
                }

                x[i] -= f * x[k];
            }
        }

        for (var k = n - 1; k >= 0; k--)
        {
            var s = x[k];
            for (var j = k + 1; j < n; j++)
            {
                s -= m[k, j] * x[j];
            }

            x[k] = s / m[k, k];
        }

        return x;
    }

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
