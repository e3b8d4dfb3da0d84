using System.Globalization;
using FitSpec.Diagnostics;
using FitSpec.Spec.Schema;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>Reads constraints: relation strings and {kind: ...} objects, each with a readable label.</summary>
internal static class ConstraintReader
{
    private static KindedShape<ConstraintKind> Grammar => SpecGrammar.ConstraintObject;

    public static IReadOnlyList<ConstraintSpec> Read(YamlFields f, YamlNode node)
    {
        if (f.Sequence(node, "constraints") is not { } seq)
        {
            return [];
        }

        var result = new List<ConstraintSpec>();
        foreach (var item in seq.Children)
        {
            ConstraintSpec? c = item is YamlScalarNode
                ? f.Text(item, "constraints") is { } text ? new RelationConstraint(text.Value, text.Pos, text) : null
                : ReadObject(f, item);
            if (c is not null)
            {
                result.Add(c);
            }
        }

        return result;
    }

    private static ConstraintSpec? ReadObject(YamlFields f, YamlNode node)
    {
        if (f.Mapping(node, "constraints") is not { } map)
        {
            return null;
        }

        var kindNode = map.Children.FirstOrDefault(kv => kv.Key is YamlScalarNode { Value: KindedShape.Discriminator }).Value;
        if (kindNode is null)
        {
            f.Error(map, "constraints.kind", $"a constraint object needs 'kind:' ({string.Join(", ", Grammar.Kinds)}); a relation is written as a string, e.g. \"b1 >= 0\"");
            return null;
        }

        if (f.Text(kindNode, "constraints.kind") is not { } kind)
        {
            return null;
        }

        if (Grammar.Find(kind.Value) is not { } variant)
        {
            f.Error(kind.Pos, "constraints.kind", $"unknown constraint kind '{kind.Value}'{NameSuggester.Hint(kind.Value, Grammar.Kinds)}; known: {string.Join(", ", Grammar.Kinds)}");
            return null;
        }

        var pos = f.Pos(map);
        switch (variant.Value)
        {
            case ConstraintKind.Bounds:
                {
                    var e = f.Entries(map, "a bounds constraint", variant.Section);
                    var on = e.TryGetValue("on", out var o) ? f.TextList(o.Value, "constraints.on") : null;
                    double? min = e.TryGetValue("min", out var mn) ? f.Number(mn.Value, "constraints.min") : null;
                    double? max = e.TryGetValue("max", out var mx) ? f.Number(mx.Value, "constraints.max") : null;
                    if (!e.ContainsKey("min") && !e.ContainsKey("max"))
                    {
                        f.Error(map, "constraints.min", "a bounds constraint needs 'min:', 'max:' or both");
                    }

                    if (min is { } lo && max is { } hi && lo > hi)
                    {
                        f.Error(map, "constraints.min", $"bounds min {Num(lo)} is greater than max {Num(hi)}");
                    }

                    var names = on is null ? "every coefficient" : string.Join(", ", on.Select(s => s.Value));
                    var label = (min, max) switch
                    {
                        ({ } a, { } b) => $"{Num(a)} <= {names} <= {Num(b)}",
                        ({ } a, null) => $"{names} >= {Num(a)}",
                        (null, { } b) => $"{names} <= {Num(b)}",
                        _ => $"bounds on {names}",
                    };
                    return new BoundsConstraint(label, pos, on, min, max);
                }

            case ConstraintKind.Increasing or ConstraintKind.Decreasing or ConstraintKind.Convex or ConstraintKind.Concave:
                {
                    var e = f.Entries(map, $"a {kind.Value} constraint", variant.Section);
                    var shape = variant.Value switch
                    {
                        ConstraintKind.Increasing => ShapeKind.Increasing,
                        ConstraintKind.Decreasing => ShapeKind.Decreasing,
                        ConstraintKind.Convex => ShapeKind.Convex,
                        _ => ShapeKind.Concave,
                    };
                    SpecText? input = null;
                    if (!e.TryGetValue("in", out var inNode))
                    {
                        f.Error(map, "constraints.in", $"{("aeiou".Contains(kind.Value[0], StringComparison.Ordinal) ? "an" : "a")} {kind.Value} constraint needs 'in:' (the input it is {kind.Value} in)");
                    }
                    else
                    {
                        input = f.Text(inNode.Value, "constraints.in");
                    }

                    (double, double)? range = null;
                    if (!e.TryGetValue("over", out var over))
                    {
                        f.Error(map, "constraints.over", $"a {kind.Value} constraint needs 'over: [from, to]'");
                    }
                    else
                    {
                        range = Range(f, over.Value);
                    }

                    var at = e.TryGetValue("at", out var atNode) ? f.NumberMap(atNode.Value, "constraints.at") ?? [] : [];
                    int? grid = null;
                    var grids = variant.Section.RangeOf("grid");
                    if (e.TryGetValue("grid", out var g) && f.Integer(g.Value, "constraints.grid") is { } gi)
                    {
                        if (!grids.Contains(gi))
                        {
                            f.Error(g.Value, "constraints.grid", $"grid must be {grids.Describe()} points, got {gi}");
                        }

                        grid = gi;
                    }

                    if (input is null || range is not { } r)
                    {
                        return null;
                    }

                    var atText = at.Count == 0 ? "" : $" at {string.Join(", ", at.Select(kv => $"{kv.Key}={Num(kv.Value)}"))}";
                    return new ShapeConstraint($"{kind.Value} in {input.Value} over [{Num(r.Item1)}, {Num(r.Item2)}]{atText}", pos, shape, input, r.Item1, r.Item2, at, grid);
                }

            case ConstraintKind.Value:
                {
                    var e = f.Entries(map, "a value constraint", variant.Section);
                    IReadOnlyList<KeyValuePair<string, double>> at = [];
                    if (!e.TryGetValue("at", out var atNode))
                    {
                        f.Error(map, "constraints.at", "a value constraint needs 'at: {input: value, ...}'");
                    }
                    else
                    {
                        at = f.NumberMap(atNode.Value, "constraints.at") ?? [];
                    }

                    double? eq = e.TryGetValue("equals", out var q) ? f.Number(q.Value, "constraints.equals") : null;
                    double? min = e.TryGetValue("min", out var mn) ? f.Number(mn.Value, "constraints.min") : null;
                    double? max = e.TryGetValue("max", out var mx) ? f.Number(mx.Value, "constraints.max") : null;
                    if (e.ContainsKey("equals") && (e.ContainsKey("min") || e.ContainsKey("max")))
                    {
                        f.Error(map, "constraints.equals", "a value constraint takes either 'equals:' or 'min:'/'max:', not both");
                    }
                    else if (!e.ContainsKey("equals") && !e.ContainsKey("min") && !e.ContainsKey("max"))
                    {
                        f.Error(map, "constraints.equals", "a value constraint needs 'equals:', 'min:' or 'max:'");
                    }

                    if (min is { } lo && max is { } hi && lo > hi)
                    {
                        f.Error(map, "constraints.min", $"value min {Num(lo)} is greater than max {Num(hi)}");
                    }

                    var point = string.Join(", ", at.Select(kv => $"{kv.Key}={Num(kv.Value)}"));
                    var rel = (eq, min, max) switch
                    {
                        ({ } v, _, _) => $"== {Num(v)}",
                        (null, { } a, { } b) => $"in [{Num(a)}, {Num(b)}]",
                        (null, { } a, null) => $">= {Num(a)}",
                        (null, null, { } b) => $"<= {Num(b)}",
                        _ => "",
                    };
                    return new ValueConstraint($"f({point}) {rel}", pos, at, eq, min, max);
                }

            case ConstraintKind.Residuals:
                {
                    var e = f.Entries(map, "a residuals constraint", variant.Section);
                    if (!e.TryGetValue("max-abs", out var ma))
                    {
                        f.Error(map, "constraints.max-abs", "a residuals constraint needs 'max-abs:' (0 or more)");
                        return null;
                    }

                    if (f.Number(ma.Value, "constraints.max-abs") is not { } limit)
                    {
                        return null;
                    }

                    var limits = variant.Section.RangeOf("max-abs");
                    if (!limits.Contains(limit))
                    {
                        f.Error(ma.Value, "constraints.max-abs", $"max-abs must be {limits.Describe()}, got {Num(limit)}");
                        return null;
                    }

                    return new ResidualsConstraint($"|residual| <= {Num(limit)}", pos, limit);
                }

            default:
                throw new InvalidOperationException($"constraint kind '{kind.Value}' is in the grammar but has no reader");
        }
    }

    private static (double, double)? Range(YamlFields f, YamlNode node)
    {
        if (node is YamlSequenceNode { Children.Count: 2 } seq
            && f.Number(seq.Children[0], "constraints.over") is { } a
            && f.Number(seq.Children[1], "constraints.over") is { } b)
        {
            if (a >= b)
            {
                f.Error(node, "constraints.over", $"'over: [{Num(a)}, {Num(b)}]' must go from a lower to a higher value");
                return null;
            }

            return (a, b);
        }

        if (node is not YamlSequenceNode { Children.Count: 2 })
        {
            f.Error(node, "constraints.over", "'over' must be a list of two numbers: [from, to]");
        }

        return null;
    }

    internal static string Num(double x) => x.ToString("R", CultureInfo.InvariantCulture);
}
