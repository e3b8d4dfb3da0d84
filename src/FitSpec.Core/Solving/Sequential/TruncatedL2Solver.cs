using System.Globalization;
using FitSpec.Lowering;
using FitSpec.Lowering.Losses;

namespace FitSpec.Solving.Sequential;

/// <summary>
/// The truncated square min(e², c²), non-convex. From each start (the l2, l1 and minimax fits under the same
/// constraints and penalties) it alternates: classify the observations as inliers (|e| ≤ c) or outliers,
/// then solve the constrained least squares on the inliers (outliers each costing w c²), until the
/// classification no longer changes. Each round cannot raise the objective (the piece for a fixed
/// classification lies on or above the truncated objective, and touches it at the point it was built
/// from), so every start ends, and where no |e| equals c the end point is a local minimum: nearby the
/// objective is that piece, which the point minimises. The best end point over the starts is returned,
/// flagged as a local optimum; no duals are reported.
/// </summary>
internal sealed class TruncatedL2Solver : StrategySolver<TruncatedL2Strategy>
{
    private const int MaxRounds = 100;

    protected override Solution Solve(LoweredFit fit, TruncatedL2Strategy strategy, SolveOptions options, HighsRunner runner)
    {
        var cap = strategy.Cap;
        var program = fit.Program;
        var design = fit.Design;
        var name = $"truncated-l2 (cap {cap.ToString(CultureInfo.InvariantCulture)})";
        var starts = new (string Name, Func<FitProgram> Build, bool? ViaDual)[]
        {
            ("l2", () => Starts.LeastSquares(program, design), null),
            ("l1", () => Starts.LeastAbsolute(program, design), true),
            ("minimax", () => Starts.Minimax(program, design, weighted: true), false),
        };

        Run? best = null;
        var report = new List<string>();
        var rounds = 0;
        var timedOut = false;
        foreach (var (startName, build, viaDual) in starts)
        {
            if (runner.OutOfTime)
            {
                timedOut = true;
                report.Add($"{startName}: not run (time limit)");
                continue;
            }

            var answer = runner.Solve(build(), viaDual);
            if (answer.Status != SolveStatus.Optimal)
            {
                if (startName == "l2" && answer.Status == SolveStatus.Infeasible)
                {
                    var message = $"{name}: the constraints admit no coefficients (the least-squares start is infeasible)";
                    return NewtonFits.NoPoint(SolveStatus.Infeasible, message, null, runner, [new LoweringNote("solve", name, message)]);
                }

                report.Add($"{startName}: start not solved (HiGHS model status {answer.ModelStatus})");
                continue;
            }

            var run = Alternate(fit, cap, Starts.Head(answer.X, program.NumVars), runner);
            rounds += run.Rounds;
            timedOut |= run.TimedOut;
            report.Add($"{startName} start: {NewtonFits.Plural(run.Rounds, "round")}, objective {NewtonFits.Num(run.Objective)}, {run.Outliers.Count} outliers"
                + (run.Stable ? "" : " (classification not yet stable)"));
            if (run.Stable && (best is null || run.Objective < best.Objective))
            {
                best = run with { Start = startName };
            }
        }

        if (best is null)
        {
            var message = $"{name}: no start reached a stable classification ({string.Join("; ", report)})";
            return NewtonFits.NoPoint(timedOut ? SolveStatus.TimeLimit : SolveStatus.Error, message, message, runner, [new LoweringNote("solve", name, message)]);
        }

        var how = $"a local optimum, not proven global: best of {starts.Length} starts is the {best.Start} start; "
            + $"{rounds} inlier/outlier least-squares rounds in all ({string.Join("; ", report)}); "
            + $"{NewtonFits.Plural(best.Outliers.Count, "outlier")} (|e| > cap); closest |e| to the cap is {NewtonFits.Short(best.Margin)} from it";
        return new Solution(
            timedOut ? SolveStatus.TimeLimit : SolveStatus.Optimal,
            best.X,
            null,
            null,
            NewtonFits.SolverName,
            $"local method: alternating inlier/outlier least squares from {starts.Length} starts (l2, l1, minimax), each a QP (HiGHS)",
            "QP per round: Gram-form least squares on the inliers plus the program",
            runner.Seconds,
            rounds,
            $"{name}: {how}")
        {
            GlobalOptimum = false,
            Outliers = best.Outliers,
            KktResidual = double.IsNaN(best.Kkt) ? null : best.Kkt,
            SolvedProgram = best.Subproblem,
            // The last round's program is the truncated objective's piece for the final classification, plus
            // the outliers' constant: at the returned point the two are equal.
            ObjectiveComparable = true,
            StatusDetail = $"truncated-l2 is non-convex: this is a local optimum (best of {starts.Length} starts), not proven global",
            Notes = [new LoweringNote("solve", name, how)],
        };
    }

