using System.Collections;
using FitSpec.Spec.Schema;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>
/// The keys written in one mapping, already checked against its grammar section. A reader may ask only
/// for keys the section defines: asking for any other is a bug in the reader (the grammar and the
/// reader disagree) and throws, so a key cannot be read without being in the grammar and the schema.
/// </summary>
internal sealed class SectionEntries : IEnumerable<KeyValuePair<string, (YamlScalarNode Key, YamlNode Value)>>
{
    private readonly Dictionary<string, (YamlScalarNode Key, YamlNode Value)> _entries;
    private readonly Action<SectionGrammar, string>? _onRead;

    public SectionEntries(SectionGrammar section, Dictionary<string, (YamlScalarNode Key, YamlNode Value)> entries, Action<SectionGrammar, string>? onRead)
    {
        Section = section;
        _entries = entries;
        _onRead = onRead;
    }

    public SectionGrammar Section { get; }

    public (YamlScalarNode Key, YamlNode Value) this[string key] => Known(key) ? _entries[key] : default;

    public bool TryGetValue(string key, out (YamlScalarNode Key, YamlNode Value) entry)
    {
        Known(key);
        return _entries.TryGetValue(key, out entry);
    }

    public bool ContainsKey(string key) => Known(key) && _entries.ContainsKey(key);

    /// <summary>
    /// The entries a kind's own section takes, once the kind is known: entries it does not take go to
    /// <paramref name="reject"/> (in the order written) and are left out.
    /// </summary>
    public SectionEntries Narrow(SectionGrammar variant, Action<string, YamlScalarNode> reject)
    {
        ArgumentNullException.ThrowIfNull(variant);
        ArgumentNullException.ThrowIfNull(reject);
        var kept = new Dictionary<string, (YamlScalarNode Key, YamlNode Value)>(StringComparer.Ordinal);
        foreach (var (key, entry) in _entries)
        {
            if (variant.Has(key))
            {
                kept.Add(key, entry);
            }
            else
            {
                reject(key, entry.Key);
            }
        }

        return new SectionEntries(variant, kept, _onRead);
    }

    public IEnumerator<KeyValuePair<string, (YamlScalarNode Key, YamlNode Value)>> GetEnumerator()
    {
        foreach (var key in _entries.Keys)
        {
            Known(key);
        }

        return _entries.GetEnumerator();
    }

    IEnumerator IEnumerable.GetEnumerator() => GetEnumerator();

    private bool Known(string key)
    {
        if (!Section.Has(key))
        {
            throw new InvalidOperationException($"the reader asked for '{key}', which the grammar of {Section.Title} does not define; add it to SpecGrammar");
        }

        _onRead?.Invoke(Section, key);
        return true;
    }
}
