using FitSpec.Diagnostics;
using FitSpec.Spec.Schema;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>Reads penalties: a list of {kind, weight, on, ...}.</summary>
internal static class PenaltyReader
{
    private static KindedShape<PenaltyKind> Grammar => SpecGrammar.Penalty;

    public static IReadOnlyList<PenaltySpec> Read(YamlFields f, YamlNode node)
    {
        if (f.Sequence(node, "penalties") is not { } seq)
        {
            return [];
        }

        var result = new List<PenaltySpec>();
        foreach (var item in seq.Children)
        {
            if (ReadOne(f, item) is { } p)
            {
                result.Add(p);
            }
        }

        return result;
    }

    private static PenaltySpec? ReadOne(YamlFields f, YamlNode node)
    {
        if (f.Mapping(node, "penalties") is not { } map)
        {
            return null;
        }

        var e = f.Entries(map, "a penalty", Grammar.Union);
        if (!e.TryGetValue(KindedShape.Discriminator, out var k) || f.Text(k.Value, "penalties.kind") is not { } kindText)
        {
            if (!e.ContainsKey(KindedShape.Discriminator))
            {
                f.Error(map, "penalties.kind", $"a penalty needs 'kind:' ({YamlFields.Or(Grammar.Kinds)})");
            }

            return null;
        }

        if (Grammar.Find(kindText.Value) is not { } variant)
        {
            f.Error(kindText.Pos, "penalties.kind", $"unknown penalty '{kindText.Value}'{NameSuggester.Hint(kindText.Value, Grammar.Kinds)}; known: {string.Join(", ", Grammar.Kinds)}");
            return null;
        }

        var kind = variant.Value;
        var section = variant.Section;
        var own = e.Narrow(section, (key, keyNode) =>
            f.Error(keyNode, $"penalties.{key}", $"penalty '{kindText.Value}' does not take '{key}'; it takes {string.Join(", ", section.Names.Skip(1))}"));

        double weight = 0;
        if (section.Has("weight"))
        {
            var weights = section.RangeOf("weight");
            if (!own.TryGetValue("weight", out var w))
            {
                f.Error(map, "penalties.weight", $"penalty '{kindText.Value}' needs 'weight:' ({weights.Describe()})");
            }
            else if (f.Number(w.Value, "penalties.weight") is { } x)
            {
                if (!weights.Contains(x))
                {
                    f.Error(w.Value, "penalties.weight", $"penalty weight must be {weights.Describe()}, got {x}");
                }

                weight = x;
            }
        }

        int? order = null;
        if (section.Has("order"))
        {
            order = 2;
            var orders = section.RangeOf("order");
            if (own.TryGetValue("order", out var o) && f.Integer(o.Value, "penalties.order") is { } oi)
            {
                if (!orders.Contains(oi))
                {
                    f.Error(o.Value, "penalties.order", $"smoothness order must be {orders.Describe()}, got {oi}");
                }

                order = oi;
            }
        }

        var normL1 = false;
        if (section.Has("norm") && own.TryGetValue("norm", out var nn) && f.Text(nn.Value, "penalties.norm") is { } norm
            && !SpecGrammar.SmoothnessNorms.TryGet(norm.Value, out normL1))
        {
            f.Error(norm.Pos, "penalties.norm", $"smoothness norm must be {YamlFields.Or(SpecGrammar.SmoothnessNorms.Primary)}, got '{norm.Value}'");
        }

        int? max = null;
        if (section.Has("max"))
        {
            var counts = section.RangeOf("max");
            if (!own.TryGetValue("max", out var m))
            {
                f.Error(map, "penalties.max", $"penalty '{kindText.Value}' needs 'max:' (the most coefficients allowed to be non-zero)");
            }
            else if (f.Integer(m.Value, "penalties.max") is { } mi)
            {
                if (!counts.Contains(mi))
                {
                    f.Error(m.Value, "penalties.max", $"count max must be {counts.Describe()}, got {mi}");
                }

                max = mi;
            }
        }

        var on = own.TryGetValue("on", out var onNode) ? f.TextList(onNode.Value, "penalties.on") : null;
        return new PenaltySpec(kind, kindText.Value, weight, on, order, normL1, max, f.Pos(map));
    }
}
