using FitSpec.Data;
using FitSpec.Diagnostics;
using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Design;

/// <summary>Stage 3: table + compiled model → <see cref="Design"/> (response, weights, basis columns).</summary>
public static class DesignBuilder
{
    public static Design Build(FitSpecDocument spec, CompiledModel model, Table table)
    {
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(table);
        var errors = new List<Diagnostic>();
        var n = table.RowCount;
        double[] Column(string name) => table.Columns[name];

        var y = Finite(ExpressionEvaluator.Evaluate(model.Response.Root!, Column, n), table, "response", spec.Model.Response.Value, errors);
        double[]? w = null;
        if (model.Weight is { Root: { } wRoot })
        {
            w = ExpressionEvaluator.Evaluate(wRoot, Column, n);
            for (var i = 0; i < n; i++)
            {
                if (!(w[i] > 0) || !double.IsFinite(w[i]) || w[i] > WeightLimit)
                {
                    errors.Add(new Diagnostic(table.ErrorPath, table.Lines[i], null, spec.Data.Weight!.Value, $"weight must be a finite number > 0 and at most {WeightLimit:G1}, got {w[i]}"));
                    if (errors.Count > 20)
                    {
                        break;
                    }
                }
            }
        }

        var hasConstant = model.Terms.Any(t => t.Expression is { IsConstant: true } && t.Spec is ExpressionTerm);
        var coefficients = new List<Coefficient>();
        var internalCols = new List<double[]>();
        var rawCols = new List<double[]>();
        var rawLow = new List<double[]?>();
        var rawMap = new List<List<Entry>>();
        var basis = new List<Func<Func<string, Jet>, IEnumerable<Jet>>>();
        var inputs = new List<string>();
        int? constantIndex = null;
        double constantValue = 1;
        var shifts = new List<(int First, int Degree, double Center, double Scale)>();
        var layout = new List<TermLayout>();

        foreach (var term in model.Terms)
        {
            var firstIndex = coefficients.Count;
            BSplineBasis? spline = null;
            switch (term.Spec)
            {
                case ExpressionTerm et:
                    {
                        var root = term.Expression!.Root!;
                        var isConstant = term.Expression.IsConstant;
                        double[] col;
                        if (isConstant)
                        {
                            var value = ExpressionEvaluator.EvaluateScalar(root, _ => double.NaN);
                            if (!double.IsFinite(value) || value == 0 || Math.Abs(value) > MagnitudeLimit)
                            {
                                var at = et.Expression.Pos;
                                errors.Add(new Diagnostic(at.File, at.Line, at.Column, $"model.terms.{et.Key}", $"constant term '{et.Expression.Value}' must be a non-zero number within ±{MagnitudeLimit:G1}"));
                                value = 1;
                            }

                            col = new double[n];
                            Array.Fill(col, value);
                            if (constantIndex is null)
                            {
                                constantIndex = coefficients.Count;
                                constantValue = value;
                            }
                        }
                        else
                        {
                            col = Finite(ExpressionEvaluator.Evaluate(root, Column, n), table, et.Key, et.Expression.Value, errors);
                            inputs.AddRange(term.Expression.Columns);
                        }

                        Reserve(1, et.Expression.Pos, et.Key);
                        Add(et.Key, et.Key, isConstant, col, col);
                        basis.Add(input => [ExpressionEvaluator.EvaluateJet(root, input)]);
                        break;
                    }

                case PolynomialTerm pt:
                    {
                        var root = term.Expression!.Root!;
                        inputs.AddRange(term.Expression.Columns);
                        var u = Finite(ExpressionEvaluator.Evaluate(root, Column, n), table, pt.Key, pt.Input.Value, errors);
                        Reserve(pt.Degree, pt.Input.Pos, pt.Key);
                        AddPolynomial(pt, u, hasConstant);
                        var degree = pt.Degree;
                        basis.Add(input =>
                        {
                            var x = ExpressionEvaluator.EvaluateJet(root, input);
                            var powers = new Jet[degree];
                            var power = x;
                            for (var k = 0; k < degree; k++)
                            {
                                powers[k] = power;
                                power *= x;
                            }

                            return powers;
                        });
                        break;
                    }

                case ColumnsTerm ct:
                    {
                        var matched = Glob.Filter(table.Header, ct.Glob.Value).ToList();
                        if (matched.Count == 0)
                        {
                            var at = ct.Glob.Pos;
                            errors.Add(new Diagnostic(at.File, at.Line, at.Column, $"model.terms.{ct.Key}", $"no data column matches '{ct.Glob.Value}'; columns are: {string.Join(", ", table.Header)}"));
                        }

                        Reserve(matched.Count, ct.Glob.Pos, ct.Key);
                        foreach (var name in matched)
                        {
                            var col = Finite(table.Columns[name], table, name, name, errors);
                            Add(name, ct.Key, false, col, col);
                            inputs.Add(name);
                            var captured = name;
                            basis.Add(input => [input(captured)]);
                        }

                        break;
                    }

                case SplineTerm st:
                    {
                        // Splines are their own internal basis: their columns are bounded by 1 and sum to one.
                        var root = term.Expression!.Root!;
                        inputs.AddRange(term.Expression.Columns);
                        var u = Finite(ExpressionEvaluator.Evaluate(root, Column, n), table, st.Key, st.Input.Value, errors);
                        spline = SplineColumns.Basis(st, u, table, errors);
                        if (spline is null)
                        {
                            break;
                        }

                        Reserve(spline.Count, st.Input.Pos, st.Key);
                        var columns = SplineColumns.Columns(spline, u);
                        for (var j = 0; j < columns.Length; j++)
                        {
                            Add($"{st.Key}{j + 1}", st.Key, false, columns[j], columns[j]);
                        }

                        var captured = spline;
                        basis.Add(input => SplineColumns.Jets(captured, ExpressionEvaluator.EvaluateJet(root, input)));
                        break;
                    }
            }

            var termInputs = term.Spec is ColumnsTerm cols
                ? Glob.Filter(table.Header, cols.Glob.Value).ToList()
                : term.Expression?.Columns.ToList() ?? [];
            layout.Add(new TermLayout(term.Spec.Key, firstIndex, coefficients.Count - firstIndex, termInputs, spline, spline is null ? null : term.Expression!.Root));
        }

        foreach (var dup in coefficients.GroupBy(c => c.Name, StringComparer.Ordinal).Where(g => g.Count() > 1))
        {
            // Pointed at the term written with that very name (the one a reader renames), else the later term.
            var keys = dup.Select(c => c.TermKey).Distinct(StringComparer.Ordinal).ToList();
            var term = spec.Model.Terms.FirstOrDefault(t => t.Key == dup.Key) ?? spec.Model.Terms.Last(t => t.Key == keys[^1]);
            var others = string.Join(" and ", keys.Where(k => k != term.Key).Select(k =>
                $"'{k}' (which gives {string.Join(", ", coefficients.Where(c => c.TermKey == k).Select(c => c.Name).Take(4))}{(coefficients.Count(c => c.TermKey == k) > 4 ? ", …" : "")})"));
            var at = term.Pos;
            errors.Add(new Diagnostic(at.File, at.Line, at.Column, $"model.terms.{term.Key}",
                others.Length == 0
                    ? $"coefficient name '{dup.Key}' is given more than once by this term; rename it"
                    : $"coefficient name '{dup.Key}' is given by this term and also by term {others}; rename one of them"));
        }

        if (errors.Count > 0)
        {
            throw new FitSpecException(errors);
        }

        // A centred polynomial's constant part, Σ θ_k (-c/s)^k, belongs to the (first) constant term.
        foreach (var (first, d, c, s) in shifts)
        {
            for (var k = 1; k <= d; k++)
            {
                rawMap[constantIndex!.Value].Add(new Entry(first + k - 1, Math.Pow(-c / s, k) / constantValue));
            }
        }

        var design = new Design(
            table, y, w, [.. internalCols], [.. rawCols], [.. rawLow], coefficients,
            rawMap.Select(r => r.ToArray()).ToList(),
            inputs.Distinct(StringComparer.Ordinal).ToList(),
            ConstantInSpan: constantIndex is not null || layout.Any(t => t.Spline is not null) || SpanCheck.ContainsConstant([.. rawCols]),
            new RawBasis(basis),
            layout);
        return design;

        // Checked before a term's columns are made: past a limit the fit stops here with the term named.
        void Reserve(int count, SourcePos at, string key)
        {
            var total = (long)coefficients.Count + count;
            var message = total > DesignLimits.MaxCoefficients
                ? $"the model would have {total:N0} coefficients with this term, more than the {DesignLimits.MaxCoefficients:N0} one fit may have; select fewer columns or knots"
                : total * n > DesignLimits.MaxCells
                    ? $"the design would hold {total * n:N0} values ({n:N0} rows × {total:N0} coefficients) with this term, more than the {DesignLimits.MaxCells:N0} one fit may hold in memory; use fewer rows (a filter) or fewer coefficients"
                    : null;
            if (message is not null)
            {
                errors.Add(new Diagnostic(at.File, at.Line, at.Column, $"model.terms.{key}", message));
                throw new FitSpecException(errors);
            }
        }

        void Add(string name, string key, bool isConstant, double[] internalCol, double[] rawCol)
        {
            rawMap.Add([new Entry(coefficients.Count, 1.0)]);
            coefficients.Add(new Coefficient(name, key, isConstant));
            internalCols.Add(internalCol);
            rawCols.Add(rawCol);
            rawLow.Add(null);
        }

        // Internally z = (u - c)/s with z^k columns (centred only when a constant term can absorb the shift);
        // the raw coefficients follow from expanding ((u - c)/s)^k binomially.
        void AddPolynomial(PolynomialTerm pt, double[] u, bool center)
        {
            double c = 0;
            if (center && n > 0)
            {
                c = (u.Min() + u.Max()) / 2;
            }

            var s = 0.0;
            foreach (var v in u)
            {
                s = Math.Max(s, Math.Abs(v - c));
            }

            if (s == 0 || !double.IsFinite(s))
            {
                s = 1;
            }

            var first = coefficients.Count;
            var d = pt.Degree;
            for (var k = 1; k <= d; k++)
            {
                var z = new double[n];
                var raw = new double[n];
                var low = new double[n];
                for (var i = 0; i < n; i++)
                {
                    var zi = (u[i] - c) / s;
                    z[i] = IntPow(zi, k);
                    (raw[i], low[i]) = ExactPower(u[i], k);
                }

                // The solver sees z^k, within ±1; the raw power is only reported and converted, so it need only square.
                for (var i = 0; i < n; i++)
                {
                    if (OutOfRange(raw[i], table, i, pt.Key, $"'{pt.Input.Value}' to the power {k}", errors, PowerLimit))
                    {
                        break;
                    }
                }

                coefficients.Add(new Coefficient($"{pt.Key}{k}", pt.Key, false));
                internalCols.Add(z);
                rawCols.Add(raw);
                rawLow.Add(low);
                rawMap.Add([]);
            }

            // β_j (raw power j) = Σ_{k≥j} θ_k s^-k C(k,j) (-c)^(k-j); the j = 0 part goes to the constant term.
            for (var j = 1; j <= d; j++)
            {
                var row = new List<Entry>();
                for (var k = j; k <= d; k++)
                {
                    var m = Binomial(k, j) * Math.Pow(-c, k - j) / Math.Pow(s, k);
                    if (m != 0)
                    {
                        row.Add(new Entry(first + k - 1, m));
                    }
                }

                rawMap[first + j - 1] = row;
            }

            if (c != 0)
            {
                shifts.Add((first, d, c, s));
            }
        }
    }

