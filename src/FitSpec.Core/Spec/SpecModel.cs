namespace FitSpec.Spec;

/// <summary>A place in a spec file (1-based line and column).</summary>
public sealed record SourcePos(string File, int Line, int Column)
{
    public override string ToString() => $"{File}:{Line}:{Column}";
}

/// <summary>
/// A string value from the spec with the place it was written. ColumnShift is how far the text's first
/// character lies right of the node's start (1 for a quoted scalar), so an offset inside an expression
/// maps to an exact column.
/// </summary>
public sealed record SpecText(string Value, SourcePos Pos, int ColumnShift = 0)
{
    public SourcePos At(int offset) => Pos with { Column = Pos.Column + ColumnShift + offset };

    public override string ToString() => Value;
}

/// <summary>The typed, validated fit specification; every item keeps where it was written.</summary>
public sealed record FitSpecDocument(
    string File,
    string Name,
    string? Title,
    string? Description,
    DataSpec Data,
    ModelSpec Model,
    LossSpec Loss,
    IReadOnlyList<PenaltySpec> Penalties,
    IReadOnlyList<ConstraintSpec> Constraints,
    SolveSpec Solve,
    ReportSpec Report)
{
    /// <summary>The folder that the spec's relative paths are resolved against.</summary>
    public string Folder => Path.GetDirectoryName(Path.GetFullPath(File)) ?? ".";
}

public enum MissingPolicy
{
    Error,
    Drop,
}

public sealed record DataSpec(
    SpecText? Path,
    SpecText? Sqlite,
    SpecText? Query,
    SpecText? Filter,
    SpecText? Weight,
    MissingPolicy Missing,
    SourcePos Pos);

public sealed record ModelSpec(SpecText Response, IReadOnlyList<TermSpec> Terms, SourcePos Pos);

/// <summary>One entry of model.terms: a coefficient name (or name prefix for expanders) and its basis.</summary>
public abstract record TermSpec(string Key, SourcePos Pos);

/// <summary>A constant, a column or any expression: one coefficient.</summary>
public sealed record ExpressionTerm(string Key, SourcePos Pos, SpecText Expression) : TermSpec(Key, Pos);

/// <summary>x¹…x^d, coefficients key1…keyd, in the raw basis.</summary>
public sealed record PolynomialTerm(string Key, SourcePos Pos, SpecText Input, int Degree) : TermSpec(Key, Pos);

/// <summary>Clamped B-splines; Knots counts both boundary knots.</summary>
public sealed record SplineTerm(string Key, SourcePos Pos, SpecText Input, int Knots, int Degree, IReadOnlyList<double>? At)
    : TermSpec(Key, Pos);

/// <summary>One coefficient per data column matching a glob, named after the column.</summary>
public sealed record ColumnsTerm(string Key, SourcePos Pos, SpecText Glob) : TermSpec(Key, Pos);

public enum LossKind
{
    L2,
    L1,
    Linf,
    Quantile,
    Huber,
    Deadzone,
    LogBarrier,
    Lp,
    TruncatedL2,
    None,
}

/// <summary>The loss with its one parameter (tau, width, limit, p or cap), when the kind has one.</summary>
public sealed record LossSpec(LossKind Kind, string KindName, double? Parameter, SourcePos Pos);

public enum PenaltyKind
{
    L1,
    L2,
    Smoothness,
    Count,
}

public sealed record PenaltySpec(
    PenaltyKind Kind,
    string KindName,
    double Weight,
    IReadOnlyList<SpecText>? On,
    int? Order,
    bool NormL1,
    int? Max,
    SourcePos Pos);

/// <summary>A user constraint; Label is the text a report shows for it.</summary>
public abstract record ConstraintSpec(string Label, SourcePos Pos);

public sealed record RelationConstraint(string Label, SourcePos Pos, SpecText Text) : ConstraintSpec(Label, Pos);

public sealed record BoundsConstraint(string Label, SourcePos Pos, IReadOnlyList<SpecText>? On, double? Min, double? Max)
    : ConstraintSpec(Label, Pos);

public enum ShapeKind
{
    Increasing,
    Decreasing,
    Convex,
    Concave,
}

public sealed record ShapeConstraint(
    string Label,
    SourcePos Pos,
    ShapeKind Shape,
    SpecText Input,
    double From,
    double To,
    IReadOnlyList<KeyValuePair<string, double>> At,
    int? Grid) : ConstraintSpec(Label, Pos);

public sealed record ValueConstraint(
    string Label,
    SourcePos Pos,
    IReadOnlyList<KeyValuePair<string, double>> At,
    double? EqualTo,
    double? Min,
    double? Max) : ConstraintSpec(Label, Pos);

public sealed record ResidualsConstraint(string Label, SourcePos Pos, double MaxAbs) : ConstraintSpec(Label, Pos);

public enum SolveMethod
{
    Auto,
    Qr,
    Simplex,
    Ipm,
}

/// <summary>Which form of an LP to solve: as lowered, its dual, or whichever has fewer rows (auto).</summary>
public enum LpForm
{
    Auto,
    Primal,
    Dual,
}

public sealed record SolveSpec(SolveMethod Method, double? TimeLimit, LpForm Form = LpForm.Auto);

public enum ReportFormat
{
    Html,
    Md,
    Json,
}

public sealed record ReportSpec(IReadOnlyList<ReportFormat> Formats, IReadOnlyList<SpecText> Accept, SpecText? Templates)
{
    /// <summary>report.uncertainty: bootstrap intervals by case resampling (null when not asked for).</summary>
    public UncertaintySpec? Uncertainty { get; init; }
}

/// <summary>report.uncertainty: {bootstrap: N, seed: S, level: L}; Level is the interval's coverage (default 0.95).</summary>
public sealed record UncertaintySpec(int Bootstrap, int Seed, double Level, SourcePos Pos);
