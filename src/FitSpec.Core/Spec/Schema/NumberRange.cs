using System.Globalization;

namespace FitSpec.Spec.Schema;

/// <summary>
/// The values a number may take. The reader checks values with <see cref="Contains"/> and words its
/// errors with <see cref="Describe"/>; the schema gets the same bounds, so the two cannot disagree.
/// </summary>
public sealed record NumberRange(double? Min, bool MinExclusive, double? Max, bool MaxExclusive)
{
    public static NumberRange Any { get; } = new(null, false, null, false);

    /// <summary>x ≥ min.</summary>
    public static NumberRange AtLeast(double min) => new(min, false, null, false);

    /// <summary>x &gt; min.</summary>
    public static NumberRange Above(double min) => new(min, true, null, false);

    /// <summary>min ≤ x ≤ max.</summary>
    public static NumberRange Between(double min, double max) => new(min, false, max, false);

    /// <summary>min &lt; x &lt; max.</summary>
    public static NumberRange Inside(double min, double max) => new(min, true, max, true);

    public static NumberRange Exactly(double value) => new(value, false, value, false);

    public bool IsExact => Min is { } a && Max is { } b && a == b && !MinExclusive && !MaxExclusive;

    public bool Contains(double x) =>
        (Min is not { } lo || (MinExclusive ? x > lo : x >= lo))
        && (Max is not { } hi || (MaxExclusive ? x < hi : x <= hi));

    /// <summary>The range in words, to follow "must be": "between 1 and 30", "greater than 0", "0 or more".</summary>
    public string Describe() => (Min, Max) switch
    {
        ({ } a, { } b) when IsExact => Num(a),
        ({ } a, { } b) when MinExclusive && MaxExclusive => $"strictly between {Num(a)} and {Num(b)}",
        ({ } a, { } b) when !MinExclusive && !MaxExclusive => $"between {Num(a)} and {Num(b)}",
        ({ } a, { } b) => $"{(MinExclusive ? "greater than" : "at least")} {Num(a)} and {(MaxExclusive ? "less than" : "at most")} {Num(b)}",
        ({ } a, null) => MinExclusive ? $"greater than {Num(a)}" : $"{Num(a)} or more",
        (null, { } b) => MaxExclusive ? $"less than {Num(b)}" : $"{Num(b)} or less",
        _ => "any number",
    };

    public override string ToString() => Describe();

    internal static string Num(double x) => x.ToString("R", CultureInfo.InvariantCulture);
}
