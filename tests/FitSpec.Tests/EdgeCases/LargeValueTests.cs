using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>
/// Large values that do not overflow double precision but that the solver cannot take as written (measured: x = 1e15
/// makes HiGHS refuse an l1 model, y = 1e16 ends a minimax LP with model status Unknown, y = 1e30 makes a constrained
/// l2 QP "unbounded"). Whatever the loss, the fit must reach a verified optimum or be a located data error: never a
/// solver model status, a false "unbounded" or an internal error.
/// </summary>
public sealed class LargeValueTests(LargeValueTests.Batch batch) : IClassFixture<LargeValueTests.Batch>
{
    /// <summary>Fit name, column, value (on file line 4), loss, whether b1 >= 0 is added (so l2 becomes a QP).</summary>
    public static readonly TheoryData<string, string, string, string, bool> Large = new()
    {
        { "y-1e16-linf", "y", "1e16", "linf", false },
        { "x-1e16-l1", "x", "1e16", "l1", false },
        { "x-1e16-linf", "x", "1e16", "linf", false },
        { "y-1e50-l1", "y", "1e50", "l1", false },
        { "y-1e50-linf", "y", "1e50", "linf", false },
        { "y-1e50-qp", "y", "1e50", "l2", true },
        { "x-1e50-l1", "x", "1e50", "l1", false },
        { "x-1e50-linf", "x", "1e50", "linf", false },
        { "x-1e50-qp", "x", "1e50", "l2", true },
    };

    [Theory]
    [MemberData(nameof(Large))]
    public void Large_value_solves_to_a_verified_optimum_or_is_a_located_data_error(string name, string column, string value, string loss, bool constrained)
    {
        var run = batch.RunOf(name);
        var result = batch.Result(name);
        var status = result.GetProperty("status").GetString();
        if (run.ExitCode == 0)
        {
            Assert.True(status == "optimal", run.ToString());
            return;
        }

        Assert.True(run.ExitCode == 2 && status == "error",
            $"{column} = {value}, {loss}{(constrained ? " with a constraint" : "")}: status '{status}' ({result.GetProperty("status_detail")}): {run}");
        var error = DataErrorAt(run, name + "/d.csv", 4);
        Assert.True(error.Value.Contains($"'{column}'", StringComparison.Ordinal), $"the error does not name column '{column}': {run}");
    }

    /// <summary>Every case of <see cref="Large"/>, solved in one run.</summary>
    public sealed class Batch() : CaseBatch(Large.Select(c => new EdgeCase(
        (string)c[0], FitYaml((string)c[0], Line, (string)c[3], tail: (bool)c[4] ? PositiveSlope : ""), SampleWith((string)c[1], 4, (string)c[2]))));
}
