using System.Globalization;
using System.Text;
using System.Text.Json;
using FitSpec.Pipeline;
using FitSpec.Results;

namespace FitSpec.Tests.Sequential;

/// <summary>
/// A temporary folder holding one data file and specs over it, run through the real pipeline and JSON
/// writer, plus the small, self-contained numerics the checks need (written here, sharing no product code).
/// </summary>
internal sealed class SequentialFits : IDisposable
{
    public SequentialFits(IReadOnlyList<string> columns, IReadOnlyList<double[]> rows)
    {
        Folder = Path.Combine(Path.GetTempPath(), "fitspec-seq-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Folder);
        var text = new StringBuilder(string.Join(",", columns)).Append('\n');
        foreach (var row in rows)
        {
            text.Append(string.Join(",", row.Select(v => v.ToString("R", CultureInfo.InvariantCulture)))).Append('\n');
        }

        File.WriteAllText(Path.Combine(Folder, "data.csv"), text.ToString());
        Rows = rows;
    }

    public string Folder { get; }

    public IReadOnlyList<double[]> Rows { get; }

    /// <summary>Runs a spec whose model and loss sections are given; returns the result and its parsed JSON.</summary>
    public (FitResult Result, JsonElement Json) Run(string name, string body)
    {
        var path = Path.Combine(Folder, name + ".fit.yaml");
        File.WriteAllText(path, $"fitspec: 1\nname: {name}\ndata:\n  path: data.csv\n{body}\nreport:\n  formats: [json]\n");
        var result = FitRunner.Run(path);
        return (result, JsonDocument.Parse(ResultJson.Write(result)).RootElement.Clone());
    }

    public static double Coefficient(JsonElement json, string name) => json.GetProperty("coefficients").GetProperty(name).GetDouble();

    public static string Status(JsonElement json) => json.GetProperty("status").GetString()!;

    public static string Describe(JsonElement json) => json.ToString();

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

    /// <summary>
    /// x_i = i/4 (i = 0..n-1), y = 1.5 + 0.8 x + noise, the noise a fixed smooth-looking sequence
    /// (0.2 sin(2.3 i² + 0.7)) so the data are the same on every platform; rows listed in <paramref name="gross"/>
    /// get <paramref name="shift"/> added.
    /// </summary>
    public static List<double[]> Line(int n, double noise = 0.2, int[]? gross = null, double shift = 0)
    {
        var rows = new List<double[]>();
        for (var i = 0; i < n; i++)
        {
            var x = i / 4.0;
            var y = 1.5 + (0.8 * x) + (noise * Math.Sin((2.3 * i * i) + 0.7));
            if (gross is not null && gross.Contains(i))
            {
                y += shift;
            }

            rows.Add([x, y]);
        }

        return rows;
    }

    /// <summary>Solves A z = b (small dense systems), written in the tests independently of the product.</summary>
    public static double[] SolveLinear(double[,] a, double[] b) => Support.DenseLinear.Solve(a, b);

    /// <summary>Weighted least squares by the normal equations (fine for the small, well-conditioned tests here).</summary>
    public static double[] LeastSquares(IReadOnlyList<double[]> x, IReadOnlyList<double> y, IReadOnlyList<double>? w = null)
    {
        var p = x[0].Length;
        var a = new double[p, p];
        var b = new double[p];
        for (var i = 0; i < x.Count; i++)
        {
            var wi = w?[i] ?? 1;
            for (var j = 0; j < p; j++)
            {
                b[j] += wi * x[i][j] * y[i];
                for (var k = 0; k < p; k++)
                {
                    a[j, k] += wi * x[i][j] * x[i][k];
                }
            }
        }

        return SolveLinear(a, b);
    }

    public static double[] Residuals(IReadOnlyList<double[]> x, IReadOnlyList<double> y, double[] b) =>
        Enumerable.Range(0, y.Count).Select(i => y[i] - x[i].Select((v, j) => v * b[j]).Sum()).ToArray();

    public static double RelativeDifference(double a, double b) => Math.Abs(a - b) / Math.Max(1, Math.Abs(b));
}