    private sealed record Run(
        double[] X, FitProgram Subproblem, double Objective, IReadOnlyList<int> Outliers, int Rounds, bool Stable, bool TimedOut, double Kkt, double Margin, string Start = "");

    private static Run Alternate(LoweredFit fit, double cap, double[] start, HighsRunner runner)
    {
        var design = fit.Design;
        var x = start;
        var inlier = Classify(Residuals(design, x), cap);
        FitProgram? sub = null;
        HighsRunResult? answer = null;
        var rounds = 0;
        var stable = false;
        var timedOut = false;
        while (rounds < MaxRounds)
        {
            if (runner.OutOfTime)
            {
                timedOut = true;
                break;
            }

            var used = inlier;
            sub = Starts.LeastSquares(fit.Program, design, i => used[i], cap * cap);
            answer = runner.Solve(sub);
            rounds++;
            if (answer.Status != SolveStatus.Optimal)
            {
                break;
            }

            x = Starts.Head(answer.X, fit.Program.NumVars);
            var next = Classify(Residuals(design, x), cap);
            if (next.AsSpan().SequenceEqual(inlier))
            {
                stable = true;
                break;
            }

            inlier = next;
        }

        var e = Residuals(design, x);
        var objective = fit.Program.Objective(x);
        var outliers = new List<int>();
        var margin = double.PositiveInfinity;
        for (var i = 0; i < e.Length; i++)
        {
            objective += design.Weight(i) * Math.Min(e[i] * e[i], cap * cap);
            margin = Math.Min(margin, Math.Abs(Math.Abs(e[i]) - cap));
            if (!inlier[i])
            {
                outliers.Add(i);
            }
        }

        var kkt = stable && answer?.RowDual is { } y && answer.ColDual is { } z
            ? InlierKkt(fit, x, e, inlier, y, z, objective)
            : double.NaN;
        return new Run(x, sub ?? fit.Program, objective, outliers, rounds, stable, timedOut, kkt, margin);
    }

    private static bool[] Classify(double[] e, double cap) => e.Select(v => Math.Abs(v) <= cap).ToArray();

    private static double[] Residuals(Design.Design design, double[] x) => FitResiduals.Of(design, x);

    // Stationarity of the final piece (least squares on the inliers) at the point: with no |e| at the cap,
    // together with the classification's margin this is the local-optimality evidence.
    private static double InlierKkt(LoweredFit fit, double[] x, double[] e, bool[] inlier, double[] y, double[] z, double objective)
    {
        var design = fit.Design;
        var p = design.P;
        var gradient = new double[p];
        var magnitude = new double[p];
        var floor = Kkt.ResidualFloor(design);
        for (var i = 0; i < e.Length; i++)
        {
            if (!inlier[i])
            {
                continue;
            }

            var s = 2 * design.Weight(i) * e[i];
            var least = 2 * design.Weight(i) * floor;
            for (var j = 0; j < p; j++)
            {
                var t = s * design.X[j][i];
                gradient[j] -= t;
                magnitude[j] += Math.Max(Math.Abs(t), Math.Abs(least * design.X[j][i]));
            }
        }

        return Kkt.Residual(fit.Program, x, gradient, magnitude, y, z, objective);
    }
}
