using System.Text;
using FitSpec.Spec;
using FitSpec.Spec.Schema;

namespace FitSpec.Tests.Spec;

/// <summary>
/// The grammar and the readers agree: a reader cannot ask for a key the grammar lacks (it throws), and
/// these tests find grammar keys no reader asks for, and required keys a reader does not insist on.
/// </summary>
public sealed class SpecGrammarTests
{
    [Fact]
    public void Every_key_in_the_grammar_is_read_by_a_reader()
    {
        var read = new HashSet<(SectionGrammar, string)>();
        foreach (var doc in new GrammarSamples().Documents())
        {
            SpecReader.Parse("sample.fit.yaml", Encoding.UTF8.GetBytes(doc), (section, key) => read.Add((section, key)));
        }

        // A kind word is read when the reader picks the kind's section, before that section is entered.
        var unread = GrammarSamples.AllSections()
            .SelectMany(s => s.Keys.Where(k => k.Name != KindedShape.Discriminator).Select(k => (Section: s, Key: k.Name)))
            .Where(x => !read.Contains(x))
            .Select(x => $"{x.Section.Title}.{x.Key}")
            .ToList();
        Assert.True(unread.Count == 0, "keys in SpecGrammar that no reader reads: " + string.Join(", ", unread));
    }

    [Fact]
    public void Samples_reach_every_section_of_the_grammar()
    {
        var sections = GrammarSamples.AllSections();
        foreach (var expected in (SectionGrammar[])[SpecGrammar.Data, SpecGrammar.Model, SpecGrammar.Polynomial, SpecGrammar.Spline, SpecGrammar.Columns,
            SpecGrammar.NormPenalty, SpecGrammar.SmoothnessPenalty, SpecGrammar.CountPenalty, SpecGrammar.Bounds, SpecGrammar.Shapes,
            SpecGrammar.ValueAt, SpecGrammar.ResidualBand, SpecGrammar.Solve, SpecGrammar.Report, SpecGrammar.Uncertainty])
        {
            Assert.Contains(expected, sections);
        }
    }

    public static TheoryData<string, string> RequiredKeys()
    {
        var data = new TheoryData<string, string>();
        foreach (var section in GrammarSamples.AllSections())
        {
            // The discriminator and an expander's first key choose the section; they cannot be left out of it.
            foreach (var key in section.Keys.Where(k => k.Required && k.Name != KindedShape.Discriminator && !IsTermMarker(section, k)))
            {
                data.Add(section.Title, key.Name);
            }
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(RequiredKeys))]
    public void A_required_key_left_out_is_an_error_naming_it(string sectionTitle, string key)
    {
        var section = GrammarSamples.AllSections().Single(s => s.Title == sectionTitle);
        var added = NewErrors(new GrammarSamples((s, k) => s != section || k.Name != key));
        Assert.True(added.Any(m => m.Contains($"'{key}", StringComparison.Ordinal)),
            $"leaving out required {sectionTitle}.{key} gave no error naming it; new errors: {string.Join(" | ", added)}");
    }

    public static TheoryData<string, string> OptionalKeys()
    {
        var data = new TheoryData<string, string>();
        foreach (var section in GrammarSamples.AllSections())
        {
            var inRules = section.Rules.SelectMany(SectionGrammar.RuleKeys).ToHashSet();
            foreach (var key in section.Keys.Where(k => !k.Required && !inRules.Contains(k.Name)))
            {
                data.Add(section.Title, key.Name);
            }
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(OptionalKeys))]
    public void An_optional_key_left_out_is_not_asked_for(string sectionTitle, string key)
    {
        var section = GrammarSamples.AllSections().Single(s => s.Title == sectionTitle);
        var added = NewErrors(new GrammarSamples((s, k) => s != section || k.Name != key));
        Assert.DoesNotContain(added, m => m.Contains($"needs '{key}", StringComparison.Ordinal) || m.Contains($"missing '{key}", StringComparison.Ordinal));
    }

    [Fact]
    public void At_least_one_of_rules_are_enforced_by_the_reader()
    {
        foreach (var section in GrammarSamples.AllSections())
        {
            foreach (var rule in section.Rules.OfType<AtLeastOneOf>())
            {
                var added = NewErrors(new GrammarSamples((s, k) => s != section || !rule.Keys.Contains(k.Name)));
                Assert.True(added.Any(m => m.Contains($"'{rule.Keys[0]}", StringComparison.Ordinal)),
                    $"leaving out all of {string.Join(", ", rule.Keys)} in {section.Title} gave no error; new errors: {string.Join(" | ", added)}");
            }
        }
    }

    [Fact]
    public void Kinds_that_share_keys_are_read_with_the_union_first()
    {
        Assert.Equal(["kind", "weight", "on", "order", "norm", "max"], SpecGrammar.Penalty.Union.Names);
        Assert.Equal(["kind", "tau", "width", "limit", "p", "cap"], SpecGrammar.Loss.Union.Names);
        Assert.Equal(["l2", "l1", "linf", "minimax", "none"], SpecGrammar.Loss.BareWords);
        Assert.Empty(SpecGrammar.Penalty.BareWords);
    }

    [Theory]
    [InlineData(0.0, 1.0, true, true, "strictly between 0 and 1")]
    [InlineData(1.0, 30.0, false, false, "between 1 and 30")]
    [InlineData(0.0, null, false, false, "0 or more")]
    [InlineData(1.0, null, true, false, "greater than 1")]
    [InlineData(null, 5.0, false, true, "less than 5")]
    [InlineData(1.0, 1.0, false, false, "1")]
    public void Ranges_read_as_the_messages_say(double? min, double? max, bool minExclusive, bool maxExclusive, string words)
    {
        var range = new NumberRange(min, minExclusive, max, maxExclusive);
        Assert.Equal(words, range.Describe());
        if (min is { } a)
        {
            Assert.Equal(!minExclusive, range.Contains(a));
            Assert.False(range.Contains(a - 1e-9));
        }

        if (max is { } b)
        {
            Assert.Equal(!maxExclusive, range.Contains(b));
            Assert.False(range.Contains(b + 1e-9));
        }
    }

    [Fact]
    public void A_rule_naming_an_unknown_key_is_refused()
    {
        Assert.Throws<ArgumentException>(() => new SectionGrammar("t", "d", [new KeySpec("a", TextShape.Any, false, "a")], [new AtLeastOneOf(["a", "b"])]));
    }

    private static bool IsTermMarker(SectionGrammar section, KeySpec key) =>
        SpecGrammar.TermExpanders.Contains(section) && section.Keys[0] == key;

    // Messages of errors the reader gives for the reduced samples and not for the full ones.
    private static List<string> NewErrors(GrammarSamples reduced)
    {
        static HashSet<string> Messages(GrammarSamples samples) =>
            [.. samples.Documents().SelectMany(d => SpecReader.Parse("sample.fit.yaml", Encoding.UTF8.GetBytes(d)).Errors).Select(e => e.Message)];

        var baseline = Messages(new GrammarSamples());
        return [.. Messages(reduced).Where(m => !baseline.Contains(m))];
    }
}
