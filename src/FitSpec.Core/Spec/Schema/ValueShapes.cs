namespace FitSpec.Spec.Schema;

/// <summary>What one value in a spec may be: a node of the spec language's grammar.</summary>
public abstract record ValueShape;

/// <summary>
/// Any single value, read as text (a name, a path, an expression). Pattern, when given, is a regular
/// expression the whole text must match (written so that .NET and JSON Schema read it alike). What
/// says what the text is where it is one form among several.
/// </summary>
public sealed record TextShape(string? Pattern = null, string? What = null) : ValueShape
{
    public static TextShape Any { get; } = new();
}

/// <summary>A finite number, or a whole number when Integer is set, inside Range.</summary>
public sealed record NumberShape(NumberRange Range, bool Integer = false) : ValueShape;

/// <summary>One of a fixed set of words.</summary>
public abstract record WordShape : ValueShape
{
    /// <summary>Every accepted word, aliases included, in the order they are listed to users.</summary>
    public abstract IReadOnlyList<string> Words { get; }

    /// <summary>The words without their aliases (what error messages suggest).</summary>
    public abstract IReadOnlyList<string> Primary { get; }
}

/// <summary>A word that stands for a value of T; an alias reads as the value of the word it repeats.</summary>
public sealed record Word<T>(string Text, T Value, string? AliasOf = null);

/// <summary>One of a fixed set of words, each standing for a value of T.</summary>
public sealed record WordShape<T> : WordShape
{
    private readonly IReadOnlyList<Word<T>> _entries;

    public WordShape(params Word<T>[] entries)
    {
        _entries = entries;
        Words = [.. entries.Select(e => e.Text)];
        Primary = [.. entries.Where(e => e.AliasOf is null).Select(e => e.Text)];
    }

    public override IReadOnlyList<string> Words { get; }

    public override IReadOnlyList<string> Primary { get; }

    public bool TryGet(string text, out T value)
    {
        foreach (var e in _entries)
        {
            if (e.Text == text)
            {
                value = e.Value;
                return true;
            }
        }

        value = default!;
        return false;
    }
}

/// <summary>One value of Item, or a list of them (a single value reads as a one-item list).</summary>
public sealed record OneOrListShape(ValueShape Item) : ValueShape;

/// <summary>A list of Item values with MinItems…MaxItems entries.</summary>
public sealed record ListShape(ValueShape Item, int MinItems = 0, int? MaxItems = null) : ValueShape;

/// <summary>A mapping of user-chosen names to Value (terms, the inputs of at:); NamePattern restricts the names.</summary>
public sealed record NameMapShape(ValueShape Value, string? NamePattern = null, int MinEntries = 0) : ValueShape;

/// <summary>A mapping with a fixed set of keys.</summary>
public sealed record SectionShape(SectionGrammar Section) : ValueShape;

/// <summary>Any one of several forms (e.g. a relation string or a constraint object).</summary>
public sealed record ChoiceShape(IReadOnlyList<ValueShape> Choices) : ValueShape;
