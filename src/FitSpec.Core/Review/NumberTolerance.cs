namespace FitSpec.Review;

/// <summary>
/// When two stored numbers count as the same. Exact (the default, 0): only equal values — the files hold
/// each number as its shortest round-trip text, so any change of the double shows. Otherwise X: the same
/// when |new − old| ≤ X · max(1, |old|), i.e. an absolute tolerance near zero and a relative one beyond 1.
/// </summary>
public readonly record struct NumberTolerance
{
    public NumberTolerance(double value)
    {
        if (!double.IsFinite(value) || value < 0)
        {
            throw new ArgumentOutOfRangeException(nameof(value), value, "a tolerance is a finite number ≥ 0");
        }

        Value = value;
    }

    public static NumberTolerance Exact => default;

    public double Value { get; }

    public bool IsExact => Value == 0;

    /// <summary>Null (no finite value stored) equals only null.</summary>
    public bool Same(double? old, double? @new)
    {
        if (old is not { } o || @new is not { } n)
        {
            return old is null && @new is null;
        }

        return o == n || Math.Abs(n - o) <= Value * Math.Max(1, Math.Abs(o));
    }
}
