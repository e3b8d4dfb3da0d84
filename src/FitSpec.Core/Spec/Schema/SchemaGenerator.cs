using System.Text.Encodings.Web;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace FitSpec.Spec.Schema;

/// <summary>
/// Turns the spec grammar into a JSON Schema (draft 2020-12) for editors. The output is a pure function
/// of <see cref="SpecGrammar"/>: the same bytes every run, so the committed copy can be compared with it.
/// </summary>
public static class SchemaGenerator
{
    public const string Draft = "https://json-schema.org/draft/2020-12/schema";

    private static readonly JsonSerializerOptions Options = new()
    {
        WriteIndented = true,
        NewLine = "\n",
        // Descriptions hold '<', '>' and quotes; the file is read by people as well as editors.
        Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
    };

    /// <summary>The schema of the whole spec language, as the text of a JSON file (ends in a newline).</summary>
    public static string Generate() => Generate(SpecGrammar.Root);

    public static string Generate(SectionGrammar root)
    {
        ArgumentNullException.ThrowIfNull(root);
        var schema = new JsonObject
        {
            ["$schema"] = Draft,
            ["$comment"] = "Generated from the spec grammar (src/FitSpec.Core/Spec/Schema/SpecGrammar.cs) by 'fitspec schema'; do not edit by hand.",
            ["title"] = "FitSpec fit specification",
            ["description"] = root.Description,
        };
        foreach (var (key, value) in Section(root))
        {
            schema[key] = value?.DeepClone();
        }

        return schema.ToJsonString(Options) + "\n";
    }

    private static JsonObject Shape(ValueShape shape) => shape switch
    {
        TextShape t => Text(t),
        NumberShape n => Number(n),
        WordShape w => new JsonObject { ["enum"] = Strings(w.Words) },
        OneOrListShape o => new JsonObject
        {
            ["anyOf"] = new JsonArray(Shape(o.Item), new JsonObject { ["type"] = "array", ["items"] = Shape(o.Item) }),
        },
        ListShape l => List(l),
        NameMapShape m => NameMap(m),
        SectionShape s => Section(s.Section),
        ChoiceShape c => new JsonObject { ["anyOf"] = new JsonArray([.. c.Choices.Select(x => (JsonNode)Alternative(x))]) },
        KindedShape k => Kinded(k),
        _ => throw new InvalidOperationException($"no schema for grammar shape {shape.GetType().Name}"),
    };

    // An alternative that is a mapping carries its own description, so an editor can tell the forms apart.
    private static JsonObject Alternative(ValueShape shape)
    {
        var schema = Shape(shape);
        return shape switch
        {
            SectionShape s => WithDescription(s.Section.Description, schema),
            TextShape { What: { } what } => WithDescription(what, schema),
            _ => schema,
        };
    }

    // The reader takes any single value as text (YAML's 1 and true included), so the schema does too.
    private static JsonObject Text(TextShape t)
    {
        var schema = new JsonObject { ["type"] = Strings(["string", "number", "boolean"]) };
        if (t.Pattern is { } p)
        {
            schema["pattern"] = p;
        }

        return schema;
    }

    private static JsonObject Number(NumberShape n)
    {
        JsonNode Value(double x) => n.Integer ? JsonValue.Create((long)x) : JsonValue.Create(x);
        var r = n.Range;
        if (r.IsExact)
        {
            return new JsonObject { ["const"] = Value(r.Min!.Value) };
        }

        var schema = new JsonObject { ["type"] = n.Integer ? "integer" : "number" };
        if (r.Min is { } lo)
        {
            schema[r.MinExclusive ? "exclusiveMinimum" : "minimum"] = Value(lo);
        }

        if (r.Max is { } hi)
        {
            schema[r.MaxExclusive ? "exclusiveMaximum" : "maximum"] = Value(hi);
        }
        else if (n.Integer)
        {
            // The reader reads whole numbers as 32-bit integers.
            schema["maximum"] = int.MaxValue;
        }

        return schema;
    }

    private static JsonObject List(ListShape l)
    {
        var schema = new JsonObject { ["type"] = "array", ["items"] = Shape(l.Item) };
        if (l.MinItems > 0)
        {
            schema["minItems"] = l.MinItems;
        }

        if (l.MaxItems is { } max)
        {
            schema["maxItems"] = max;
        }

        return schema;
    }