    private static double IntPow(double x, int k)
    {
        var r = 1.0;
        for (var i = 0; i < k; i++)
        {
            r *= x;
        }

        return r;
    }

    // x^k as hi + lo, the rounding error of each product kept by FMA (about 32 significant digits).
    private static (double Hi, double Lo) ExactPower(double x, int k)
    {
        double hi = 1, lo = 0;
        for (var i = 0; i < k; i++)
        {
            var p = hi * x;
            var e = Math.FusedMultiplyAdd(hi, x, -p) + (lo * x);
            hi = p + e;
            lo = e - (hi - p);
        }

        return (hi, lo);
    }

    private static double Binomial(int n, int k)
    {
        double r = 1;
        for (var i = 1; i <= k; i++)
        {
            r = r * (n - k + i) / i;
        }

        return r;
    }

    /// <summary>
    /// The largest magnitude a response or basis value (a polynomial's input included) may have. The LP and QP
    /// solver treats bounds from 1e20 as infinite and refuses matrix entries from 1e15, and verified optima were
    /// measured up to 1e10 for every loss (l2 closed form and with a constraint, l1, linf; beyond it linf and
    /// constrained l1 fail verification, and at 1e15 the solver refuses the model). Reference data with values to
    /// about 1e7 stay inside (their polynomial powers, to 1e13, are fitted scaled; see <see cref="PowerLimit"/>).
    /// </summary>
    public const double MagnitudeLimit = 1e10;

