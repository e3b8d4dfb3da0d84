using FitSpec.Diagnostics;
using FitSpec.Spec;

namespace FitSpec.Design;

/// <summary>
/// Refuses a design whose coefficients the data cannot separate — linearly dependent columns — unless a
/// quadratic penalty (l2, or squared smoothness) makes the objective strictly convex in every such direction.
/// The test is a Householder QR, in model order, of the internal columns (weighted by √w, each scaled to unit
/// length) stacked over the penalty rows (each scaled to unit length, so the test is structural and does not
/// depend on λ): a column whose distance from the span of the earlier kept ones, |R_kk|, is at most
/// <see cref="Tolerance"/> is dependent, and the coefficients of that combination are named. A fit whose
/// loss is 'none' is not tested: there the data enter only through constraints.
/// </summary>
public static class RankCheck
{
    /// <summary>|R_kk| of a unit-length column at or below this counts as dependent on the earlier columns.</summary>
    public const double Tolerance = 1e-11;

    /// <summary>A coefficient belongs to a dependency when its share of it is above this fraction of the largest.</summary>
    public const double InvolvementCutoff = 1e-6;

    public static IReadOnlyList<Diagnostic> Diagnose(FitSpecDocument spec, Design design, IReadOnlyList<IReadOnlyList<int>> penaltyTargets)
    {
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(design);
        ArgumentNullException.ThrowIfNull(penaltyTargets);
        var p = design.P;
        // Without a loss the data only constrain (basis pursuit); with a count penalty the chosen support, not
        // the full design, is what must be determined, and selecting among dependent candidates is its job.
        if (spec.Loss.Kind == LossKind.None || p == 0 || spec.Penalties.Any(q => q.Kind == PenaltyKind.Count))
        {
            return [];
        }

        var penaltyRows = PenaltyRows(spec, design, penaltyTargets);
        var n = design.Rows;
        var m = n + penaltyRows.Count;
        if (m < p)
        {
            return [TooFewRows(spec, n, p)];
        }

        // Unit-length data columns, then each penalty row at unit length in those scaled coordinates.
        var dataScale = new double[p];
        var columns = new double[p][];
        for (var j = 0; j < p; j++)
        {
            var col = new double[m];
            var x = design.X[j];
            for (var i = 0; i < n; i++)
            {
                col[i] = Math.Sqrt(design.Weight(i)) * x[i];
            }

            var norm = Norm(col);
            dataScale[j] = norm > 0 ? norm : 1;
            for (var i = 0; i < n; i++)
            {
                col[i] /= dataScale[j];
            }

            columns[j] = col;
        }

        for (var r = 0; r < penaltyRows.Count; r++)
        {
            var row = penaltyRows[r];
            var norm = Math.Sqrt(row.Sum(e => (e.Value / dataScale[e.Index]) * (e.Value / dataScale[e.Index])));
            foreach (var e in row)
            {
                columns[e.Index][n + r] += e.Value / dataScale[e.Index] / norm;
            }
        }

        var stackScale = new double[p];
        for (var j = 0; j < p; j++)
        {
            var norm = Norm(columns[j]);
            stackScale[j] = norm > 0 ? norm : 1;
            for (var i = 0; i < m; i++)
            {
                columns[j][i] /= stackScale[j];
            }
        }

        var errors = new List<Diagnostic>();
        foreach (var (k, combination) in Dependencies(columns, Tolerance))
        {
            // Σ v_j a_j = 0 over the scaled columns; v_j / (scale) is the same direction in θ, and M θ in β.
            var theta = new double[p];
            theta[k] = 1 / (dataScale[k] * stackScale[k]);
            foreach (var (j, c) in combination)
            {
                theta[j] = -c / (dataScale[j] * stackScale[j]);
            }

            errors.Add(Describe(spec, design, k, design.ToRaw(theta), penaltyRows.Count > 0));
        }

        return errors;
    }

    /// <summary>The error for fewer rows (data plus penalty rows) than coefficients, at `model.terms`.</summary>
    public static Diagnostic TooFewRows(FitSpecDocument spec, int rows, int coefficients)
    {
        ArgumentNullException.ThrowIfNull(spec);
        var at = TermsKeyPosition.Of(spec);
        return new Diagnostic(at.File, at.Line, at.Column, "model.terms", $"{rows} rows cannot determine {coefficients} coefficients; add data, remove terms or add an l2 penalty");
    }

