using System.Globalization;
using System.Text;

namespace FitSpec.Tests.Cli;

/// <summary>
/// Fits for the cancellation and progress tests. The slow one is an l1 fit on 20,000 invented rows solved as
/// the primal LP by simplex: it takes about 41 s to its optimum (measured on the 2-core test machine), so any
/// test that sees it end within seconds has stopped it. The quick one solves in milliseconds.
/// </summary>
public static class CancelFits
{
    public const int SlowRows = 20_000;

    /// <summary>y = 1 + 2x + uniform noise in [-1, 1], x evenly spaced in [0, 10) (seeded, so always the same file).</summary>
    public static string SlowCsv()
    {
        var random = new Random(3);
        var csv = new StringBuilder("x,y\n");
        for (var i = 0; i < SlowRows; i++)
        {
            var x = i * 10.0 / SlowRows;
            var y = 1 + (2 * x) + ((2 * random.NextDouble()) - 1);
            csv.Append(CultureInfo.InvariantCulture, $"{x:R},{y:R}\n");
        }

        return csv.ToString();
    }

    public static string SlowSpec(string name = "slow") =>
        $"fitspec: 1\nname: {name}\ndata:\n  path: {name}.csv\nmodel:\n  response: y\n  terms:\n    b0: 1\n    b1: x\nloss: l1\nsolve:\n  method: simplex\n  formulation: primal\nreport:\n  formats: [json, md]\n";

    public const string QuickCsv = "x,y\n1,2.1\n2,3.9\n3,6.2\n4,7.8\n5,10.1\n";

    public static string QuickSpec(string name) =>
        $"fitspec: 1\nname: {name}\ndata:\n  path: {name}.csv\nmodel:\n  response: y\n  terms:\n    b0: 1\n    b1: x\nloss: l1\nreport:\n  formats: [json, md]\n";

    /// <summary>Writes NAME.fit.yaml and NAME.csv into <paramref name="folder"/>; returns the spec's path.</summary>
    public static string Write(string folder, string name, string spec, string csv)
    {
        File.WriteAllText(Path.Combine(folder, name + ".csv"), csv);
        var path = Path.Combine(folder, name + ".fit.yaml");
        File.WriteAllText(path, spec);
        return path;
    }

    /// <summary>Temp files AtomicFile may leave (".NAME.PID.GUID.tmp") anywhere under <paramref name="folder"/>.</summary>
    public static string[] TempFiles(string folder) =>
        Directory.Exists(folder) ? Directory.GetFiles(folder, "*.tmp", SearchOption.AllDirectories) : [];
}
