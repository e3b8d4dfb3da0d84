using System.Globalization;
using FitSpec.Results;
using FitSpec.Spec;

namespace FitSpec.Pipeline;

/// <summary>The fit written out in plain mathematics, from the spec and the expanded coefficient list.</summary>
internal static class Statement
{
    public static FitStatement Describe(FitSpecDocument spec, Design.Design? design, IReadOnlyList<IReadOnlyList<int>>? penaltyTargets)
    {
        var model = design is null
            ? string.Join(" + ", spec.Model.Terms.Select(Term))
            : string.Join(" + ", design.Coefficients.Select(c => $"{c.Name}·{Basis(spec, c)}"));
        var penalties = spec.Penalties.Select((p, k) =>
        {
            var on = penaltyTargets is not null && design is not null
                ? string.Join(", ", penaltyTargets[k].Select(j => design.Coefficients[j].Name))
                : p.On is null ? "every non-constant coefficient" : string.Join(", ", p.On.Select(o => o.Value));
            var w = Num(p.Weight);
            return p.Kind switch
            {
                PenaltyKind.L1 => $"{w} · Σ |b_j| over {on}",
                PenaltyKind.L2 => $"{w} · Σ b_j² over {on}",
                PenaltyKind.Smoothness => $"{w} · Σ {(p.NormL1 ? "|Δ^" + p.Order + " b|" : "(Δ^" + p.Order + " b)²")} over {on} in order",
                _ => $"at most {p.Max} of {on} non-zero",
            };
        }).ToList();
        return new FitStatement(
            spec.Model.Response.Value,
            $"f = {model}",
            spec.Loss.KindName + (spec.Loss.Parameter is { } v ? $" ({ParameterName(spec.Loss.Kind)} = {Num(v)})" : ""),
            LossFormula(spec.Loss, spec.Data.Weight is not null),
            penalties,
            spec.Constraints.Select(c => c.Label).ToList(),
            spec.Data.Weight?.Value,
            spec.Data.Filter?.Value);
    }

    private static string Term(TermSpec t) => t switch
    {
        ExpressionTerm e => $"{t.Key}·({e.Expression.Value})",
        PolynomialTerm p => $"Σ_k {t.Key}k·{p.Input.Value}^k (k = 1..{p.Degree})",
        SplineTerm s => $"Σ_k {t.Key}k·B_k({s.Input.Value})",
        ColumnsTerm c => $"columns matching '{c.Glob.Value}'",
        _ => t.Key,
    };

    internal static string Basis(FitSpecDocument spec, Design.Coefficient c)
    {
        var term = spec.Model.Terms.First(t => t.Key == c.TermKey);
        return term switch
        {
            ExpressionTerm e => e.Expression.Value.Length == 1 || !e.Expression.Value.Any(ch => " +-*/^".Contains(ch)) ? e.Expression.Value : $"({e.Expression.Value})",
            PolynomialTerm p => $"{p.Input.Value}^{c.Name[p.Key.Length..]}",
            SplineTerm s => $"B{c.Name[s.Key.Length..]}({s.Input.Value})",
            _ => c.Name,
        };
    }

    private static string ParameterName(LossKind kind) => kind switch
    {
        LossKind.Quantile => "tau",
        LossKind.Huber or LossKind.Deadzone => "width",
        LossKind.LogBarrier => "limit",
        LossKind.Lp => "p",
        LossKind.TruncatedL2 => "cap",
        _ => "parameter",
    };

    public static string LossFormula(LossSpec loss, bool weighted)
    {
        var w = weighted ? "w_i·" : "";
        var p = loss.Parameter is { } v ? Num(v) : "";
        return loss.Kind switch
        {
            LossKind.L2 => $"minimise Σ {w}e_i²",
            LossKind.L1 => $"minimise Σ {w}|e_i|",
            LossKind.Linf => $"minimise max_i {w}|e_i|",
            LossKind.Quantile => $"minimise Σ {w}ρ(e_i), ρ(e) = {p}·e for e ≥ 0, ({p} − 1)·e for e < 0",
            LossKind.Huber => $"minimise Σ {w}φ(e_i), φ(e) = e² for |e| ≤ {p}, 2·{p}·|e| − {p}² beyond (quadratic inside, slope 2M outside)",
            LossKind.Deadzone => $"minimise Σ {w}max(0, |e_i| − {p})",
            LossKind.LogBarrier => $"minimise Σ {w}(−{p}²·log(1 − (e_i/{p})²)), every |e_i| < {p}",
            LossKind.Lp => $"minimise Σ {w}|e_i|^{p}",
            LossKind.TruncatedL2 => $"minimise Σ {w}min(e_i², {p}²) (non-convex)",
            _ => "no loss: penalties only",
        } + " with e_i = y_i − f(x_i)";
    }

    internal static string Num(double x) => x.ToString("G10", CultureInfo.InvariantCulture);
}