    /// <summary>
    /// For each column (in order) within <paramref name="tolerance"/> of the span of the earlier independent
    /// ones: its index and the combination of those it equals, a_k ≈ Σ c_j a_j. Columns must be unit length.
    /// </summary>
    internal static List<(int Column, List<(int Index, double Weight)> Combination)> Dependencies(double[][] columns, double tolerance)
    {
        var found = new List<(int, List<(int, double)>)>();
        var m = columns.Length == 0 ? 0 : columns[0].Length;
        var reflectors = new List<(double[] V, double Beta)>();
        var kept = new List<int>();
        var r = new List<double[]>();
        foreach (var (a, k) in columns.Select((a, k) => (a, k)))
        {
            var w = (double[])a.Clone();
            for (var q = 0; q < reflectors.Count; q++)
            {
                var (v, beta) = reflectors[q];
                double dot = 0;
                for (var i = q; i < m; i++)
                {
                    dot += v[i] * w[i];
                }

                dot *= beta;
                for (var i = q; i < m; i++)
                {
                    w[i] -= dot * v[i];
                }
            }

            var rank = kept.Count;
            double rest = 0;
            for (var i = rank; i < m; i++)
            {
                rest += w[i] * w[i];
            }

            rest = Math.Sqrt(rest);
            if (rest <= tolerance)
            {
                // Back-substitution R c = (Q'a)[0..rank).
                var c = new double[rank];
                for (var q = rank - 1; q >= 0; q--)
                {
                    var s = w[q];
                    for (var t = q + 1; t < rank; t++)
                    {
                        s -= r[t][q] * c[t];
                    }

                    c[q] = s / r[q][q];
                }

                found.Add((k, Enumerable.Range(0, rank).Select(q => (kept[q], c[q])).ToList()));
                continue;
            }

            var alpha = w[rank] > 0 ? -rest : rest;
            var u = new double[m];
            u[rank] = w[rank] - alpha;
            for (var i = rank + 1; i < m; i++)
            {
                u[i] = w[i];
            }

            double utu = 0;
            for (var i = rank; i < m; i++)
            {
                utu += u[i] * u[i];
            }

            reflectors.Add((u, 2 / utu));
            var column = new double[rank + 1];
            Array.Copy(w, column, rank);
            column[rank] = alpha;
            r.Add(column);
            kept.Add(k);
        }

        return found;
    }

    // The rows of every quadratic penalty over θ, unweighted: l2 gives row j of M per coefficient, squared
    // smoothness the k-th differences of the listed coefficients in order.
    private static List<Entry[]> PenaltyRows(FitSpecDocument spec, Design design, IReadOnlyList<IReadOnlyList<int>> targets)
    {
        var rows = new List<Entry[]>();
        for (var k = 0; k < spec.Penalties.Count && k < targets.Count; k++)
        {
            var pen = spec.Penalties[k];
            if (!(pen.Weight > 0))
            {
                continue;
            }

            var on = targets[k];
            if (pen.Kind == PenaltyKind.L2)
            {
                rows.AddRange(on.Select(j => design.RawFromInternal[j]));
            }
            else if (pen.Kind == PenaltyKind.Smoothness && !pen.NormL1)
            {
                var order = pen.Order ?? 2;
                for (var i = 0; i + order < on.Count; i++)
                {
                    var raw = new double[design.P];
                    double binomial = 1;
                    for (var t = 0; t <= order; t++)
                    {
                        raw[on[i + t]] += ((order - t) % 2 == 0 ? 1 : -1) * binomial;
                        binomial = binomial * (order - t) / (t + 1);
                    }

                    rows.Add(design.ToInternal(raw));
                }
            }
        }

        return rows.Where(r => r.Length > 0).ToList();
    }

