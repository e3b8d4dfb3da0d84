using FitSpec.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>Reads the loss: a kind name, or {kind: ..., parameter: ...}.</summary>
internal static class LossReader
{
    private sealed record KindInfo(LossKind Kind, string? Parameter, Func<double, bool>? Valid, string? Rule);

    private static readonly Dictionary<string, KindInfo> Kinds = new(StringComparer.Ordinal)
    {
        ["l2"] = new(LossKind.L2, null, null, null),
        ["l1"] = new(LossKind.L1, null, null, null),
        ["linf"] = new(LossKind.Linf, null, null, null),
        ["minimax"] = new(LossKind.Linf, null, null, null),
        ["quantile"] = new(LossKind.Quantile, "tau", x => x > 0 && x < 1, "strictly between 0 and 1"),
        ["huber"] = new(LossKind.Huber, "width", x => x > 0, "greater than 0"),
        ["deadzone"] = new(LossKind.Deadzone, "width", x => x >= 0, "0 or more"),
        ["log-barrier"] = new(LossKind.LogBarrier, "limit", x => x > 0, "greater than 0"),
        ["lp"] = new(LossKind.Lp, "p", x => x > 1, "greater than 1"),
        ["truncated-l2"] = new(LossKind.TruncatedL2, "cap", x => x > 0, "greater than 0"),
        ["none"] = new(LossKind.None, null, null, null),
    };

    public static LossSpec? Read(YamlFields f, YamlNode node)
    {
        if (node is YamlScalarNode)
        {
            var kindText = f.Text(node, "loss");
            if (kindText is null || Lookup(f, kindText) is not { } info)
            {
                return null;
            }

            if (info.Parameter is not null)
            {
                f.Error(node, "loss", $"loss '{kindText.Value}' needs a parameter: write loss: {{kind: {kindText.Value}, {info.Parameter}: ...}}");
                return null;
            }

            return new LossSpec(info.Kind, kindText.Value, null, f.Pos(node));
        }

        if (f.Mapping(node, "loss") is not { } map)
        {
            return null;
        }

        var e = f.Entries(map, "loss", ["kind", "tau", "width", "limit", "p", "cap"]);
        if (!e.TryGetValue("kind", out var k))
        {
            f.Error(map, "loss.kind", "loss needs 'kind:' (l2, l1, linf, quantile, huber, deadzone, log-barrier, lp, truncated-l2, none)");
            return null;
        }

        if (f.Text(k.Value, "loss.kind") is not { } kind || Lookup(f, kind) is not { } found)
        {
            return null;
        }

        double? parameter = null;
        foreach (var (key, entry) in e)
        {
            if (key == "kind")
            {
                continue;
            }

            if (key != found.Parameter)
            {
                var expected = found.Parameter is null ? "no parameters" : $"only '{found.Parameter}'";
                f.Error(entry.Key, $"loss.{key}", $"loss '{kind.Value}' takes {expected}, not '{key}'");
                continue;
            }

            if (f.Number(entry.Value, $"loss.{key}") is { } x)
            {
                if (!found.Valid!(x))
                {
                    f.Error(entry.Value, $"loss.{key}", $"{key} for loss '{kind.Value}' must be {found.Rule}, got {x}");
                }

                parameter = x;
            }
        }

        if (found.Parameter is not null && !e.ContainsKey(found.Parameter))
        {
            f.Error(map, $"loss.{found.Parameter}", $"loss '{kind.Value}' needs '{found.Parameter}:' ({found.Rule})");
            return null;
        }

        return new LossSpec(found.Kind, kind.Value == "minimax" ? "linf" : kind.Value, parameter, f.Pos(map));
    }

    private static KindInfo? Lookup(YamlFields f, SpecText kind)
    {
        if (Kinds.TryGetValue(kind.Value, out var info))
        {
            return info;
        }

        f.Error(kind.Pos, "loss.kind", $"unknown loss '{kind.Value}'{NameSuggester.Hint(kind.Value, Kinds.Keys)}; known: {string.Join(", ", Kinds.Keys)}");
        return null;
    }
}
