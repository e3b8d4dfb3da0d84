namespace FitSpec.Spec.Schema;

/// <summary>The kind of a constraint object (relations are strings and have no kind).</summary>
public enum ConstraintKind
{
    Bounds,
    Increasing,
    Decreasing,
    Convex,
    Concave,
    Value,
    Residuals,
}

/// <summary>
/// The spec language, version 1, as data: every mapping, key, word and kind the readers accept. The
/// readers take their allowed keys, words and ranges from here, and <see cref="SchemaGenerator"/> turns
/// the same objects into the JSON Schema, so adding a key means adding it here.
/// </summary>
public static class SpecGrammar
{
    public const string FitNamePattern = "^[a-z0-9._-]+$";
    public const string CoefficientNamePattern = "^[A-Za-z_][A-Za-z0-9_]*$";
    public const string DataFilePattern = "\\.([cCtT][sS][vV]|[pP][aA][rR][qQ][uU][eE][tT])$";

    /// <summary>A query holds at least one character that is not white space.</summary>
    public const string QueryPattern = "\\S";

    private static readonly TextShape Text = TextShape.Any;
    private static readonly OneOrListShape Names = new(Text);
    private static readonly NumberShape AnyNumber = new(NumberRange.Any);

    private static KeySpec Key(string name, ValueShape shape, string description) => new(name, shape, false, description);

    private static KeySpec Must(string name, ValueShape shape, string description) => new(name, shape, true, description);

    private static NumberShape Number(NumberRange range) => new(range);

    private static NumberShape Whole(NumberRange range) => new(range, Integer: true);

    private static KeySpec KindKey(string what) => Must(KindedShape.Discriminator, Text, what);

    // data

    public static readonly WordShape<MissingPolicy> MissingPolicies = new(
        new Word<MissingPolicy>("error", MissingPolicy.Error),
        new Word<MissingPolicy>("drop", MissingPolicy.Drop));

    public static readonly SectionGrammar Data = new(
        "data",
        "Where the observations come from: a CSV/TSV or Parquet file, or an SQLite query.",
        [
            Key("path", new TextShape(DataFilePattern), "Data file relative to the spec: .csv (comma) or .tsv (tab) with a header row, or .parquet (numeric columns)."),
            Key("sqlite", Text, "SQLite database file relative to the spec, opened read-only; use with 'query'."),
            Key("query", new TextShape(QueryPattern), "One SELECT statement run on the 'sqlite' database; its result columns are the data's columns."),
            Key("filter", Text, "Row filter expression, e.g. \"load_kg >= 0\"; rows where it is false are left out."),
            Key("weight", Text, "Observation weight: a column or expression, greater than 0 (default 1)."),
            Key("missing", MissingPolicies, "'error' (default): a missing or non-numeric used value is an error; 'drop': such rows are left out and counted."),
        ],
        [
            new AtLeastOneOf(["path", "sqlite"]),
            new NotWith("path", ["sqlite"]),
            new NeedsAlso("sqlite", "query"),
            new NeedsAlso("query", "sqlite"),
        ]);

    // model.terms

    private const int FewestKnots = 2;

    public static readonly SectionGrammar Polynomial = new(
        "polynomial term",
        "Powers 1..degree of one input, coefficients <name>1 .. <name>degree (no constant).",
        [
            Must("polynomial", Text, "The input: a column or expression."),
            Must("degree", Whole(NumberRange.Between(1, 30)), "Highest power, 1 to 30."),
        ]);

    public static readonly SectionGrammar Spline = new(
        "spline term",
        "Clamped B-spline basis of one input, coefficients <name>1 .. <name>(knots+degree-1).",
        [
            Must("spline", Text, "The input: a column or expression."),
            Key("knots", Whole(NumberRange.AtLeast(FewestKnots)), "Number of knots, both boundary knots counted (at least 2); spaced uniformly over the input's range unless 'at' lists them."),
            Key("degree", Whole(NumberRange.Between(0, 10)), "Polynomial degree of the pieces, 0 to 10 (default 3)."),
            Key("at", new ListShape(AnyNumber, MinItems: FewestKnots), "Knot positions, strictly increasing, both ends included."),
        ],
        [new AtLeastOneOf(["knots", "at"])]);

