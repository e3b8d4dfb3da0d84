using System.Text.Json;
using FitSpec.Tests.Cli;

namespace FitSpec.Tests.EdgeCases;

/// <summary>One edge case: a fit name (also its folder) with its spec and data file.</summary>
public sealed record EdgeCase(string Name, string Yaml, string Data);

/// <summary>
/// Many cases solved by one `fitspec solve` run (one process instead of one per case, which keeps the folder fast):
/// each case sits in its own folder, so every error line it causes starts with its folder or its fit name. A run
/// that breaks one of the harness's own rules (a stack trace on stderr) fails every case, with that run's output.
/// </summary>
public abstract class CaseBatch : IDisposable
{
    private readonly CliHarness _cli = new();
    private readonly CliRun? _run;
    private readonly Xunit.Sdk.XunitException? _broken;

    protected CaseBatch(IEnumerable<EdgeCase> cases)
    {
        var specs = new List<string>();
        foreach (var c in cases)
        {
            _cli.Write($"{c.Name}/d.csv", c.Data);
            specs.Add(_cli.Write($"{c.Name}/{c.Name}.fit.yaml", c.Yaml));
        }

        try
        {
            _run = _cli.Run(["solve", .. specs, "--out", "out", "--format", "json"]);
        }
        catch (Xunit.Sdk.XunitException e)
        {
            _broken = e;
        }
    }

    public CliRun Run => _run ?? throw new InvalidOperationException("the batch run itself failed: " + _broken?.Message);

    /// <summary>The error lines of one case: those naming its folder (spec and data errors) or its fit (solve outcomes).</summary>
    public IReadOnlyList<string> LinesOf(string name) =>
        [.. Run.StderrLines.Where(l => l.StartsWith(name + "/", StringComparison.Ordinal) || l.StartsWith(name + ":", StringComparison.Ordinal))];

    /// <summary>The case's own run, as if it had run alone: its error lines and the exit code its result implies.</summary>
    public CliRun RunOf(string name) => new(ExitCodeOf(Result(name)), "", string.Join('\n', LinesOf(name)) + "\n");

    public JsonElement Result(string name) => _cli.Json($"out/{name}.result.json");

    public void Dispose()
    {
        _cli.Dispose();
        GC.SuppressFinalize(this);
    }

    /// <summary>SPEC.md's exit codes for one fit: 0 solved and accepted, 1 a rule failed, 2 nothing solved (invalid input), 3 no optimum.</summary>
    public static int ExitCodeOf(JsonElement result) => result.GetProperty("status").GetString() switch
    {
        "optimal" or "local-optimum" => result.GetProperty("acceptance").EnumerateArray().All(a => a.GetProperty("passed").GetBoolean()) ? 0 : 1,
        "error" when !result.TryGetProperty("problem", out var problem) || problem.ValueKind == JsonValueKind.Null => 2,
        _ => 3,
    };
}