    private static JsonObject NameMap(NameMapShape m)
    {
        var schema = new JsonObject { ["type"] = "object" };
        if (m.NamePattern is { } p)
        {
            schema["propertyNames"] = new JsonObject { ["pattern"] = p };
        }

        if (m.MinEntries > 0)
        {
            schema["minProperties"] = m.MinEntries;
        }

        schema["additionalProperties"] = Shape(m.Value);
        return schema;
    }

    // Every mapping the reader reads rejects unknown keys, hence additionalProperties: false throughout.
    private static JsonObject Section(SectionGrammar section)
    {
        var properties = new JsonObject();
        foreach (var key in section.Keys)
        {
            properties[key.Name] = WithDescription(key.Description, Shape(key.Shape));
        }

        var schema = new JsonObject { ["type"] = "object", ["properties"] = properties };
        var required = section.RequiredNames.ToList();
        if (required.Count > 0)
        {
            schema["required"] = Strings(required);
        }

        schema["additionalProperties"] = false;
        if (section.Rules.Count > 0)
        {
            schema["allOf"] = new JsonArray([.. section.Rules.Select(r => (JsonNode)Rule(r))]);
        }

        return schema;
    }

    private static JsonObject Rule(KeyRule rule) => rule switch
    {
        AtLeastOneOf a => new JsonObject
        {
            ["anyOf"] = new JsonArray([.. a.Keys.Select(k => (JsonNode)Required(k))]),
        },
        NotWith n => new JsonObject
        {
            ["not"] = n.Others.Count == 1
                ? Required(n.Key, n.Others[0])
                : new JsonObject { ["anyOf"] = new JsonArray([.. n.Others.Select(o => (JsonNode)Required(n.Key, o))]) },
        },
        NeedsAlso d => new JsonObject { ["dependentRequired"] = new JsonObject { [d.Key] = Strings([d.Other]) } },
        _ => throw new InvalidOperationException($"no schema for grammar rule {rule.GetType().Name}"),
    };

    // The kind word picks the keys: one if/then branch per section, kinds sharing a section grouped.
    private static JsonObject Kinded(KindedShape k)
    {
        var branches = new JsonArray();
        foreach (var (kinds, section) in k.Groups)
        {
            JsonObject Words() => kinds.Count == 1
                ? new JsonObject { ["const"] = kinds[0] }
                : new JsonObject { ["enum"] = Strings(kinds) };
            var then = WithDescription(section.Description, Section(section));

            // Inside its branch the kind can only be one of the branch's words.
            var properties = (JsonObject)then["properties"]!;
            properties[KindedShape.Discriminator] = WithDescription(section.Keys[0].Description, Words());
            branches.Add(new JsonObject
            {
                ["if"] = new JsonObject
                {
                    ["required"] = Strings([KindedShape.Discriminator]),
                    ["properties"] = new JsonObject { [KindedShape.Discriminator] = Words() },
                },
                ["then"] = then,
            });
        }

        var mapping = new JsonObject
        {
            ["type"] = "object",
            ["required"] = Strings([KindedShape.Discriminator]),
            ["properties"] = new JsonObject
            {
                [KindedShape.Discriminator] = WithDescription(k.Groups[0].Section.Keys[0].Description, new JsonObject { ["enum"] = Strings(k.Kinds) }),
            },
            ["allOf"] = branches,
        };

        var bare = k.BareWords.ToList();
        if (bare.Count == 0)
        {
            return WithDescription(k.Description, mapping);
        }

        return new JsonObject
        {
            ["anyOf"] = new JsonArray(
                new JsonObject { ["description"] = $"A {k.Noun} without parameters, written as its bare word.", ["enum"] = Strings(bare) },
                WithDescription($"A {k.Noun} as a mapping: its kind and its parameters.", mapping)),
        };
    }

    private static JsonObject WithDescription(string description, JsonObject schema)
    {
        var result = new JsonObject { ["description"] = description };
        foreach (var (key, value) in schema.ToList())
        {
            if (key != "description")
            {
                schema.Remove(key);
                result[key] = value;
            }
        }

        return result;
    }

    private static JsonObject Required(params string[] keys) => new() { ["required"] = Strings(keys) };

    private static JsonArray Strings(IEnumerable<string> items) => new([.. items.Select(s => (JsonNode)JsonValue.Create(s))]);
}