    public static readonly SectionGrammar Columns = new(
        "columns term",
        "One coefficient per data column whose name matches a glob, named after the column.",
        [Must("columns", Text, "Glob over the data's column names, e.g. \"a*\".")]);

    /// <summary>The basis expanders, told apart by which of their first keys a term has (in this order).</summary>
    public static IReadOnlyList<SectionGrammar> TermExpanders { get; } = [Polynomial, Spline, Columns];

    public static readonly NameMapShape Terms = new(
        new ChoiceShape([new TextShape(What: "A constant (1), a column or an expression: one coefficient."), new SectionShape(Polynomial), new SectionShape(Spline), new SectionShape(Columns)]),
        CoefficientNamePattern,
        MinEntries: 1);

    public static readonly SectionGrammar Model = new(
        "model",
        "What is fitted: the response and the ordered basis terms.",
        [
            Must("response", Text, "The measured value: a column or expression."),
            Must("terms", Terms, "Ordered coefficient name -> basis: a constant (1), a column, an expression, or {polynomial: ...}, {spline: ...}, {columns: ...}."),
        ]);

    // loss

    private static SectionGrammar LossSection(string kind, string description, params KeySpec[] parameter) =>
        new($"loss '{kind}'", description, [KindKey("The kind of loss."), .. parameter]);

    private static readonly SectionGrammar NoParameterLoss = new("loss without parameters", "A loss without parameters.", [KindKey("The kind of loss.")]);

    public static readonly KindedShape<LossKind> Loss = new(
        "loss",
        "Each observation's penalty: a bare word (l2, l1, linf, minimax, none) or a mapping {kind: ..., parameter: ...}; default l2.",
        true,
        new KindVariant<LossKind>("l2", LossKind.L2, NoParameterLoss),
        new KindVariant<LossKind>("l1", LossKind.L1, NoParameterLoss),
        new KindVariant<LossKind>("linf", LossKind.Linf, NoParameterLoss),
        new KindVariant<LossKind>("minimax", LossKind.Linf, NoParameterLoss, AliasOf: "linf"),
        new KindVariant<LossKind>("quantile", LossKind.Quantile, LossSection(
            "quantile", "Check loss for the tau-quantile.", Must("tau", Number(NumberRange.Inside(0, 1)), "The quantile, strictly between 0 and 1."))),
        new KindVariant<LossKind>("huber", LossKind.Huber, LossSection(
            "huber", "Quadratic inside the width, linear (slope 2*width) outside.", Must("width", Number(NumberRange.Above(0)), "Where the loss turns linear, greater than 0."))),
        new KindVariant<LossKind>("deadzone", LossKind.Deadzone, LossSection(
            "deadzone", "Absolute residual beyond a free band.", Must("width", Number(NumberRange.AtLeast(0)), "Half-width of the free band, 0 or more."))),
        new KindVariant<LossKind>("log-barrier", LossKind.LogBarrier, LossSection(
            "log-barrier", "Barrier that keeps every residual inside the limit.", Must("limit", Number(NumberRange.Above(0)), "The residual limit, greater than 0."))),
        new KindVariant<LossKind>("lp", LossKind.Lp, LossSection(
            "lp", "Absolute residual to the power p.", Must("p", Number(NumberRange.Above(1)), "The power, greater than 1."))),
        new KindVariant<LossKind>("truncated-l2", LossKind.TruncatedL2, LossSection(
            "truncated-l2", "Squared residual capped at cap^2 (non-convex, solved locally).", Must("cap", Number(NumberRange.Above(0)), "Residual size beyond which the loss stays flat, greater than 0."))),
        new KindVariant<LossKind>("none", LossKind.None, NoParameterLoss));

    // penalties

    private static readonly KeySpec PenaltyWeight = Must("weight", Number(NumberRange.AtLeast(0)), "The penalty's multiplier, 0 or more.");
    private static readonly KeySpec PenaltyOn = Key("on", Names, "Coefficient names or globs (default: every coefficient except constant terms).");

    public static readonly SectionGrammar NormPenalty = new(
        "l1/l2 penalty",
        "Sum of absolute values (l1) or squares (l2) of the listed coefficients, times the weight.",
        [KindKey("The kind of penalty."), PenaltyWeight, PenaltyOn]);

