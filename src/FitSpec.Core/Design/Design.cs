using FitSpec.Data;
using FitSpec.Expressions;

namespace FitSpec.Design;

/// <summary>A coefficient as the user sees it (raw basis), and the term that made it.</summary>
public sealed record Coefficient(string Name, string TermKey, bool IsConstant);

/// <summary>
/// Where one model term's coefficients sit (First … First+Count-1) and which data columns its basis reads.
/// For a spline term, its basis and the input expression the basis is evaluated at.
/// </summary>
public sealed record TermLayout(string Key, int First, int Count, IReadOnlyList<string> Inputs, BSplineBasis? Spline = null, Expr? SplineInput = null)
{
    /// <summary>The column a spline is directly in, when its input is a bare column.</summary>
    public string? SplineColumn => SplineInput is ColumnExpr c ? c.Name : null;

    /// <summary>The spline's input at a point that gives every column it reads.</summary>
    public double SplineInputAt(IReadOnlyDictionary<string, double> point) =>
        ExpressionEvaluator.EvaluateScalar(SplineInput ?? throw new InvalidOperationException($"term '{Key}' is not a spline"), name => point[name]);
}

/// <summary>One entry of a sparse row.</summary>
public readonly record struct Entry(int Index, double Value);

/// <summary>
/// The numbers a fit is made of. X holds the internal basis (polynomials centred and scaled; splines are their
/// own internal basis), one array per
/// internal coefficient θ; RawX holds the raw basis (the same arrays where a term is not transformed) and
/// RawXLow the rounding error of computed raw columns such as powers (null where RawX is exact). The
/// user's raw coefficients are β = M θ, with M given row by row in RawFromInternal (identity rows for plain
/// terms). Everything the user writes about coefficients is over β.
/// </summary>
public sealed record Design(
    Table Table,
    double[] Y,
    double[]? W,
    double[][] X,
    double[][] RawX,
    double[]?[] RawXLow,
    IReadOnlyList<Coefficient> Coefficients,
    IReadOnlyList<Entry[]> RawFromInternal,
    IReadOnlyList<string> Inputs,
    bool ConstantInSpan,
    RawBasis Basis,
    IReadOnlyList<TermLayout>? Layout = null)
{
    public int Rows => Y.Length;

    /// <summary>Each term's coefficients and inputs, in model order (empty for a design built without them).</summary>
    public IReadOnlyList<TermLayout> Terms => Layout ?? [];

    public int P => Coefficients.Count;

    public double Weight(int i) => W is null ? 1.0 : W[i];

    /// <summary>β = M θ.</summary>
    public double[] ToRaw(ReadOnlySpan<double> theta)
    {
        var beta = new double[P];
        for (var j = 0; j < P; j++)
        {
            double s = 0;
            foreach (var e in RawFromInternal[j])
            {
                s += e.Value * theta[e.Index];
            }

            beta[j] = s;
        }

        return beta;
    }

    /// <summary>A row over β written over θ: a'M.</summary>
    public Entry[] ToInternal(ReadOnlySpan<double> rawRow)
    {
        var acc = new double[P];
        var touched = false;
        for (var j = 0; j < P; j++)
        {
            if (rawRow[j] == 0)
            {
                continue;
            }

            touched = true;
            foreach (var e in RawFromInternal[j])
            {
                acc[e.Index] += rawRow[j] * e.Value;
            }
        }

        if (!touched)
        {
            return [];
        }

        var list = new List<Entry>();
        for (var k = 0; k < P; k++)
        {
            if (acc[k] != 0)
            {
                list.Add(new Entry(k, acc[k]));
            }
        }

        return [.. list];
    }

    /// <summary>
    /// The design on the given rows (repeats allowed), keeping this design's basis — centring, scaling, knots —
    /// so that coefficients mean the same on the subset.
    /// </summary>
    public Design Subset(IReadOnlyList<int> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        double[] Pick(double[] v)
        {
            var picked = new double[rows.Count];
            for (var i = 0; i < picked.Length; i++)
            {
                picked[i] = v[rows[i]];
            }

            return picked;
        }

        var lines = new int[rows.Count];
        for (var i = 0; i < lines.Length; i++)
        {
            lines[i] = Table.Lines[rows[i]];
        }

        var table = Table with
        {
            Columns = Table.Columns.ToDictionary(kv => kv.Key, kv => Pick(kv.Value), StringComparer.Ordinal),
            Lines = lines,
        };
        return this with
        {
            Table = table,
            Y = Pick(Y),
            W = W is null ? null : Pick(W),
            X = X.Select(Pick).ToArray(),
            RawX = RawX.Select(Pick).ToArray(),
            RawXLow = RawXLow.Select(v => v is null ? null : Pick(v)).ToArray(),
        };
    }

    /// <summary>Fitted values X θ in the internal basis.</summary>
    public double[] Fitted(ReadOnlySpan<double> theta)
    {
        var f = new double[Rows];
        for (var k = 0; k < P; k++)
        {
            var t = theta[k];
            if (t == 0)
            {
                continue;
            }

            var col = X[k];
            for (var i = 0; i < f.Length; i++)
            {
                f[i] += t * col[i];
            }
        }

        return f;
    }
}

/// <summary>
/// Evaluates the raw basis functions (one per coefficient, in order) at a point, with first and second
/// derivatives in one chosen input — what value and shape constraints are made of.
/// </summary>
public sealed class RawBasis
{
    private readonly IReadOnlyList<Func<Func<string, Jet>, IEnumerable<Jet>>> _terms;

    internal RawBasis(IReadOnlyList<Func<Func<string, Jet>, IEnumerable<Jet>>> terms)
    {
        _terms = terms;
    }

    /// <summary>φ_j at the point; <paramref name="variable"/> (if any) carries derivative 1.</summary>
    public Jet[] At(IReadOnlyDictionary<string, double> point, string? variable)
    {
        ArgumentNullException.ThrowIfNull(point);
        Jet Input(string name) => name == variable ? Jet.Variable(point[name]) : Jet.Constant(point[name]);
        return _terms.SelectMany(t => t(Input)).ToArray();
    }
}
