namespace FitSpec.Design;

/// <summary>
/// How large one fit's design may grow, checked before its columns are allocated, so that a spec asking for
/// too much (a glob over a very wide file, a spline with thousands of knots over millions of rows) ends in
/// a clear error instead of running the machine out of memory.
/// </summary>
public static class DesignLimits
{
    /// <summary>Coefficients one fit may have (every term's columns together).</summary>
    public const int MaxCoefficients = 20_000;

    /// <summary>Design cells (rows × coefficients): 2.5e8 doubles are 2 GB per copy, and a solve holds a few.</summary>
    public const long MaxCells = 250_000_000;
}
