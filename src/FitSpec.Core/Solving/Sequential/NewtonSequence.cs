using FitSpec.Lowering;

namespace FitSpec.Solving.Sequential;

/// <summary>
/// A point of the sequence at which the subproblem's answer was taken whole (a full step): the point is
/// that subproblem's optimum, so its multipliers and the subproblem itself describe it consistently.
/// </summary>
internal sealed record NewtonState(double[] X, FitProgram Subproblem, double[] RowDual, double[] ColDual, double Kkt, double Objective);

/// <summary>How a Newton sequence ended.</summary>
internal sealed record NewtonOutcome(NewtonState? Final, int Steps, int Backtracks, bool Converged, SolveStatus Status, string Reason);

/// <summary>
/// Newton's method for min program objective(x) + Σ w φ(y − Xθ) under the program's constraints: each step
/// minimises the quadratic model of the loss at the current point plus the program's own objective, under
/// every constraint, as one QP; a backtracking line search along the step on the true objective keeps the
/// loss finite and makes it fall (Armijo). Iterates stay feasible because the set is convex and both ends of
/// every step are feasible. Stops when a full step lands on a point whose KKT residual (<see cref="Kkt"/>),
/// with that QP's multipliers, is at most the tolerance.
/// </summary>
internal sealed class NewtonSequence
{
    public const double Tolerance = 1e-9;
    public const int MaxSteps = 100;
    private const double Armijo = 1e-4;
    private const int MaxBacktracks = 60;

    private readonly LoweredFit _fit;
    private readonly ISmoothLoss _loss;
    private readonly HighsRunner _runner;
    private readonly bool _dense;

    public NewtonSequence(LoweredFit fit, ISmoothLoss loss, HighsRunner runner)
    {
        _fit = fit;
        _loss = loss;
        _runner = runner;
        _dense = DenseNewtonStep.Applies(fit.Program);
    }

    /// <summary>Steps solved directly rather than as a QP (fits without constraints).</summary>
    public int DenseSteps { get; private set; }

    private Design.Design Design => _fit.Design;

    /// <summary>The fit's objective at x: the program's (penalties) plus Σ w φ(e); +∞ outside the loss's domain.</summary>
    public double Objective(double[] x)
    {
        var e = Residuals(x);
        var value = _fit.Program.Objective(x);
        for (var i = 0; i < e.Length; i++)
        {
            value += Design.Weight(i) * _loss.Value(e[i]);
        }

        return value;
    }

    public double[] Residuals(double[] x) => FitResiduals.Of(Design, x);

    public NewtonOutcome Run(double[] start)
    {
        var x = start;
        var fx = Objective(x);
        // The full-step state with the smallest KKT residual so far: what is returned if the sequence
        // stops short of the tolerance.
        NewtonState? last = null;
        var backtracks = 0;
        var stalled = 0;
        for (var step = 1; step <= MaxSteps; step++)
        {
            if (_runner.OutOfTime)
            {
                return new NewtonOutcome(last, step - 1, backtracks, false, SolveStatus.TimeLimit, "the time limit was reached");
            }

            var e = Residuals(x);
            var (sub, slope, curvature) = Model(e);
            var answer = _dense ? DenseAnswer(x, slope, curvature) ?? _runner.Solve(sub) : _runner.Solve(sub);
            if (answer.Status != SolveStatus.Optimal || answer.RowDual is null || answer.ColDual is null)
            {
                return new NewtonOutcome(last, step - 1, backtracks, false, answer.Status,
                    $"the QP of Newton step {step} was not solved (HiGHS model status {answer.ModelStatus})");
            }

            var direction = new double[x.Length];
            for (var j = 0; j < x.Length; j++)
            {
                direction[j] = answer.X[j] - x[j];
            }

            var predicted = Math.Min(0, Predicted(x, e, direction));

            var noise = Noise(e, fx);
            double alpha = 1, trial = double.NaN;
            double[]? next = null;
            for (var k = 0; k <= MaxBacktracks; k++, alpha /= 2)
            {
                var candidate = k == 0 ? answer.X : Step(x, direction, alpha);
                trial = Objective(candidate);
                // Near the optimum the predicted fall is below rounding in F: accept the step if F did not
                // rise by more than rounding either, so the sequence can stop on a full step.
                if (trial <= fx + Armijo * alpha * predicted || (-predicted <= noise && trial <= fx + noise))
                {
                    next = candidate;
                    break;
                }

                backtracks++;
            }

            if (next is null)
            {
                return new NewtonOutcome(last, step, backtracks, false, SolveStatus.Error,
                    $"the line search of Newton step {step} found no decrease of the objective");
            }

            x = next;
            fx = trial;
            if (alpha == 1)
            {
                var kkt = KktAt(x, answer.RowDual, answer.ColDual, fx);
                var state = new NewtonState(x, sub, answer.RowDual, answer.ColDual, kkt, fx);
                if (kkt <= Tolerance)
                {
                    return new NewtonOutcome(state, step, backtracks, true, SolveStatus.Optimal, "converged");
                }

                stalled = last is not null && kkt > 0.5 * last.Kkt ? stalled + 1 : 0;
                if (last is null || kkt < last.Kkt)
                {
                    last = state;
                }

                // Full steps that no longer halve the residual: rounding in the data's own numbers (the
                // residuals next to a barrier's limit, the subproblems' accuracy) is the limit.
                if (stalled >= 4)
                {
                    return new NewtonOutcome(last, step, backtracks, false, SolveStatus.Optimal, "the KKT residual stopped falling");
                }
            }
        }

        return new NewtonOutcome(last, MaxSteps, backtracks, false, SolveStatus.Optimal, $"{MaxSteps} Newton steps were taken");
    }

