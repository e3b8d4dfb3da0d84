using FitSpec.Design;
using FitSpec.Lowering;
using FitSpec.Solving;
using Highs.Native;

namespace FitSpec.Tests.Solving;

/// <summary>
/// The dual route must give the same optimum as HiGHS on the program as written (LP duality: equal optimal
/// objectives; the recovered point feasible for the primal).
/// </summary>
public sealed class LpDualTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(4)]
    [InlineData(5)]
    public void Random_l1_like_programs_agree_with_the_primal(int seed)
    {
        var random = new Random(seed);
        var p = 3;
        var n = 40;
        var b = new ProgramBuilder(["a", "b", "c"]);
        var entries = new Entry[p + 2];
        for (var i = 0; i < n; i++)
        {
            var u = b.AddVar($"u{i}", 0, double.PositiveInfinity, 0.3 + random.NextDouble(), new Origin(OriginKind.Loss, 0));
            var v = b.AddVar($"v{i}", 0, double.PositiveInfinity, 0.3 + random.NextDouble(), new Origin(OriginKind.Loss, 0));
            for (var j = 0; j < p; j++)
            {
                entries[j] = new Entry(j, random.NextDouble() * 4 - 2);
            }

            entries[p] = new Entry(u, 1);
            entries[p + 1] = new Entry(v, -1);
            var y = random.NextDouble() * 10;
            b.AddRow($"r{i}", y, y, entries, new Origin(OriginKind.Loss, 0));
        }

        // A one-sided row, a ranged row and a bounded coefficient, like user constraints.
        b.AddRow("c1", 0.1, double.PositiveInfinity, [new Entry(0, 1), new Entry(1, 1)], new Origin(OriginKind.Constraint, 0));
        b.AddRow("c2", -0.5, 0.5, [new Entry(1, 1), new Entry(2, -1)], new Origin(OriginKind.Constraint, 1));
        b.SetBounds(2, -1, 1);
        var program = b.Build();

        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.PassModel(HighsModels.From(program));
        var primal = highs.Run();
        Assert.Equal(HighsModelStatus.Optimal, primal.ModelStatus);

        var dual = LpDual.Build(program);
        Assert.Equal(p, dual.Model.NumRow);
        using var highs2 = new HighsSolver();
        highs2.SetOption("output_flag", false);
        highs2.PassModel(dual.Model);
        var dualRun = highs2.Run();
        Assert.Equal(HighsModelStatus.Optimal, dualRun.ModelStatus);
        var (x, rowDual, colDual) = dual.Recover(dualRun);

        var objective = program.Objective(x);
        Assert.Equal(primal.ObjectiveValue, objective, 1e-9 * Math.Max(1, Math.Abs(objective)));

        // The recovered point satisfies every row and bound of the primal.
        var activity = program.RowActivity(x);
        for (var r = 0; r < program.NumRows; r++)
        {
            Assert.InRange(activity[r], program.RowLower[r] - 1e-9, program.RowUpper[r] + 1e-9);
        }

        for (var j = 0; j < program.NumVars; j++)
        {
            Assert.InRange(x[j], program.Lower[j] - 1e-9, program.Upper[j] + 1e-9);
        }

        // Duals of the user rows agree with HiGHS's own duals on the primal (same sign convention).
        var c1 = program.NumRows - 2;
        Assert.Equal(primal.RowDual[c1], rowDual[c1], 1e-7);
        Assert.Equal(primal.RowDual[c1 + 1], rowDual[c1 + 1], 1e-7);
        Assert.Equal(primal.ColDual[2], colDual[2], 1e-7);
    }
}