    private static Diagnostic Describe(FitSpecDocument spec, Design design, int column, double[] direction, bool penalised)
    {
        var coefficients = design.Coefficients;
        var term = spec.Model.Terms.FirstOrDefault(t => t.Key == coefficients[column].TermKey);
        var pos = term?.Pos ?? spec.Model.Pos;
        if (design.X[column].All(v => v == 0))
        {
            return new Diagnostic(pos.File, pos.Line, pos.Column, "model.terms",
                $"coefficient '{coefficients[column].Name}' multiplies a column that is zero on every row used{(design.Terms.Any(t => t.Spline is not null && column >= t.First && column < t.First + t.Count) ? " (no data lies where its B-spline is non-zero: move or remove knots)" : "")}, so the data cannot determine it; remove it or add an l2 penalty on it");
        }

        // Each coefficient's share of the cancelling combination Σ β_j x_j = 0, in the user's raw basis.
        var share = new double[design.P];
        for (var j = 0; j < design.P; j++)
        {
            share[j] = Math.Abs(direction[j]) * Norm(design.RawX[j]);
        }

        var largest = share.Max();
        var involved = Enumerable.Range(0, design.P).Where(j => share[j] > InvolvementCutoff * largest || j == column).ToList();
        if (involved.Count == 1)
        {
            return new Diagnostic(pos.File, pos.Line, pos.Column, "model.terms",
                $"coefficient '{coefficients[column].Name}' is not determined by the data (its column is numerically zero in the rows used); remove it or add an l2 penalty on it (rank test: QR of the unit-scaled columns, |R_kk| <= {Tolerance:G2})");
        }

        var names = NameList(design, involved);
        var why = Reason(design, involved);
        var penalties = penalised ? "; the penalties given leave this combination unpenalised" : "";
        return new Diagnostic(pos.File, pos.Line, pos.Column, "model.terms",
            $"coefficients {names} are linearly dependent in the rows used{why}, so the fit has no unique solution{penalties}; remove a term, or add an l2 penalty on them to make it strictly convex (rank test: QR of the unit-scaled columns, |R_kk| <= {Tolerance:G2})");
    }

    private static string Reason(Design design, List<int> involved)
    {
        var set = involved.ToHashSet();
        var whole = design.Terms.Where(t => t.Spline is not null && t.Count > 0 && Enumerable.Range(t.First, t.Count).All(set.Contains)).ToList();
        var constant = involved.Where(j => design.Coefficients[j].IsConstant).Select(j => design.Coefficients[j].Name).FirstOrDefault();
        if (whole.Count == 1 && constant is not null)
        {
            return $" (the spline basis of '{whole[0].Key}' sums to one, like the constant '{constant}')";
        }

        if (whole.Count >= 2)
        {
            return $" (the spline bases of {string.Join(" and ", whole.Select(t => $"'{t.Key}'"))} each sum to one)";
        }

        return "";
    }

    // 'b0' and 's1'…'s8': runs of three or more consecutive coefficients of one term are shortened.
    internal static string NameList(Design design, IReadOnlyList<int> indices)
    {
        var parts = new List<string>();
        var k = 0;
        while (k < indices.Count)
        {
            var end = k;
            while (end + 1 < indices.Count && indices[end + 1] == indices[end] + 1
                && design.Coefficients[indices[end + 1]].TermKey == design.Coefficients[indices[k]].TermKey)
            {
                end++;
            }

            if (end - k >= 2)
            {
                parts.Add($"'{design.Coefficients[indices[k]].Name}'…'{design.Coefficients[indices[end]].Name}'");
                k = end + 1;
            }
            else
            {
                parts.Add($"'{design.Coefficients[indices[k]].Name}'");
                k++;
            }
        }

        return parts.Count == 1 ? parts[0] : $"{string.Join(", ", parts.Take(parts.Count - 1))} and {parts[^1]}";
    }

    private static double Norm(double[] v)
    {
        double scale = 0, ssq = 1;
        foreach (var x in v)
        {
            var a = Math.Abs(x);
            if (a == 0)
            {
                continue;
            }

            if (scale < a)
            {
                ssq = 1 + (ssq * (scale / a) * (scale / a));
                scale = a;
            }
            else
            {
                ssq += (a / scale) * (a / scale);
            }
        }

        return scale * Math.Sqrt(ssq);
    }
}
