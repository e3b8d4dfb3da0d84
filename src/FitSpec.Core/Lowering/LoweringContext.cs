using FitSpec.Design;
using FitSpec.Diagnostics;
using FitSpec.Spec;

namespace FitSpec.Lowering;

/// <summary>The program under construction and what lowering units share while adding to it.</summary>
public sealed class LoweringContext
{
    internal LoweringContext(FitSpecDocument spec, Design.Design design)
    {
        Spec = spec;
        Design = design;
        Builder = new ProgramBuilder(design.Coefficients.Select(c => c.Name).ToList());
    }

    public FitSpecDocument Spec { get; }

    public Design.Design Design { get; }

    public ProgramBuilder Builder { get; }

    public List<Diagnostic> Errors { get; } = [];

    public List<LoweringNote> Notes { get; } = [];

    public List<LoweredConstraint> Constraints { get; } = [];

    /// <summary>
    /// The LP form the loss solves fastest in, by measurement (DEVELOPERS.md): the dual for the check losses
    /// (l1, quantile), the primal for linf. Null: whichever has fewer rows.
    /// </summary>
    public FitSpec.Spec.LpForm PreferredForm { get; set; } = FitSpec.Spec.LpForm.Auto;

    /// <summary>Set by a unit whose kind needs more than one program solve (see <see cref="ISolveStrategy"/>).</summary>
    public ISolveStrategy? Strategy { get; set; }

    /// <summary>Set by the l2 loss when no constraint or non-ridge penalty needs the general QP.</summary>
    public bool BuildGramHessian { get; set; } = true;

    /// <summary>Ridge rows for the closed form (√λ · row of M), collected by the l2 penalty.</summary>
    public List<Entry[]> RidgeRows { get; } = [];

    /// <summary>Each ridge row over the raw coefficients β (√λ β_j for l2, √λ times a difference for smoothness).</summary>
    public List<Entry[]> RidgeRaw { get; } = [];

    public void Error(SourcePos pos, string? field, string message) =>
        Errors.Add(new Diagnostic(pos.File, pos.Line, pos.Column, field, message));

    /// <summary>
    /// Adds the residual row of observation i: x_i'θ + Σ extras = y_i, where the extras are the loss's own
    /// variables that take up the residual (split parts, bands, quadratic parts).
    /// </summary>
    public int AddResidualRow(int i, ReadOnlySpan<Entry> extras, Origin origin)
    {
        var p = Design.P;
        var count = p + extras.Length;
        // One row per observation: no allocation per row where the row is small (the usual case).
        var entries = count <= 128 ? stackalloc Entry[count] : new Entry[count];
        var x = Design.X;
        for (var j = 0; j < p; j++)
        {
            entries[j] = new Entry(j, x[j][i]);
        }

        extras.CopyTo(entries[p..]);
        return Builder.AddRow($"r{i + 1}", Design.Y[i], Design.Y[i], entries, origin);
    }

    /// <summary>Row j of M (β_j over θ).</summary>
    public Entry[] RawRow(int j) => Design.RawFromInternal[j];

    /// <summary>A row over raw coefficients β rewritten over the internal θ.</summary>
    public Entry[] Internal(ReadOnlySpan<double> rawRow) => Design.ToInternal(rawRow);

    /// <summary>
    /// Expands on: names/globs into coefficient indices in model order; default every non-constant coefficient.
    /// Unknown names are errors with a suggestion.
    /// </summary>
    public IReadOnlyList<int> Resolve(IReadOnlyList<SpecText>? on, SourcePos pos, string field, bool includeConstants = false)
    {
        var coefficients = Design.Coefficients;
        if (on is null)
        {
            return Enumerable.Range(0, coefficients.Count).Where(j => includeConstants || !coefficients[j].IsConstant).ToList();
        }

        var chosen = new SortedSet<int>();
        foreach (var item in on)
        {
            var matched = false;
            for (var j = 0; j < coefficients.Count; j++)
            {
                if (Glob.IsMatch(coefficients[j].Name, item.Value))
                {
                    chosen.Add(j);
                    matched = true;
                }
            }

            if (!matched)
            {
                var hint = NameSuggester.Hint(item.Value, coefficients.Select(c => c.Name));
                Error(item.Pos, field, $"'{item.Value}' matches no coefficient{hint}; coefficients are: {string.Join(", ", coefficients.Select(c => c.Name))}");
            }
        }

        return [.. chosen];
    }
}
