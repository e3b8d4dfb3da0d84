namespace FitSpec.Spec.Schema;

/// <summary>One key of a mapping: its name, what its value may be, whether it must be given, and what it means.</summary>
public sealed record KeySpec(string Name, ValueShape Shape, bool Required, string Description);

/// <summary>A rule across keys of one mapping that no single key states.</summary>
public abstract record KeyRule;

/// <summary>At least one of Keys must be given.</summary>
public sealed record AtLeastOneOf(IReadOnlyList<string> Keys) : KeyRule;

/// <summary>Key may not be given together with any of Others.</summary>
public sealed record NotWith(string Key, IReadOnlyList<string> Others) : KeyRule;

/// <summary>When Key is given, Other must be given too.</summary>
public sealed record NeedsAlso(string Key, string Other) : KeyRule;

/// <summary>
/// The grammar of one mapping: its keys in the order users see them, and the rules across them. The
/// readers take their allowed keys from here and may ask only for keys defined here; the JSON Schema
/// is generated from the same objects.
/// </summary>
public sealed class SectionGrammar
{
    private readonly Dictionary<string, KeySpec> _byName;

    public SectionGrammar(string title, string description, IReadOnlyList<KeySpec> keys, IReadOnlyList<KeyRule>? rules = null)
    {
        ArgumentNullException.ThrowIfNull(keys);
        Title = title;
        Description = description;
        Keys = keys;
        Rules = rules ?? [];
        _byName = keys.ToDictionary(k => k.Name, StringComparer.Ordinal);
        Names = [.. keys.Select(k => k.Name)];
        foreach (var name in Rules.SelectMany(RuleKeys))
        {
            if (!_byName.ContainsKey(name))
            {
                throw new ArgumentException($"a rule of {title} names '{name}', which is not one of its keys");
            }
        }
    }

    /// <summary>Where the mapping sits, for messages about the grammar itself (e.g. "report.uncertainty").</summary>
    public string Title { get; }

    public string Description { get; }

    public IReadOnlyList<KeySpec> Keys { get; }

    public IReadOnlyList<string> Names { get; }

    public IReadOnlyList<KeyRule> Rules { get; }

    public IEnumerable<string> RequiredNames => Keys.Where(k => k.Required).Select(k => k.Name);

    public bool Has(string name) => _byName.ContainsKey(name);

    public KeySpec this[string name] => _byName[name];

    /// <summary>The range of a number key (the reader's check and the schema's bounds).</summary>
    public NumberRange RangeOf(string name) =>
        _byName.TryGetValue(name, out var key) && key.Shape is NumberShape n
            ? n.Range
            : throw new InvalidOperationException($"the reader asked for the range of '{name}', which the grammar of {Title} does not define as a number");

    public override string ToString() => Title;

    internal static IEnumerable<string> RuleKeys(KeyRule rule) => rule switch
    {
        AtLeastOneOf a => a.Keys,
        NotWith n => [n.Key, .. n.Others],
        NeedsAlso d => [d.Key, d.Other],
        _ => [],
    };
}
