namespace FitSpec.Spec.Schema;

/// <summary>
/// One kind of a kinded mapping: its word, the value it stands for, and the keys it takes (the first of
/// which is always the discriminator). Several kinds may share one section (the four shape constraints).
/// </summary>
public sealed record KindVariant<T>(string Kind, T Value, SectionGrammar Section, string? AliasOf = null);

/// <summary>A mapping whose keys depend on its kind word (a penalty, a constraint object, a loss).</summary>
public abstract record KindedShape : ValueShape
{
    public const string Discriminator = "kind";

    /// <summary>Every kind word, aliases included, in the order users see them.</summary>
    public abstract IReadOnlyList<string> Kinds { get; }

    /// <summary>The kinds' sections, each once, with the kind words that select it.</summary>
    public abstract IReadOnlyList<(IReadOnlyList<string> Kinds, SectionGrammar Section)> Groups { get; }

    /// <summary>What the mapping is (e.g. "a penalty"); the union section's title.</summary>
    public abstract string Noun { get; }

    public abstract string Description { get; }

    /// <summary>
    /// When set, a kind whose section takes nothing but the discriminator may be written as its bare word
    /// (loss: l1) as well as a mapping.
    /// </summary>
    public abstract bool BareWordWhenNoParameters { get; }

    /// <summary>The kinds that may be written as a bare word.</summary>
    public IEnumerable<string> BareWords => BareWordWhenNoParameters
        ? Groups.Where(g => g.Section.Keys.Count == 1).SelectMany(g => g.Kinds)
        : [];
}

/// <summary>A kinded mapping whose kinds stand for values of T.</summary>
public sealed record KindedShape<T> : KindedShape
{
    public KindedShape(string noun, string description, bool bareWordWhenNoParameters, params KindVariant<T>[] variants)
    {
        ArgumentNullException.ThrowIfNull(variants);
        Noun = noun;
        Description = description;
        BareWordWhenNoParameters = bareWordWhenNoParameters;
        Variants = variants;
        Kinds = [.. variants.Select(v => v.Kind)];
        var groups = new List<(IReadOnlyList<string>, SectionGrammar)>();
        foreach (var section in variants.Select(v => v.Section).Distinct())
        {
            if (section.Keys.Count == 0 || section.Keys[0].Name != Discriminator)
            {
                throw new ArgumentException($"every kind of {noun} must list '{Discriminator}' as its first key");
            }

            groups.Add(([.. variants.Where(v => v.Section == section).Select(v => v.Kind)], section));
        }

        Groups = groups;

        // Keys of every kind in first-seen order: what a reader accepts before it knows the kind.
        var union = new List<KeySpec>();
        foreach (var key in variants.SelectMany(v => v.Section.Keys))
        {
            if (union.All(k => k.Name != key.Name))
            {
                union.Add(key with { Required = key.Name == Discriminator });
            }
        }

        Union = new SectionGrammar(noun, description, union);
    }

    public override string Noun { get; }

    public override string Description { get; }

    public override bool BareWordWhenNoParameters { get; }

    public IReadOnlyList<KindVariant<T>> Variants { get; }

    public override IReadOnlyList<string> Kinds { get; }

    public override IReadOnlyList<(IReadOnlyList<string> Kinds, SectionGrammar Section)> Groups { get; }

    /// <summary>Every key any kind takes, the discriminator first.</summary>
    public SectionGrammar Union { get; }

    public KindVariant<T>? Find(string kind) => Variants.FirstOrDefault(v => v.Kind == kind);
}
