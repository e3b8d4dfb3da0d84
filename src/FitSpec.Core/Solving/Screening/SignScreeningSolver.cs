using System.Diagnostics;
using System.Globalization;
using FitSpec.Lowering;
using FitSpec.Spec;
using Highs.Native;

namespace FitSpec.Solving.Screening;

/// <summary>
/// l1 and quantile fits with many rows, solved exactly on a few of them. The fit on a subsample says which
/// observations lie far above or below the answer; their residual signs are fixed, which makes their part of
/// the objective linear in θ (folded into θ's cost), and HiGHS solves the reduced LP on the rest. If every fixed
/// sign holds at the reduced optimum, that point with the fixed rows' duals at their bounds satisfies the full
/// LP's optimality conditions — it is the full optimum, and the assembled primal and dual are verified on all
/// rows like any other LP answer. Rows whose sign was wrong join the reduced problem and it is solved again.
/// </summary>
internal sealed class SignScreeningSolver : IFitSolver
{
    /// <summary>Below this many rows the whole LP is solved directly (measured: screening does not pay).</summary>
    public const int MinRows = 50_000;

    private const int MaxRounds = 12;

    /// <summary>The constant in m = c·√p·n^(2/3); read from FITSPEC_SCREEN_FACTOR when set (for measuring).</summary>
    private static readonly double SampleFactor =
        double.TryParse(Environment.GetEnvironmentVariable("FITSPEC_SCREEN_FACTOR"), System.Globalization.CultureInfo.InvariantCulture, out var f) && f > 0 ? f : 2;

    public int Priority => 900;

    public bool CanSolve(LoweredFit fit, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(fit);
        ArgumentNullException.ThrowIfNull(options);
        return fit.Strategy is null
            && fit.Spec.Loss.Kind is LossKind.L1 or LossKind.Quantile
            && fit.Program.Class == ProblemClass.LP
            && fit.Design.Rows >= MinRows
            && options.Method == SolveMethod.Auto
            && options.Formulation == Formulation.Auto
            && !fit.Spec.Constraints.OfType<ResidualsConstraint>().Any()
            && SampleSize(fit.Design.Rows, fit.Design.P) * 4 < fit.Design.Rows;
    }

    /// <summary>Reduced-problem size: about 2·√p·n^(2/3) rows, the order that makes wrong signs rare. Measured: c = 1 solved 10⁶ rows 2.7× faster than c = 2, but on 6·10⁴ Cauchy-noise rows needed so many corrections that it fell back to the whole LP; c = 0.5 fell back at 10⁶.</summary>
    public static int SampleSize(int n, int p) => (int)Math.Min(n, Math.Ceiling(SampleFactor * Math.Sqrt(p) * Math.Pow(n, 2.0 / 3.0)));

