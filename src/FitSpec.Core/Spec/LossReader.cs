using FitSpec.Diagnostics;
using FitSpec.Spec.Schema;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>Reads the loss: a kind name, or {kind: ..., parameter: ...}; kinds and parameters come from <see cref="SpecGrammar.Loss"/>.</summary>
internal static class LossReader
{
    private static KindedShape<LossKind> Grammar => SpecGrammar.Loss;

    public static LossSpec? Read(YamlFields f, YamlNode node)
    {
        if (node is YamlScalarNode)
        {
            var kindText = f.Text(node, "loss");
            if (kindText is null || Lookup(f, kindText) is not { } info)
            {
                return null;
            }

            if (Parameter(info) is { } needed)
            {
                f.Error(node, "loss", $"loss '{kindText.Value}' needs a parameter: write loss: {{kind: {kindText.Value}, {needed.Name}: ...}}");
                return null;
            }

            // The bare word is kept as written (reports say "minimax" where the spec does).
            return new LossSpec(info.Value, kindText.Value, null, f.Pos(node));
        }

        if (f.Mapping(node, "loss") is not { } map)
        {
            return null;
        }

        var e = f.Entries(map, "loss", Grammar.Union);
        if (!e.TryGetValue(KindedShape.Discriminator, out var k))
        {
            f.Error(map, "loss.kind", $"loss needs 'kind:' ({string.Join(", ", Grammar.Variants.Where(v => v.AliasOf is null).Select(v => v.Kind))})");
            return null;
        }

        if (f.Text(k.Value, "loss.kind") is not { } kind || Lookup(f, kind) is not { } found)
        {
            return null;
        }

        var parameterKey = Parameter(found);
        var own = e.Narrow(found.Section, (key, keyNode) =>
        {
            var expected = parameterKey is null ? "no parameters" : $"only '{parameterKey.Name}'";
            f.Error(keyNode, $"loss.{key}", $"loss '{kind.Value}' takes {expected}, not '{key}'");
        });

        double? parameter = null;
        if (parameterKey is not null)
        {
            var range = found.Section.RangeOf(parameterKey.Name);
            if (!own.TryGetValue(parameterKey.Name, out var entry))
            {
                f.Error(map, $"loss.{parameterKey.Name}", $"loss '{kind.Value}' needs '{parameterKey.Name}:' ({range.Describe()})");
                return null;
            }

            if (f.Number(entry.Value, $"loss.{parameterKey.Name}") is { } x)
            {
                if (!range.Contains(x))
                {
                    f.Error(entry.Value, $"loss.{parameterKey.Name}", $"{parameterKey.Name} for loss '{kind.Value}' must be {range.Describe()}, got {x}");
                }

                parameter = x;
            }
        }

        return new LossSpec(found.Value, Canonical(found), parameter, f.Pos(map));
    }

    // A loss kind takes at most one parameter: the key of its section after the discriminator.
    private static KeySpec? Parameter(KindVariant<LossKind> kind) => kind.Section.Keys.Skip(1).SingleOrDefault();

    private static string Canonical(KindVariant<LossKind> kind) => kind.AliasOf ?? kind.Kind;

    private static KindVariant<LossKind>? Lookup(YamlFields f, SpecText kind)
    {
        if (Grammar.Find(kind.Value) is { } info)
        {
            return info;
        }

        f.Error(kind.Pos, "loss.kind", $"unknown loss '{kind.Value}'{NameSuggester.Hint(kind.Value, Grammar.Kinds)}; known: {string.Join(", ", Grammar.Kinds)}");
        return null;
    }
}
