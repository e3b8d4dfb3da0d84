using System.Globalization;
using FitSpec.Lowering;
using FitSpec.Lowering.Losses;
using Highs.Native;

namespace FitSpec.Solving.Sequential;

/// <summary>What the Newton-sequence backends share: running the sequence and reporting how it went.</summary>
internal static class NewtonFits
{
    public const string Method = "Newton's method with a backtracking line search, each step a QP (HiGHS)";

    public const string Formulation = "QP per step: Gram-form Hessian of the loss's quadratic model plus the program";

    public static string SolverName => $"HiGHS {HighsSolver.Version}";

    public static string Num(double x) => x.ToString("G12", CultureInfo.InvariantCulture);

    public static string Plural(int count, string noun) => count == 1 ? $"1 {noun}" : $"{count} {noun}s";

    public static string Short(double x) => x.ToString("G3", CultureInfo.InvariantCulture);

    /// <summary>A solve that ended before any point: status, why, and how far it got.</summary>
    public static Solution NoPoint(SolveStatus status, string message, string? detail, HighsRunner runner, IReadOnlyList<LoweringNote> notes) =>
        new(status, null, null, null, SolverName, Method, Formulation, runner.Seconds, runner.Solves, message)
        {
            StatusDetail = detail,
            Notes = notes,
        };

    /// <summary>Runs Newton's method from a start and turns its outcome into a solution.</summary>
    public static Solution Run(LoweredFit fit, NewtonSequence newton, double[] start, string lossName, string startNote, HighsRunner runner)
    {
        var outcome = newton.Run(start);
        if (outcome.Final is not { } final)
        {
            var status = outcome.Status == SolveStatus.Optimal ? SolveStatus.Error : outcome.Status;
            var why = $"{lossName}: {outcome.Reason} before any Newton step was taken in full";
            return NoPoint(status, why, why, runner, [new LoweringNote("solve", lossName, $"{startNote}; {why}")]);
        }

        var direct = newton.DenseSteps > 0 ? $"; {Plural(newton.DenseSteps, "step")} solved directly, there being no constraints" : "";
        var how = $"{Plural(outcome.Steps, "Newton step")} (sequence of QPs{direct}), {Plural(outcome.Backtracks, "line-search halving")}, "
            + $"{Plural(runner.Solves, "HiGHS solve")} in all with the starts ({Plural((int)runner.HighsIterations, "HiGHS iteration")}); KKT residual {Short(final.Kkt)}";
        how += outcome.Converged
            ? $" (target {Short(NewtonSequence.Tolerance)})"
            : $", above the target {Short(NewtonSequence.Tolerance)}: stopped because {outcome.Reason}";
        return new Solution(
            outcome.Status == SolveStatus.TimeLimit ? SolveStatus.TimeLimit : SolveStatus.Optimal,
            final.X,
            final.RowDual,
            final.ColDual,
            SolverName,
            Method,
            Formulation,
            runner.Seconds,
            outcome.Steps,
            $"{lossName}: {how}")
        {
            KktResidual = final.Kkt,
            SolvedProgram = final.Subproblem,
            // The last QP's objective is the loss's quadratic model, equal to the loss only to second order.
            ObjectiveComparable = false,
            Notes = [new LoweringNote("solve", lossName, $"{startNote}; {how}")],
        };
    }
}

/// <summary>
/// The log-barrier loss: a minimax LP under the user's constraints (penalties left out) decides whether any
/// coefficients keep every |e| below the limit; if so, Newton's method runs from the better of that point and
/// the constrained least-squares fit (when that one is inside too).
/// </summary>
internal sealed class LogBarrierSolver : StrategySolver<LogBarrierStrategy>
{
    protected override Solution Solve(LoweredFit fit, LogBarrierStrategy strategy, SolveOptions options, HighsRunner runner)
    {
        var limit = strategy.Limit;
        var program = fit.Program;
        var newton = new NewtonSequence(fit, new LogBarrierPhi(limit), runner);
        const string name = "log-barrier";

        // Unweighted, and without the penalties: the question is only whether |e_i| < limit can hold at all.
        var feasibility = runner.Solve(Starts.Minimax(Subproblems.WithoutObjective(program), fit.Design, weighted: false), viaDual: false);
        if (feasibility.Status != SolveStatus.Optimal)
        {
            var message = $"{name}: the minimax LP that looks for a point inside the limit ended with HiGHS model status {feasibility.ModelStatus}";
            return NewtonFits.NoPoint(feasibility.Status, message, null, runner, [new LoweringNote("solve", name, message)]);
        }

        var minimax = Starts.Head(feasibility.X, program.NumVars);
        var smallest = newton.Residuals(minimax).Max(Math.Abs);
        if (smallest >= limit)
        {
            var detail = $"no coefficients keep every |residual| below the log-barrier limit: the smallest achievable max |residual| "
                + $"under the constraints is {NewtonFits.Num(smallest)} >= limit {NewtonFits.Num(limit)} (minimax LP)";
            return NewtonFits.NoPoint(SolveStatus.Infeasible, $"{name}: {detail}", detail, runner, [new LoweringNote("solve", name, detail)]);
        }

        var start = minimax;
        var startObjective = newton.Objective(minimax);
        var startName = "minimax fit";
        var leastSquares = runner.Solve(Starts.LeastSquares(program, fit.Design));
        if (leastSquares.Status == SolveStatus.Optimal)
        {
            var candidate = Starts.Head(leastSquares.X, program.NumVars);
            var value = newton.Objective(candidate);
            if (value < startObjective)
            {
                (start, startObjective, startName) = (candidate, value, "least-squares fit");
            }
        }

        var startNote = $"smallest achievable max |e| {NewtonFits.Num(smallest)} < limit {NewtonFits.Num(limit)} (minimax LP); started from the {startName}";
        return NewtonFits.Run(fit, newton, start, name, startNote, runner);
    }
}

/// <summary>The power loss |e|^p: Newton's method from the least-squares fit under the same constraints.</summary>
internal sealed class LpLossSolver : StrategySolver<LpStrategy>
{
    protected override Solution Solve(LoweredFit fit, LpStrategy strategy, SolveOptions options, HighsRunner runner)
    {
        var p = strategy.P;
        var program = fit.Program;
        var name = $"lp (p = {p.ToString(CultureInfo.InvariantCulture)})";
        var leastSquares = runner.Solve(Starts.LeastSquares(program, fit.Design));
        if (leastSquares.Status != SolveStatus.Optimal)
        {
            var message = $"{name}: the least-squares start under the constraints ended with HiGHS model status {leastSquares.ModelStatus}";
            return NewtonFits.NoPoint(leastSquares.Status, message, null, runner, [new LoweringNote("solve", name, message)]);
        }

        var newton = new NewtonSequence(fit, new PowerPhi(p), runner);
        return NewtonFits.Run(fit, newton, Starts.Head(leastSquares.X, program.NumVars), name, "started from the least-squares fit", runner);
    }
}