    public static readonly WordShape<bool> SmoothnessNorms = new(new Word<bool>("l1", true), new Word<bool>("l2", false));

    public static readonly SectionGrammar SmoothnessPenalty = new(
        "smoothness penalty",
        "Sum of squared order-th differences of adjacent listed coefficients, times the weight.",
        [
            KindKey("The kind of penalty."),
            PenaltyWeight,
            PenaltyOn,
            Key("order", Whole(NumberRange.Between(1, 10)), "Order of the differences, 1 to 10 (default 2)."),
            Key("norm", SmoothnessNorms, "l2 (default): squared differences; l1: absolute differences."),
        ]);

    public static readonly SectionGrammar CountPenalty = new(
        "count penalty",
        "At most 'max' of the listed coefficients are non-zero (mixed-integer; needs finite bounds on them).",
        [
            KindKey("The kind of penalty."),
            PenaltyOn,
            Must("max", Whole(NumberRange.AtLeast(0)), "The most coefficients allowed to be non-zero, 0 or more."),
        ]);

    public static readonly KindedShape<PenaltyKind> Penalty = new(
        "a penalty",
        "A term added to the objective.",
        false,
        new KindVariant<PenaltyKind>("l1", PenaltyKind.L1, NormPenalty),
        new KindVariant<PenaltyKind>("l2", PenaltyKind.L2, NormPenalty),
        new KindVariant<PenaltyKind>("smoothness", PenaltyKind.Smoothness, SmoothnessPenalty),
        new KindVariant<PenaltyKind>("count", PenaltyKind.Count, CountPenalty));

    // constraints

    private static readonly NameMapShape InputValues = new(AnyNumber);

    public static readonly SectionGrammar Bounds = new(
        "a bounds constraint",
        "Lower and/or upper bounds on coefficients.",
        [
            KindKey("The kind of constraint."),
            Key("on", Names, "Coefficient names or globs (default: every coefficient)."),
            Key("min", AnyNumber, "Lower bound."),
            Key("max", AnyNumber, "Upper bound."),
        ],
        [new AtLeastOneOf(["min", "max"])]);

    public static readonly SectionGrammar Shapes = new(
        "a shape constraint",
        "The fitted curve is increasing, decreasing, convex or concave in one input over a whole range.",
        [
            KindKey("The kind of constraint."),
            Must("in", Text, "The input the shape is about."),
            Must("over", new ListShape(AnyNumber, MinItems: 2, MaxItems: 2), "The range [from, to], from < to."),
            Key("at", InputValues, "Values of the model's other inputs (required when it has any)."),
            Key("grid", Whole(NumberRange.Between(2, 100000)), "Grid points where the derivative is constrained, both ends included (default 101)."),
        ]);

    public static readonly SectionGrammar ValueAt = new(
        "a value constraint",
        "The fitted value at one point equals a number or lies within bounds.",
        [
            KindKey("The kind of constraint."),
            Must("at", InputValues, "The point: a value for every input of the model."),
            Key("equals", AnyNumber, "The fitted value there."),
            Key("min", AnyNumber, "Lowest fitted value allowed there."),
            Key("max", AnyNumber, "Highest fitted value allowed there."),
        ],
        [new AtLeastOneOf(["equals", "min", "max"]), new NotWith("equals", ["min", "max"])]);

    public static readonly SectionGrammar ResidualBand = new(
        "a residuals constraint",
        "Every unweighted residual within a band.",
        [
            KindKey("The kind of constraint."),
            Must("max-abs", Number(NumberRange.AtLeast(0)), "Largest |y - f(x)| allowed, 0 or more."),
        ]);

    public static readonly KindedShape<ConstraintKind> ConstraintObject = new(
        "a constraint",
        "A constraint object; a linear relation of coefficients is written as a string instead.",
        false,
        new KindVariant<ConstraintKind>("bounds", ConstraintKind.Bounds, Bounds),
        new KindVariant<ConstraintKind>("increasing", ConstraintKind.Increasing, Shapes),
        new KindVariant<ConstraintKind>("decreasing", ConstraintKind.Decreasing, Shapes),
        new KindVariant<ConstraintKind>("convex", ConstraintKind.Convex, Shapes),
        new KindVariant<ConstraintKind>("concave", ConstraintKind.Concave, Shapes),
        new KindVariant<ConstraintKind>("value", ConstraintKind.Value, ValueAt),
        new KindVariant<ConstraintKind>("residuals", ConstraintKind.Residuals, ResidualBand));

