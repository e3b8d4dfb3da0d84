using System.Globalization;
using System.Text;
using System.Text.Json;
using FitSpec.Pipeline;
using FitSpec.Results;

namespace FitSpec.ReferenceTests;

/// <summary>
/// Basis pursuit: `loss: none`, an l1 penalty and `residuals max-abs: 0` recover a sparse vector from fewer
/// measurements than unknowns. Expected from compressed-sensing theory (Candès, Romberg &amp; Tao 2006,
/// "Robust uncertainty principles"; Donoho &amp; Tanner 2009, the phase transition for l1 recovery: with
/// 40 Gaussian measurements of a 120-vector, δ = 1/3, recovery of k = 5 (ρ = 1/8) lies well inside the
/// success region). The data is seeded noise, generated here; the check value is the vector itself.
/// </summary>
public sealed class BasisPursuitTests : IDisposable
{
    private const int Unknowns = 120;
    private const int Measurements = 40;
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "fitspec-bp-" + Guid.NewGuid().ToString("N"));
    private readonly double[] _truth = new double[Unknowns];

    public BasisPursuitTests()
    {
        Directory.CreateDirectory(_folder);
        var random = new Random(20061);
        foreach (var (index, value) in new[] { (7, 1.5), (23, -2.0), (58, 0.75), (91, 3.0), (110, -1.25) })
        {
            _truth[index] = value;
        }

        var sb = new StringBuilder("y");
        for (var j = 0; j < Unknowns; j++)
        {
            sb.Append(CultureInfo.InvariantCulture, $",a{j + 1:D3}");
        }

        sb.Append('\n');
        for (var i = 0; i < Measurements; i++)
        {
            var row = new double[Unknowns];
            double y = 0;
            for (var j = 0; j < Unknowns; j++)
            {
                row[j] = Gaussian(random) / Math.Sqrt(Measurements);
                y += row[j] * _truth[j];
            }

            sb.Append(y.ToString("R", CultureInfo.InvariantCulture));
            foreach (var v in row)
            {
                sb.Append(',').Append(v.ToString("R", CultureInfo.InvariantCulture));
            }

            sb.Append('\n');
        }

        File.WriteAllText(Path.Combine(_folder, "sensing.csv"), sb.ToString());
    }

    [Fact]
    public void L1_basis_pursuit_recovers_the_sparse_vector()
    {
        var result = Solve("bp-l1", "{kind: l1, weight: 1}");
        Assert.Equal("optimal", result.Status);
        var worst = result.Coefficients.Select((c, j) => Math.Abs(c.Value - _truth[j])).Max();
        Assert.True(worst <= 1e-6, $"largest recovery error {worst:G3}");
        Assert.Equal("LP", result.Problem!.Class);
    }

    [Fact]
    public void L2_penalty_control_does_not_recover_it()
    {
        var result = Solve("bp-l2", "{kind: l2, weight: 1}");
        Assert.Equal("optimal", result.Status);
        var worst = result.Coefficients.Select((c, j) => Math.Abs(c.Value - _truth[j])).Max();
        var nonZero = result.Coefficients.Count(c => Math.Abs(c.Value) > 1e-6);
        Assert.True(worst > 0.1, $"the minimum-norm fit should not recover the sparse vector (error {worst:G3})");
        Assert.True(nonZero > 5 * 4, $"{nonZero} non-zero coefficients");
    }

    private FitResult Solve(string name, string penalty)
    {
        var spec = Path.Combine(_folder, name + ".fit.yaml");
        File.WriteAllText(spec, $$"""
            fitspec: 1
            name: {{name}}
            data: {path: sensing.csv}
            model:
              response: y
              terms:
                a: {columns: "a*"}
            loss: none
            penalties:
              - {{penalty}}
            constraints:
              - {kind: residuals, max-abs: 0}
            """);
        var result = FitRunner.Run(spec);
        Assert.True(result.Errors.Count == 0, JsonSerializer.Serialize(result.Errors));
        return result;
    }

    private static double Gaussian(Random random)
    {
        var u1 = 1.0 - random.NextDouble();
        var u2 = random.NextDouble();
        return Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }

    public void Dispose()
    {
        try
        {
            Directory.Delete(_folder, recursive: true);
        }
        catch (IOException)
        {
        }
    }
}