    public Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation)
    {
        ArgumentNullException.ThrowIfNull(fit);
        var clock = Stopwatch.StartNew();
        var design = fit.Design;
        var n = design.Rows;
        var layout = CheckLossLayout.Find(fit.Program, n);
        if (layout is null)
        {
            return new HighsFitSolver().Solve(fit, options, cancellation);
        }

        var runner = new HighsRunner(options, cancellation);
        var m = SampleSize(n, design.P);
        var fixedSign = new sbyte[n];
        var kept = SampleRows(n, m);
        var reducedRows = 0;
        var rounds = 0;
        var resolves = 0;
        Reduced? reduced = null;
        double[]? residual = null;
        while (rounds < MaxRounds)
        {
            rounds++;
            cancellation.ThrowIfCancellationRequested();
            reduced = SolveReduced(fit, layout, kept, rounds == 1 ? null : fixedSign, runner);
            reducedRows = Math.Max(reducedRows, kept.Count);
            if (reduced.Run.Status != SolveStatus.Optimal)
            {
                // A subset may not determine every coefficient (a rare level, say): let the whole LP decide.
                return new HighsFitSolver().Solve(fit, options, cancellation);
            }

            residual = Residual(design, reduced.Run.X);
            if (rounds == 1)
            {
                // The subsample's fit: keep the m rows closest to it, fix the signs of the rest.
                kept = Band(residual, m, fixedSign);
                continue;
            }

            var wrong = WrongSigns(residual, fixedSign, Tolerance(design));
            if (wrong.Count == 0)
            {
                break;
            }

            resolves++;
            if (wrong.Count > m / 10)
            {
                // Too many wrong: the band was too narrow. Widen it around the current point.
                m = Math.Min(n, 2 * m);
                kept = Band(residual, m, fixedSign);
            }
            else
            {
                foreach (var i in wrong)
                {
                    fixedSign[i] = 0;
                }

                kept = [.. kept, .. wrong];
                kept.Sort();
            }

            if (kept.Count * 2 > n)
            {
                // Screening is not paying off: solve the whole LP.
                return new HighsFitSolver().Solve(fit, options, cancellation);
            }
        }

        if (rounds >= MaxRounds && WrongSigns(residual!, fixedSign, Tolerance(design)).Count > 0)
        {
            return new HighsFitSolver().Solve(fit, options, cancellation);
        }

        var (x, rowDual, colDual) = Assemble(fit, layout, reduced!, kept, fixedSign, residual!);
        var formulation = string.Create(CultureInfo.InvariantCulture,
            $"sign screening: {rounds - 1} reduced LP(s) of at most {reducedRows} of {n} rows, each through its dual ({design.P} rows); {resolves} correction(s)");
        return new Solution(SolveStatus.Optimal, x, rowDual, colDual, $"HiGHS {HighsSolver.Version}",
            runner.UsedInteriorPoint ? "interior point with crossover on the reduced LPs" : "simplex on the reduced LPs",
            formulation, clock.Elapsed.TotalSeconds, runner.HighsIterations, "optimal: every fixed residual sign holds at the reduced optimum");
    }

    private sealed record Reduced(HighsRunResult Run, FitProgram Program, CheckLossLayout Layout);

    /// <summary>The LP on the kept rows, with the fixed rows' linear part folded into θ's cost and the offset.</summary>
    private static Reduced SolveReduced(LoweredFit fit, CheckLossLayout full, List<int> kept, sbyte[]? fixedSign, HighsRunner runner)
    {
        var design = fit.Design;
        var lowered = FitLowering.Lower(fit.Spec, design.Subset(kept));
        var program = lowered.Program;
        var layout = CheckLossLayout.Find(program, kept.Count) ?? throw new InvalidOperationException("reduced check-loss program has an unexpected layout");
        if (fixedSign is not null)
        {
            var cost = (double[])program.Cost.Clone();
            var offset = program.Offset;
            for (var i = 0; i < fixedSign.Length; i++)
            {
                if (fixedSign[i] == 0)
                {
                    continue;
                }

                var y = FixedDual(fit.Program, full, i, fixedSign[i]);
                offset += y * design.Y[i];
                for (var j = 0; j < design.P; j++)
                {
                    cost[j] -= y * design.X[j][i];
                }
            }

            program = program with { Cost = cost, Offset = offset };
        }

        return new Reduced(runner.Solve(program, viaDual: true), program, layout);
    }

    /// <summary>The dual of a residual row whose sign is fixed: the cost of the split variable that carries it.</summary>
    private static double FixedDual(FitProgram program, CheckLossLayout layout, int i, sbyte sign) =>
        sign > 0 ? program.Cost[layout.Above[i]] : -program.Cost[layout.Below[i]];

    private static double[] Residual(Design.Design design, double[] x)
    {
        var fitted = design.Fitted(x.AsSpan(0, design.P));
        var r = new double[design.Rows];
        for (var i = 0; i < r.Length; i++)
        {
            r[i] = design.Y[i] - fitted[i];
        }

        return r;
    }

    /// <summary>A sign counts as wrong only beyond rounding of the residual itself.</summary>
    private static double Tolerance(Design.Design design) => 1e-12 * Math.Max(1, design.Y.Max(Math.Abs));

    private static List<int> WrongSigns(double[] r, sbyte[] fixedSign, double tol)
    {
        var wrong = new List<int>();
        for (var i = 0; i < r.Length; i++)
        {
            if ((fixedSign[i] > 0 && r[i] < -tol) || (fixedSign[i] < 0 && r[i] > tol))
            {
                wrong.Add(i);
            }
        }

        return wrong;
    }

    /// <summary>The m rows with the smallest |residual| are kept; the others get their residual's sign fixed.</summary>
    private static List<int> Band(double[] r, int m, sbyte[] fixedSign)
    {
        var magnitude = r.Select(Math.Abs).ToArray();
        var order = Enumerable.Range(0, r.Length).ToArray();
        Array.Sort(magnitude, order);
        var kept = new List<int>(m);
        for (var k = 0; k < order.Length; k++)
        {
            var i = order[k];
            if (k < m || r[i] == 0)
            {
                fixedSign[i] = 0;
                kept.Add(i);
            }
            else
            {
                fixedSign[i] = (sbyte)(r[i] > 0 ? 1 : -1);
            }
        }

        kept.Sort();
        return kept;
    }

    /// <summary>About m rows spread over the data, the same every run (a hash of the row number decides).</summary>
    private static List<int> SampleRows(int n, int m)
    {
        var threshold = (ulong)((double)m / n * ulong.MaxValue);
        var rows = new List<int>(m + (m / 10));
        for (var i = 0; i < n; i++)
        {
            if (SplitMix.Mix((ulong)i + 0x2545F4914F6CDD1DUL) < threshold)
            {
                rows.Add(i);
            }
        }

        return rows;
    }


    /// <summary>The full program's primal and dual from the reduced solve and the fixed signs.</summary>
    private static (double[] X, double[] RowDual, double[] ColDual) Assemble(
        LoweredFit fit, CheckLossLayout full, Reduced reduced, List<int> kept, sbyte[] fixedSign, double[] r)
    {
        var program = fit.Program;
        var x = new double[program.NumVars];
        var rowDual = new double[program.NumRows];
        var colDual = new double[program.NumVars];
        var run = reduced.Run;
        if (full.OtherVars.Length != reduced.Layout.OtherVars.Length || full.OtherRows.Length != reduced.Layout.OtherRows.Length)
        {
            throw new InvalidOperationException("reduced program's coefficient, penalty and constraint parts differ from the full program's");
        }

        for (var k = 0; k < full.OtherVars.Length; k++)
        {
            x[full.OtherVars[k]] = run.X[reduced.Layout.OtherVars[k]];
            colDual[full.OtherVars[k]] = run.ColDual![reduced.Layout.OtherVars[k]];
        }

        for (var k = 0; k < full.OtherRows.Length; k++)
        {
            rowDual[full.OtherRows[k]] = run.RowDual![reduced.Layout.OtherRows[k]];
        }

        var keptIndex = new Dictionary<int, int>(kept.Count);
        for (var k = 0; k < kept.Count; k++)
        {
            keptIndex[kept[k]] = k;
        }

        for (var i = 0; i < r.Length; i++)
        {
            int u = full.Above[i], v = full.Below[i];
            x[u] = Math.Max(r[i], 0);
            x[v] = Math.Max(-r[i], 0);
            var y = keptIndex.TryGetValue(i, out var k) ? run.RowDual![reduced.Layout.Row[k]] : FixedDual(program, full, i, fixedSign[i]);
            rowDual[full.Row[i]] = y;
            colDual[u] = program.Cost[u] - y;
            colDual[v] = program.Cost[v] + y;
        }

        return (x, rowDual, colDual);
    }
}
