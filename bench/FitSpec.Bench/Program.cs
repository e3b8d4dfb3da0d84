using System.Diagnostics;
using System.Globalization;
using System.Text;
using FitSpec.Pipeline;

// Benchmarks that print figures. Usage: dotnet run -c Release --project bench/FitSpec.Bench -- formulation [maxRows]
// or: ... -- stages OUTDIR SPEC|FOLDER... (time and memory per pipeline stage; see StageTimes.cs)
var what = args.Length > 0 ? args[0] : "formulation";
if (what == "stages")
{
    return FitSpec.Bench.StageTimes.Run(args[1..]);
}

var maxRows = args.Length > 1 ? int.Parse(args[1], CultureInfo.InvariantCulture) : 100_000;
if (what != "formulation")
{
    Console.Error.WriteLine("usage: FitSpec.Bench formulation [maxRows] | stages OUTDIR SPEC|FOLDER...");
    return 2;
}

var folder = Path.Combine(Path.GetTempPath(), "fitspec-bench-formulation");
Directory.CreateDirectory(folder);
Console.WriteLine($"LP formulation for residual losses: primal (one row per observation) vs dual (one row per coefficient). {Environment.ProcessorCount} cores.");
Console.WriteLine("| loss | rows n | coefficients p | primal rows | primal solve s | dual rows | dual solve s | same objective |");
Console.WriteLine("| --- | ---: | ---: | ---: | ---: | ---: | ---: | --- |");
foreach (var loss in new[] { "l1", "{kind: quantile, tau: 0.9}", "linf" })
{
    for (var n = 1000; n <= maxRows; n *= 10)
    {
        var data = Path.Combine(folder, $"d{n}.csv");
        if (!File.Exists(data))
        {
            WriteData(data, n, p: 5, seed: 42);
        }

        var results = new Dictionary<string, (int Rows, double Seconds, double Objective)>();
        foreach (var form in new[] { "primal", "dual" })
        {
            var spec = Path.Combine(folder, $"bench-{form}.fit.yaml");
            File.WriteAllText(spec, $"""
                fitspec: 1
                data: {"{"}path: {Path.GetFileName(data)}{"}"}
                model:
                  response: y
                  terms: {"{"}b0: 1, x1: x1, x2: x2, x3: x3, x4: x4{"}"}
                loss: {loss}
                solve: {"{"}formulation: {form}, time-limit: 300{"}"}
                report: {"{"}formats: [json]{"}"}
                """);
            var clock = Stopwatch.StartNew();
            var r = FitRunner.Run(spec);
            clock.Stop();
            var rows = r.Problem?.Formulation.StartsWith("dual", StringComparison.Ordinal) == true
                ? int.Parse(r.Problem.Formulation.Split(' ')[1].Trim('('), CultureInfo.InvariantCulture)
                : r.Problem?.Rows ?? 0;
            results[form] = (rows, r.Problem?.SolveSeconds ?? double.NaN, r.Objective ?? double.NaN);
        }

        var (pr, ps, po) = results["primal"];
        var (dr, ds, dobj) = results["dual"];
        var same = Math.Abs(po - dobj) <= 1e-9 * Math.Max(1, Math.Abs(po)) ? "yes" : $"no ({po:G12} vs {dobj:G12})";
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"| {loss} | {n} | 5 | {pr} | {ps:F3} | {dr} | {ds:F3} | {same} |"));
    }
}

return 0;

static void WriteData(string path, int n, int p, int seed)
{
    var random = new Random(seed);
    var sb = new StringBuilder("y");
    for (var j = 1; j < p; j++)
    {
        sb.Append(CultureInfo.InvariantCulture, $",x{j}");
    }

    sb.Append('\n');
    for (var i = 0; i < n; i++)
    {
        var y = 1.0;
        var row = new StringBuilder();
        for (var j = 1; j < p; j++)
        {
            var x = random.NextDouble() * 10;
            y += j * 0.5 * x;
            row.Append(CultureInfo.InvariantCulture, $",{x:R}");
        }

        // Heavy-tailed noise, as in the data these losses are for.
        var u = random.NextDouble() - 0.5;
        y += Math.Tan(Math.PI * u * 0.9) * 0.3;
        sb.Append(y.ToString("R", CultureInfo.InvariantCulture)).Append(row).Append('\n');
    }

    File.WriteAllText(path, sb.ToString());
}
