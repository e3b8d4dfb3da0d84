using FitSpec.Diagnostics;
using FitSpec.Lowering;
using FitSpec.Results;
using FitSpec.Solving;
using FitSpec.Spec;

namespace FitSpec.Analysis;

/// <summary>
/// Percentile intervals by case resampling: each replicate draws n rows with replacement and re-solves the
/// same fit (same basis, constraints and penalties) on them. Replicate b's draws come from its own generator
/// seeded by (seed, b), and results are stored by b, so the answer is the same whatever the thread count.
/// </summary>
public static class Bootstrap
{
    public static BootstrapInfo Run(LoweredFit fit, double[] beta, UncertaintySpec request, SolveOptions options, CancellationToken cancellation, int? threads = null)
    {
        ArgumentNullException.ThrowIfNull(fit);
        ArgumentNullException.ThrowIfNull(beta);
        ArgumentNullException.ThrowIfNull(request);
        var design = fit.Design;
        var replicates = new double[request.Bootstrap][];
        var parallel = new ParallelOptions { MaxDegreeOfParallelism = threads ?? Environment.ProcessorCount, CancellationToken = cancellation };
        Parallel.For(0, request.Bootstrap, parallel, b =>
        {
            var rows = Draw(design.Rows, request.Seed, b);
            replicates[b] = Replicate(fit.Spec, design.Subset(rows), options, cancellation)!;
        });

        var good = replicates.Where(r => r is not null).ToList();
        var failed = request.Bootstrap - good.Count;
        var note = failed == 0 ? null : $"{failed} of {request.Bootstrap} replicates gave no optimum (e.g. a resample that does not determine every coefficient) and are left out";
        var intervals = new List<BootstrapInterval>();
        if (good.Count >= 2)
        {
            var lowP = (1 - request.Level) / 2;
            for (var j = 0; j < design.P; j++)
            {
                var values = good.Select(r => r[j]).Order().ToArray();
                intervals.Add(new BootstrapInterval(design.Coefficients[j].Name, beta[j], Quantile(values, lowP), Quantile(values, 1 - lowP), StdDev(values)));
            }
        }
        else
        {
            note = $"only {good.Count} of {request.Bootstrap} replicates gave an optimum: no intervals";
        }

        return new BootstrapInfo(request.Bootstrap, request.Seed, good.Count, request.Level, intervals, note);
    }

    /// <summary>Row indices of replicate b: n draws with replacement from a generator of its own.</summary>
    public static int[] Draw(int n, int seed, int replicate)
    {
        var state = SplitMix.Mix(((ulong)(uint)seed << 32) ^ (uint)replicate ^ 0x5DEECE66DUL);
        var rows = new int[n];
        for (var i = 0; i < n; i++)
        {
            state += 0x9E3779B97F4A7C15UL;
            // Multiply-shift maps a 64-bit draw onto 0..n-1 with negligible bias for any realistic n.
            rows[i] = (int)Math.BigMul(SplitMix.Mix(state), (ulong)n, out _);
        }

        return rows;
    }

    private static double[]? Replicate(FitSpecDocument spec, Design.Design design, SolveOptions options, CancellationToken cancellation)
    {
        try
        {
            var lowered = FitLowering.Lower(spec, design);
            var solution = Solver.Solve(lowered, options, cancellation);
            if (solution.X is null || solution.Status != SolveStatus.Optimal)
            {
                return null;
            }

            var beta = solution.Raw ?? design.ToRaw(solution.X.AsSpan(0, design.P));
            return beta.All(double.IsFinite) ? beta : null;
        }
        catch (FitSpecException)
        {
            return null;
        }
    }

    /// <summary>Linear interpolation between order statistics (the usual definition of a sample quantile).</summary>
    internal static double Quantile(double[] sorted, double p)
    {
        var h = (sorted.Length - 1) * p;
        var lo = (int)Math.Floor(h);
        var hi = Math.Min(lo + 1, sorted.Length - 1);
        return sorted[lo] + ((h - lo) * (sorted[hi] - sorted[lo]));
    }

    private static double StdDev(double[] v)
    {
        var mean = v.Average();
        var ss = v.Sum(x => (x - mean) * (x - mean));
        return Math.Sqrt(ss / (v.Length - 1));
    }
}