    // The QP of one step: the program plus the loss's second-order model around the current fitted values f:
    // w[φ − φ'(f' − f) + ½φ''(f' − f)²] in the new fitted value f' (e = y − f, so de/df = −1).
    // Also returns w φ' and w × the model curvature per observation.
    private (FitProgram Program, double[] Slope, double[] Curvature) Model(double[] e)
    {
        var n = Design.Rows;
        var scale = TypicalResidual(e);
        var a = new double[n];
        var b = new double[n];
        var c = new double[n];
        var slopes = new double[n];
        var curvatures = new double[n];
        for (var i = 0; i < n; i++)
        {
            var w = Design.Weight(i);
            var f = Design.Y[i] - e[i];
            var phi = _loss.Value(e[i]);
            var slope = _loss.Slope(e[i]);
            var curvature = _loss.Curvature(e[i], scale);
            slopes[i] = w * slope;
            curvatures[i] = w * curvature;
            a[i] = 0.5 * w * curvature;
            b[i] = w * (-slope - (curvature * f));
            c[i] = w * (phi + (slope * f) + (0.5 * curvature * f * f));
        }

        return (Subproblems.WithQuadratic(_fit.Program, Design, a, b, c), slopes, curvatures);
    }

    // Without constraints the QP's answer is the Newton step itself, solved directly; no multipliers.
    private HighsRunResult? DenseAnswer(double[] x, double[] slope, double[] curvature)
    {
        if (DenseNewtonStep.Solve(_fit.Program, Design, x, slope, curvature) is not { } d)
        {
            return null;
        }

        DenseSteps++;
        var next = new double[x.Length];
        for (var j = 0; j < x.Length; j++)
        {
            next[j] = x[j] + d[j];
        }

        return new HighsRunResult(SolveStatus.Optimal, next, [], new double[x.Length], Highs.Native.HighsModelStatus.Optimal);
    }

    // How much F can be off from rounding alone: ε|F| from the sum, and each residual's error (about ε|e|)
    // magnified by the slope — large next to a barrier's limit.
    private double Noise(double[] e, double fx)
    {
        double s = 0;
        for (var i = 0; i < e.Length; i++)
        {
            s += Design.Weight(i) * Math.Abs(_loss.Slope(e[i]) * e[i]);
        }

        return (4 * double.Epsilon) + (1e-14 * (Math.Abs(fx) + s));
    }

    private double TypicalResidual(double[] e)
    {
        var rms = Rms(e);
        return rms > 0 ? rms : Rms(Design.Y) > 0 ? Rms(Design.Y) : 1;
    }

    private static double Rms(double[] v)
    {
        double s = 0;
        foreach (var t in v)
        {
            s += t * t;
        }

        return Math.Sqrt(s / Math.Max(1, v.Length));
    }

    // The model's change along the step, computed from the step itself (not as a difference of two model
    // values, which cancels to rounding near the optimum).
    private double Predicted(double[] x, double[] e, double[] d)
    {
        var program = _fit.Program;
        var qd = program.HessianTimes(d);
        double change = 0;
        for (var j = 0; j < d.Length; j++)
        {
            change += (program.Cost[j] * d[j]) + (x[j] * qd[j]) + (0.5 * d[j] * qd[j]);
        }

        var df = Design.Fitted(d.AsSpan(0, Design.P));
        var scale = TypicalResidual(e);
        for (var i = 0; i < e.Length; i++)
        {
            var w = Design.Weight(i);
            change += w * ((-_loss.Slope(e[i]) * df[i]) + (0.5 * _loss.Curvature(e[i], scale) * df[i] * df[i]));
        }

        return change;
    }

    private static double[] Step(double[] x, double[] d, double alpha)
    {
        var r = new double[x.Length];
        for (var j = 0; j < x.Length; j++)
        {
            r[j] = x[j] + (alpha * d[j]);
        }

        return r;
    }

    /// <summary>The KKT residual of the fit (true loss gradient) at x with the given multipliers.</summary>
    private double KktAt(double[] x, double[] y, double[] z, double objective)
    {
        var e = Residuals(x);
        var p = Design.P;
        var gradient = new double[p];
        var magnitude = new double[p];
        var floor = Kkt.ResidualFloor(Design);
        for (var i = 0; i < e.Length; i++)
        {
            var w = Design.Weight(i);
            var s = w * _loss.Slope(e[i]);
            var least = w * Math.Abs(_loss.Slope(floor));
            for (var j = 0; j < p; j++)
            {
                var t = s * Design.X[j][i];
                gradient[j] -= t;
                magnitude[j] += Math.Max(Math.Abs(t), Math.Abs(least * Design.X[j][i]));
            }
        }

        // The stationarity is that of the fit, so the program's own objective terms (not the model's) count.
        return Kkt.Residual(_fit.Program, x, gradient, magnitude, y, z, objective);
    }
}
