using System.Text.RegularExpressions;
using FitSpec.Spec.Schema;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>Reads model.terms: coefficient name → constant, column, expression or basis expander.</summary>
internal static partial class TermReader
{
    /// <summary>
    /// Most knots one spline may have. The grammar sets no upper bound, but each knot is a basis column: two
    /// billion of them ran the design stage out of memory. Ten thousand is far past any calibration curve.
    /// </summary>
    internal const int MaxKnots = 10_000;

    // An expander is named by its first key; a term with several is read as the first listed.
    private static readonly string[] ExpanderKinds = [.. SpecGrammar.TermExpanders.Select(s => s.Names[0])];

    public static IReadOnlyList<TermSpec> Read(YamlFields f, YamlNode node)
    {
        if (f.Mapping(node, "model.terms") is not { } map)
        {
            return [];
        }

        var terms = new List<TermSpec>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var (k, v) in map.Children)
        {
            if (k is not YamlScalarNode { Value: { } key })
            {
                f.Error(k, "model.terms", "term names must be plain coefficient names");
                continue;
            }

            if (!CoefficientName().IsMatch(key))
            {
                f.Error(k, "model.terms", $"coefficient name '{key}' must start with a letter or '_' and use only letters, digits and '_'");
                continue;
            }

            if (!seen.Add(key))
            {
                f.Error(k, "model.terms", $"duplicate coefficient name '{key}'");
                continue;
            }

            if (ReadTerm(f, key, k, v) is { } term)
            {
                terms.Add(term);
            }
        }

        if (terms.Count == 0 && map.Children.Count == 0)
        {
            f.Error(map, "model.terms", "model.terms is empty; give at least one term (e.g. b0: 1)");
        }

        return terms;
    }

    private static TermSpec? ReadTerm(YamlFields f, string key, YamlNode keyNode, YamlNode value)
    {
        var pos = f.Pos(keyNode);
        if (value is YamlScalarNode)
        {
            return f.Text(value, $"model.terms.{key}") is { } text ? new ExpressionTerm(key, pos, text) : null;
        }

        if (value is not YamlMappingNode map)
        {
            f.Error(value, $"model.terms.{key}", $"term '{key}' must be an expression or one of {{polynomial: x, degree: d}}, {{spline: x, knots: k}}, {{columns: \"glob\"}}");
            return null;
        }

        var kind = ExpanderKinds.FirstOrDefault(k => map.Children.Keys.OfType<YamlScalarNode>().Any(s => s.Value == k));
        if (kind is null)
        {
            var first = map.Children.Keys.OfType<YamlScalarNode>().FirstOrDefault()?.Value ?? "";
            f.Error(map, $"model.terms.{key}", $"term '{key}' needs one of 'polynomial:', 'spline:' or 'columns:'{Diagnostics.NameSuggester.Hint(first, ExpanderKinds)}");
            return null;
        }

        var field = $"model.terms.{key}";
        switch (kind)
        {
            case "polynomial":
                {
                    var grammar = SpecGrammar.Polynomial;
                    var e = f.Entries(map, $"polynomial term '{key}'", grammar);
                    var input = f.Text(e["polynomial"].Value, field);
                    if (!e.TryGetValue("degree", out var dn))
                    {
                        f.Error(map, field, $"polynomial term '{key}' needs 'degree:' (1 or more)");
                        return null;
                    }

                    var degree = f.Integer(dn.Value, $"{field}.degree");
                    var degrees = grammar.RangeOf("degree");
                    if (degree is { } dv && !degrees.Contains(dv))
                    {
                        f.Error(dn.Value, $"{field}.degree", $"polynomial degree must be {degrees.Describe()}, got {degree}");
                        return null;
                    }

                    return input is null || degree is null ? null : new PolynomialTerm(key, pos, input, degree.Value);
                }

            case "spline":
                {
                    var grammar = SpecGrammar.Spline;
                    var e = f.Entries(map, $"spline term '{key}'", grammar);
                    var input = f.Text(e["spline"].Value, field);
                    var degree = 3;
                    var degrees = grammar.RangeOf("degree");
                    if (e.TryGetValue("degree", out var dn) && f.Integer(dn.Value, $"{field}.degree") is { } d)
                    {
                        if (!degrees.Contains(d))
                        {
                            f.Error(dn.Value, $"{field}.degree", $"spline degree must be {degrees.Describe()}, got {d}");
                        }

                        degree = d;
                    }

                    List<double>? at = null;
                    if (e.TryGetValue("at", out var atNode) && f.Sequence(atNode.Value, $"{field}.at") is { } seq)
                    {
                        at = [];
                        foreach (var item in seq.Children)
                        {
                            if (f.Number(item, $"{field}.at") is { } x)
                            {
                                at.Add(x);
                            }
                        }

                        for (var i = 1; i < at.Count; i++)
                        {
                            if (at[i] <= at[i - 1])
                            {
                                f.Error(atNode.Value, $"{field}.at", "spline knots in 'at:' must be strictly increasing");
                                break;
                            }
                        }
                    }

                    int? knots = null;
                    var knotCounts = grammar.RangeOf("knots");
                    var fewest = NumberRange.Num(knotCounts.Min ?? 0);
                    if (e.TryGetValue("knots", out var kn))
                    {
                        knots = f.Integer(kn.Value, $"{field}.knots");
                        if (knots is { } kv && !knotCounts.Contains(kv))
                        {
                            f.Error(kn.Value, $"{field}.knots", $"a spline needs at least {fewest} knots (both boundary knots count), got {knots}");
                        }
                        else if (knots > MaxKnots)
                        {
                            f.Error(kn.Value, $"{field}.knots", $"a spline may have at most {MaxKnots} knots, got {knots}");
                            knots = null;
                        }

                        if (knots is { } kk && at is not null && at.Count != kk)
                        {
                            f.Error(kn.Value, $"{field}.knots", $"'knots: {kk}' disagrees with the {at.Count} knots listed in 'at:'");
                        }
                    }
                    else if (at is not null)
                    {
                        knots = at.Count;
                    }
                    else
                    {
                        f.Error(map, field, $"spline term '{key}' needs 'knots:' (at least {fewest}) or 'at: [...]'");
                    }

                    if (at is not null && !knotCounts.Contains(at.Count))
                    {
                        f.Error(map, $"{field}.at", $"a spline needs at least {fewest} knots in 'at:'");
                        return null;
                    }

                    if (at is not null && at.Count > MaxKnots)
                    {
                        f.Error(atNode.Value, $"{field}.at", $"a spline may have at most {MaxKnots} knots, got {at.Count} in 'at:'");
                        return null;
                    }

                    return input is null || knots is not { } count || !knotCounts.Contains(count) ? null : new SplineTerm(key, pos, input, knots.Value, degree, at);
                }

            default:
                {
                    var e = f.Entries(map, $"columns term '{key}'", SpecGrammar.Columns);
                    return f.Text(e["columns"].Value, field) is { } glob ? new ColumnsTerm(key, pos, glob) : null;
                }
        }
    }

    [GeneratedRegex(SpecGrammar.CoefficientNamePattern)]
    private static partial Regex CoefficientName();
}
