using FitSpec.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>Reads penalties: a list of {kind, weight, on, ...}.</summary>
internal static class PenaltyReader
{
    private static readonly string[] KindNames = ["l1", "l2", "smoothness", "count"];

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

        var e = f.Entries(map, "a penalty", ["kind", "weight", "on", "order", "norm", "max"]);
        if (!e.TryGetValue("kind", out var k) || f.Text(k.Value, "penalties.kind") is not { } kindText)
        {
            if (!e.ContainsKey("kind"))
            {
                f.Error(map, "penalties.kind", "a penalty needs 'kind:' (l1, l2, smoothness or count)");
            }

            return null;
        }

        PenaltyKind? kind = kindText.Value switch
        {
            "l1" => PenaltyKind.L1,
            "l2" => PenaltyKind.L2,
            "smoothness" => PenaltyKind.Smoothness,
            "count" => PenaltyKind.Count,
            _ => null,
        };
        if (kind is null)
        {
            f.Error(kindText.Pos, "penalties.kind", $"unknown penalty '{kindText.Value}'{NameSuggester.Hint(kindText.Value, KindNames)}; known: {string.Join(", ", KindNames)}");
            return null;
        }

        var allowed = kind switch
        {
            PenaltyKind.Smoothness => new[] { "kind", "weight", "on", "order", "norm" },
            PenaltyKind.Count => ["kind", "on", "max"],
            _ => ["kind", "weight", "on"],
        };
        foreach (var (key, entry) in e)
        {
            if (!allowed.Contains(key))
            {
                f.Error(entry.Key, $"penalties.{key}", $"penalty '{kindText.Value}' does not take '{key}'; it takes {string.Join(", ", allowed.Skip(1))}");
            }
        }

        double weight = 0;
        if (kind != PenaltyKind.Count)
        {
            if (!e.TryGetValue("weight", out var w))
            {
                f.Error(map, "penalties.weight", $"penalty '{kindText.Value}' needs 'weight:' (0 or more)");
            }
            else if (f.Number(w.Value, "penalties.weight") is { } x)
            {
                if (x < 0)
                {
                    f.Error(w.Value, "penalties.weight", $"penalty weight must be 0 or more, got {x}");
                }

                weight = x;
            }
        }

        int? order = null;
        if (kind == PenaltyKind.Smoothness)
        {
            order = 2;
            if (e.TryGetValue("order", out var o) && f.Integer(o.Value, "penalties.order") is { } oi)
            {
                if (oi is < 1 or > 10)
                {
                    f.Error(o.Value, "penalties.order", $"smoothness order must be between 1 and 10, got {oi}");
                }

                order = oi;
            }
        }

        var normL1 = false;
        if (e.TryGetValue("norm", out var nn) && f.Text(nn.Value, "penalties.norm") is { } norm)
        {
            if (norm.Value is not "l1" and not "l2")
            {
                f.Error(norm.Pos, "penalties.norm", $"smoothness norm must be l1 or l2, got '{norm.Value}'");
            }

            normL1 = norm.Value == "l1";
        }

        int? max = null;
        if (kind == PenaltyKind.Count)
        {
            if (!e.TryGetValue("max", out var m))
            {
                f.Error(map, "penalties.max", "penalty 'count' needs 'max:' (the most coefficients allowed to be non-zero)");
            }
            else if (f.Integer(m.Value, "penalties.max") is { } mi)
            {
                if (mi < 0)
                {
                    f.Error(m.Value, "penalties.max", $"count max must be 0 or more, got {mi}");
                }

                max = mi;
            }
        }

        var on = e.TryGetValue("on", out var onNode) ? f.TextList(onNode.Value, "penalties.on") : null;
        return new PenaltySpec(kind.Value, kindText.Value, weight, on, order, normL1, max, f.Pos(map));
    }
}