    // solve

    public static readonly WordShape<SolveMethod> SolveMethods = new(
        new Word<SolveMethod>("auto", SolveMethod.Auto),
        new Word<SolveMethod>("qr", SolveMethod.Qr),
        new Word<SolveMethod>("simplex", SolveMethod.Simplex),
        new Word<SolveMethod>("ipm", SolveMethod.Ipm));

    public static readonly WordShape<LpForm> LpForms = new(
        new Word<LpForm>("auto", LpForm.Auto),
        new Word<LpForm>("primal", LpForm.Primal),
        new Word<LpForm>("dual", LpForm.Dual));

    public static readonly SectionGrammar Solve = new(
        "solve",
        "How the lowered program is solved.",
        [
            Key("method", SolveMethods, "auto (default), qr (closed form), simplex or ipm (interior point)."),
            Key("time-limit", Number(NumberRange.Above(0)), "Seconds the solver may take, greater than 0."),
            Key("formulation", LpForms, "For LP fits: solve the program as lowered (primal), its LP dual (dual), or whichever is measured faster for the loss (auto, default)."),
        ]);

    // report

    public static readonly WordShape<ReportFormat> ReportFormats = new(
        new Word<ReportFormat>("html", ReportFormat.Html),
        new Word<ReportFormat>("md", ReportFormat.Md),
        new Word<ReportFormat>("markdown", ReportFormat.Md, AliasOf: "md"),
        new Word<ReportFormat>("json", ReportFormat.Json));

    public static readonly SectionGrammar Uncertainty = new(
        "report.uncertainty",
        "Bootstrap intervals for the coefficients by case resampling; the seed makes every run give the same intervals.",
        [
            Must("bootstrap", Whole(NumberRange.Between(10, 100000)), "Number of resamples, 10 to 100000."),
            Must("seed", Whole(NumberRange.AtLeast(0)), "Seed of the resampling, 0 or more (required, so a run can be repeated exactly)."),
            Key("level", Number(NumberRange.Inside(0, 1)), "Coverage of the intervals, strictly between 0 and 1 (default 0.95)."),
        ]);

    public static readonly SectionGrammar Report = new(
        "report",
        "What the reports contain and which files are written.",
        [
            Key("formats", new OneOrListShape(ReportFormats), "Files to write: html, md, json (default: all three)."),
            Key("accept", Names, "Acceptance rules over metrics and coefficients, e.g. \"r2 >= 0.999\"; each is PASS or FAIL in the report."),
            Key("templates", Text, "Folder with report.md.sbn / report.html.sbn replacing the built-in report templates."),
            Key("uncertainty", new SectionShape(Uncertainty), "Bootstrap intervals: {bootstrap: N, seed: S} with optional level."),
        ]);

    // the file

    public static readonly SectionGrammar Root = new(
        "the spec",
        "A FitSpec fit specification (spec language version 1): one fit per file.",
        [
            Must("fitspec", Whole(NumberRange.Exactly(1)), "Format version of the spec language: 1."),
            Key("name", new TextShape(FitNamePattern), "Fit name for the output files, [a-z0-9._-]+ (default: the file name without .fit.yaml)."),
            Key("title", Text, "One-line title shown in the report."),
            Key("description", Text, "Free text shown in the report."),
            Must("data", new SectionShape(Data), "Where the observations come from."),
            Must("model", new SectionShape(Model), "The response and the basis terms."),
            Key("loss", Loss, "How residuals are scored (default l2)."),
            Key("penalties", new ListShape(Penalty), "Terms added to the objective."),
            Key("constraints", new ListShape(new ChoiceShape([new TextShape(What: "A linear relation of coefficients with <=, >= or ==, e.g. \"b1 >= 0\"."), ConstraintObject])), "Relations such as \"b1 >= 0\" and constraint objects {kind: ...}."),
            Key("solve", new SectionShape(Solve), "Solver choices."),
            Key("report", new SectionShape(Report), "Report formats, acceptance rules, templates and intervals."),
        ]);
}
