using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Results;

/// <summary>
/// Evaluates report.accept rules — conditions over the metrics (rmse, mae, max_abs_residual, r2, objective,
/// observations, residual_sd) and coefficient names. The value shown is the rule's left-hand side.
/// </summary>
public static class Acceptance
{
    public static IReadOnlyList<AcceptanceResult> Evaluate(IReadOnlyList<SpecText> rules, IReadOnlyDictionary<string, double> values)
    {
        ArgumentNullException.ThrowIfNull(rules);
        ArgumentNullException.ThrowIfNull(values);
        var results = new List<AcceptanceResult>();
        foreach (var rule in rules)
        {
            var parsed = ExpressionParser.Parse(rule.Value, ExpressionContext.Filter);
            if (!parsed.Ok)
            {
                results.Add(new AcceptanceResult(rule.Value, null, false, string.Join("; ", parsed.Errors.Select(e => e.Message))));
                continue;
            }

            var unknown = parsed.Columns.Where(c => !values.ContainsKey(c)).ToList();
            if (unknown.Count > 0)
            {
                var hint = Diagnostics.NameSuggester.Hint(unknown[0], values.Keys);
                results.Add(new AcceptanceResult(rule.Value, null, false, $"unknown name '{unknown[0]}'{hint}"));
                continue;
            }

            double Lookup(string name) => values[name];
            var passed = ExpressionEvaluator.EvaluateScalar(parsed.Root!, Lookup) != 0;
            double? shown = parsed.Root is ComparisonExpr cmp ? ExpressionEvaluator.EvaluateScalar(cmp.Left, Lookup) : null;
            results.Add(new AcceptanceResult(rule.Value, shown, passed, null));
        }

        return results;
    }

    /// <summary>The metric names rules may use, besides the coefficient names.</summary>
    public static readonly IReadOnlyList<string> MetricNames = ["rmse", "mae", "max_abs_residual", "r2", "objective", "observations", "residual_sd"];

    /// <summary>Rules naming something that is neither a metric nor a coefficient, as located errors.</summary>
    public static IEnumerable<Diagnostics.Diagnostic> CheckNames(IReadOnlyList<SpecText> rules, IEnumerable<string> coefficients)
    {
        ArgumentNullException.ThrowIfNull(rules);
        var known = MetricNames.Concat(coefficients).ToList();
        foreach (var rule in rules)
        {
            var parsed = ExpressionParser.Parse(rule.Value, ExpressionContext.Filter);
            foreach (var name in parsed.Columns.Where(c => !known.Contains(c)))
            {
                yield return new Diagnostics.Diagnostic(rule.Pos.File, rule.Pos.Line, rule.Pos.Column, "report.accept",
                    $"in '{rule.Value}': unknown name '{name}'{Diagnostics.NameSuggester.Hint(name, known)}; rules use the metrics ({string.Join(", ", MetricNames)}) and coefficient names");
            }
        }
    }

    /// <summary>Parse errors in rules, reported with the spec position before any data is read.</summary>
    public static IEnumerable<Diagnostics.Diagnostic> Validate(IReadOnlyList<SpecText> rules)
    {
        ArgumentNullException.ThrowIfNull(rules);
        foreach (var rule in rules)
        {
            foreach (var e in ExpressionParser.Parse(rule.Value, ExpressionContext.Filter).Errors)
            {
                var at = rule.At(e.Offset);
                yield return new Diagnostics.Diagnostic(at.File, at.Line, at.Column, "report.accept", $"in '{rule.Value}': {e.Message}");
            }
        }
    }
}