    /// <summary>
    /// The largest weight and raw polynomial power: neither reaches the solver as written (weights scale rows,
    /// powers are fitted as scaled z^k), so they need only square and sum finitely (1e100² · 1e6 rows ≈ 1e206).
    /// </summary>
    public const double WeightLimit = 1e100;

    /// <summary>See <see cref="WeightLimit"/>.</summary>
    public const double PowerLimit = 1e100;

    private static double[] Finite(double[] values, Table table, string field, string text, List<Diagnostic> errors)
    {
        for (var i = 0; i < values.Length; i++)
        {
            if (OutOfRange(values[i], table, i, field, $"'{text}'", errors))
            {
                break;
            }
        }

        return values;
    }

    // One located error for a value that is not finite or beyond the magnitude limit; true when it was added.
    private static bool OutOfRange(double value, Table table, int row, string field, string what, List<Diagnostic> errors, double limit = MagnitudeLimit)
    {
        if (!double.IsFinite(value))
        {
            errors.Add(new Diagnostic(table.ErrorPath, table.Lines[row], null, field, $"{what} is not a finite number on this row ({value})"));
            return true;
        }

        if (Math.Abs(value) > limit)
        {
            errors.Add(new Diagnostic(table.ErrorPath, table.Lines[row], null, field,
                $"{what} is {value:G6} on this row, beyond ±{limit:G1}, the largest magnitude a fit takes{(limit == MagnitudeLimit ? " (the solvers lose accuracy or refuse the model past it)" : " (squares and sums of squares overflow)")}; rescale it (other units, or divide it in the expression)"));
            return true;
        }

        return false;
    }
}
