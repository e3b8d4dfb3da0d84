using System.Text.Json;
using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>
/// Constraints that cannot all hold: status infeasible and exit 3 (SPEC.md: contradictory constraints are this, not
/// 2), with no coefficients or objective, whatever program the loss lowers to.
/// </summary>
public sealed class InfeasibleTests(InfeasibleTests.Batch batch) : IClassFixture<InfeasibleTests.Batch>
{
    private const string Contradiction = "constraints:\n  - \"b1 >= 2\"\n  - \"b1 <= 1\"\n";

    /// <summary>Fit name, loss, constraints (top-level YAML).</summary>
    public static readonly TheoryData<string, string, string> Contradictory = new()
    {
        { "qp", "l2", Contradiction },
        { "lp-l1", "l1", Contradiction },
        { "lp-linf", "linf", Contradiction },
        { "qp-huber", "{kind: huber, width: 0.5}", Contradiction },
        { "bounds-and-relation", "l2", "constraints:\n  - {kind: bounds, on: [b1], min: 2, max: 3}\n  - \"b1 <= 1\"\n" },
        { "two-equalities", "l2", "constraints:\n  - \"b0 + b1 == 1\"\n  - \"b0 + b1 == 2\"\n" },
        { "band-too-narrow", "l2", "constraints:\n  - {kind: residuals, max-abs: 0.01}\n" },
    };

    [Fact]
    public void Batch_of_contradictions_exits_3()
    {
        Assert.True(batch.Run.ExitCode == 3, batch.Run.ToString());
    }

    [Theory]
    [MemberData(nameof(Contradictory))]
    public void Contradictory_constraints_give_status_infeasible_and_exit_3(string name, string loss, string constraints)
    {
        var run = batch.RunOf(name);

        Assert.True(run.ExitCode == 3, $"{loss}, {constraints}: {run}");
        var result = batch.Result(name);
        Assert.Equal("infeasible", result.GetProperty("status").GetString());
        Assert.Equal(JsonValueKind.Null, result.GetProperty("objective").ValueKind);
        Assert.Empty(result.GetProperty("coefficients").EnumerateObject());
        Assert.Contains(run.StderrLines, l => l.StartsWith(name + ": infeasible", StringComparison.Ordinal));
    }

    /// <summary>`check` lowers without solving, so it cannot see a contradiction: it reports the program and exits 0.</summary>
    [Fact]
    public void Check_does_not_solve_so_it_passes_contradictory_constraints()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", Csv(Header, Rows));
        var spec = cli.Write("contra.fit.yaml", FitYaml("contra", Line, tail: Contradiction));

        var run = cli.Run("check", spec);

        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.StartsWith("contra: ok: QP", run.Stdout, StringComparison.Ordinal);
    }

    /// <summary>Every case of <see cref="Contradictory"/>, solved in one run.</summary>
    public sealed class Batch() : CaseBatch(Contradictory.Select(c => new EdgeCase((string)c[0], FitYaml((string)c[0], Line, (string)c[1], tail: (string)c[2]), Csv(Header, Rows))));
}
