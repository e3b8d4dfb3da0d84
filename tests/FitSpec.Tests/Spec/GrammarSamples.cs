using System.Globalization;
using FitSpec.Spec.Schema;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Tests.Spec;

/// <summary>
/// Writes specs straight from the grammar: every key of every mapping present, every alternative of
/// every choice and every kind of every kinded mapping used at least once. The values are in range but
/// the specs need not be valid (both 'path' and 'sqlite', say): they exist to make the reader ask for
/// every key. Keep decides which keys are written, so a test can leave one out.
/// </summary>
internal sealed class GrammarSamples
{
    private readonly Func<SectionGrammar, KeySpec, bool> _keep;

    public GrammarSamples(Func<SectionGrammar, KeySpec, bool>? keep = null) => _keep = keep ?? ((_, _) => true);

    /// <summary>Whole spec documents, as YAML text.</summary>
    public IReadOnlyList<string> Documents() => [.. Section(SpecGrammar.Root).Select(Text)];

    /// <summary>Every section reachable from the root, each once.</summary>
    public static IReadOnlyList<SectionGrammar> AllSections()
    {
        var found = new List<SectionGrammar>();
        void Walk(ValueShape shape)
        {
            switch (shape)
            {
                case SectionShape s:
                    Visit(s.Section);
                    break;
                case OneOrListShape o:
                    Walk(o.Item);
                    break;
                case ListShape l:
                    Walk(l.Item);
                    break;
                case NameMapShape m:
                    Walk(m.Value);
                    break;
                case ChoiceShape c:
                    c.Choices.ToList().ForEach(Walk);
                    break;
                case KindedShape k:
                    k.Groups.Select(g => g.Section).ToList().ForEach(Visit);
                    break;
            }
        }

        void Visit(SectionGrammar section)
        {
            if (!found.Contains(section))
            {
                found.Add(section);
                section.Keys.Select(k => k.Shape).ToList().ForEach(Walk);
            }
        }

        Visit(SpecGrammar.Root);
        return found;
    }

    private static string Text(YamlNode node)
    {
        var writer = new StringWriter(CultureInfo.InvariantCulture);
        new YamlStream(new YamlDocument(node)).Save(writer, assignAnchors: false);
        return writer.ToString();
    }

    private List<YamlNode> Values(ValueShape shape) => shape switch
    {
        TextShape => [new YamlScalarNode("x")],
        NumberShape n => [new YamlScalarNode(Inside(n))],
        WordShape w => [.. w.Words.Select(x => (YamlNode)new YamlScalarNode(x))],
        OneOrListShape o => [new YamlSequenceNode(Values(o.Item))],
        ListShape l => [List(l)],
        NameMapShape m => [NameMap(m)],
        SectionShape s => Section(s.Section),
        ChoiceShape c => [.. c.Choices.SelectMany(Values)],
        KindedShape k => Kinded(k),
        _ => throw new InvalidOperationException($"no sample for {shape.GetType().Name}"),
    };

    private YamlSequenceNode List(ListShape l)
    {
        var items = Values(l.Item);
        var count = Math.Min(Math.Max(items.Count, l.MinItems), l.MaxItems ?? int.MaxValue);
        return new YamlSequenceNode([.. Enumerable.Range(0, count).Select(i => items[i % items.Count])]);
    }

    private YamlMappingNode NameMap(NameMapShape m)
    {
        var map = new YamlMappingNode();
        var values = Values(m.Value);
        for (var i = 0; i < values.Count; i++)
        {
            map.Add($"n{i}", values[i]);
        }

        return map;
    }

    // As many samples as the key with the most; keys with fewer repeat theirs.
    private List<YamlNode> Section(SectionGrammar section, string? kind = null)
    {
        var keys = section.Keys.Where(k => _keep(section, k)).ToList();
        var values = keys.Select(k => k.Name == KindedShape.Discriminator && kind is not null ? [new YamlScalarNode(kind)] : Values(k.Shape)).ToList();
        var count = Math.Max(1, values.Count == 0 ? 1 : values.Max(v => v.Count));
        var result = new List<YamlNode>();
        for (var i = 0; i < count; i++)
        {
            var map = new YamlMappingNode();
            for (var j = 0; j < keys.Count; j++)
            {
                map.Add(keys[j].Name, values[j][i % values[j].Count]);
            }

            result.Add(map);
        }

        return result;
    }

    private List<YamlNode> Kinded(KindedShape k)
    {
        var result = new List<YamlNode>();
        foreach (var (kinds, section) in k.Groups)
        {
            foreach (var kind in kinds)
            {
                result.AddRange(Section(section, kind));
            }
        }

        result.AddRange(k.BareWords.Select(w => new YamlScalarNode(w)));
        return result;
    }

    private static string Inside(NumberShape n)
    {
        var r = n.Range;
        double x = (r.Min, r.Max) switch
        {
            ({ } a, { } b) => n.Integer ? Math.Ceiling((a + b) / 2) : (a + b) / 2,
            ({ } a, null) => a + 1,
            (null, { } b) => b - 1,
            _ => 1,
        };
        return x.ToString("R", CultureInfo.InvariantCulture);
    }
}
