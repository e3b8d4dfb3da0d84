using System.Text.Json;
using FitSpec.Diagnostics;

namespace FitSpec.Review;

/// <summary>
/// Reads one &lt;name&gt;.result.json into a <see cref="ResultSummary"/>. Tolerant of what later versions add
/// (unknown keys are ignored, numbers may be null) and strict about the keys it reads: a file that is not a
/// FitSpec result, or not JSON, is a <see cref="FitSpecException"/> naming the file, line, column and key.
/// </summary>
public static class ResultFile
{
    /// <summary>The file-name ending `fitspec solve` gives result records.</summary>
    public const string Suffix = ".result.json";

    /// <summary>The result-format version (the top-level "fitspec" key) this reader understands.</summary>
    public const int FormatVersion = 1;

    public static ResultSummary Read(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        byte[] bytes;
        try
        {
            bytes = File.ReadAllBytes(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new FitSpecException(new Diagnostic(path, null, null, null, $"cannot read the file: {e.Message}"));
        }

        return Parse(path, bytes);
    }

    /// <summary>Reads result JSON held in memory; <paramref name="path"/> is only used in messages.</summary>
    public static ResultSummary Parse(string path, ReadOnlyMemory<byte> utf8)
    {
        ArgumentNullException.ThrowIfNull(path);
        var json = utf8.Span.StartsWith("\uFEFF"u8) ? utf8[3..] : utf8;
        if (json.Span.Trim(" \t\r\n"u8).IsEmpty)
        {
            throw new FitSpecException(new Diagnostic(path, null, null, null, "the file is empty; expected a FitSpec result (<name>.result.json written by 'fitspec solve')"));
        }

        JsonDocument document;
        try
        {
            document = JsonDocument.Parse(json);
        }
        catch (JsonException e)
        {
            var (line, column) = JsonPosition.FromParser(json.Span, e.LineNumber ?? 0, e.BytePositionInLine ?? 0);
            throw new FitSpecException(new Diagnostic(path, line, column, null, $"not valid JSON: {ParserMessage(e)}"));
        }

        using (document)
        {
            return new SummaryReader(path, json).Read(document.RootElement);
        }
    }

    // The parser's message ends with its own 0-based position, which the located prefix replaces.
    private static string ParserMessage(JsonException e)
    {
        var text = e.Message;
        var at = text.IndexOf(" LineNumber:", StringComparison.Ordinal);
        return (at >= 0 ? text[..at] : text).TrimEnd(' ', '.', '|');
    }

    /// <summary>Walks a parsed document, raising located errors for keys of the wrong kind.</summary>
    private sealed class SummaryReader(string path, ReadOnlyMemory<byte> json)
    {
        public ResultSummary Read(JsonElement root)
        {
            if (root.ValueKind != JsonValueKind.Object)
            {
                throw Error([], $"not a FitSpec result: the document is {KindName(root.ValueKind)}, expected an object with 'fitspec', 'name' and 'status'");
            }

            if (!root.TryGetProperty("fitspec", out var version))
            {
                throw Error([], "not a FitSpec result: no top-level 'fitspec' format key (every <name>.result.json written by 'fitspec solve' has one)");
            }

            if (version.ValueKind != JsonValueKind.Number || !version.TryGetInt32(out var v) || v != FormatVersion)
            {
                throw Error([JsonStep.Of("fitspec")], $"result format {version.GetRawText()} is not one this version reads (format {FormatVersion}); compare results written by the same major version of FitSpec");
            }

            var name = RequiredString(root, "name");
            var status = RequiredString(root, "status");
            var problem = OptionalObject(root, [JsonStep.Of("problem")]);
            var data = OptionalObject(root, [JsonStep.Of("data")]);
            var provenance = OptionalObject(root, [JsonStep.Of("provenance")]);
            var dataSha = provenance is { } p ? OptionalString(p, [JsonStep.Of("provenance"), JsonStep.Of("data_sha256")]) : null;
            if (dataSha is null && data is { } d)
            {
                dataSha = OptionalString(d, [JsonStep.Of("data"), JsonStep.Of("sha256")]);
            }

            return new ResultSummary(
                path,
                name,
                status,
                problem is { } pr ? OptionalString(pr, [JsonStep.Of("problem"), JsonStep.Of("class")]) : null,
                OptionalNumber(root, [JsonStep.Of("objective")]),
                Coefficients(root),
                Metrics(root),
                Rules(root),
                provenance is { } pv ? OptionalString(pv, [JsonStep.Of("provenance"), JsonStep.Of("spec_sha256")]) : null,
                dataSha);
        }

        private List<NamedNumber> Coefficients(JsonElement root)
        {
            var list = new List<NamedNumber>();
            if (OptionalObject(root, [JsonStep.Of("coefficients")]) is not { } obj)
            {
                return list;
            }

            var seen = new HashSet<string>(StringComparer.Ordinal);
            foreach (var member in obj.EnumerateObject())
            {
                JsonStep[] at = [JsonStep.Of("coefficients"), JsonStep.Of(member.Name)];
                if (!seen.Add(member.Name))
                {
                    throw Error(at, $"coefficient '{member.Name}' appears twice");
                }

                list.Add(new NamedNumber(member.Name, Number(member.Value, at)));
            }

            return list;
        }

        // Metrics may gain structured members later; only numbers (or null) are compared.
        private List<NamedNumber> Metrics(JsonElement root)
        {
            var list = new List<NamedNumber>();
            if (OptionalObject(root, [JsonStep.Of("metrics")]) is not { } obj)
            {
                return list;
            }

            foreach (var member in obj.EnumerateObject())
            {
                if (member.Value.ValueKind is JsonValueKind.Number or JsonValueKind.Null && list.TrueForAll(m => m.Name != member.Name))
                {
                    list.Add(new NamedNumber(member.Name, Number(member.Value, [JsonStep.Of("metrics"), JsonStep.Of(member.Name)])));
                }
            }

            return list;
        }

        private List<RuleVerdict> Rules(JsonElement root)
        {
            var list = new List<RuleVerdict>();
            if (!root.TryGetProperty("acceptance", out var array) || array.ValueKind == JsonValueKind.Null)
            {
                return list;
            }

            if (array.ValueKind != JsonValueKind.Array)
            {
                throw Error([JsonStep.Of("acceptance")], $"expected a list of rules, found {KindName(array.ValueKind)}");
            }

            var i = 0;
            foreach (var entry in array.EnumerateArray())
            {
                JsonStep[] at = [JsonStep.Of("acceptance"), JsonStep.At(i++)];
                if (entry.ValueKind != JsonValueKind.Object)
                {
                    throw Error(at, $"expected a rule object with 'rule' and 'passed', found {KindName(entry.ValueKind)}");
                }

                var rule = RequiredString(entry, "rule", at);
                var hasPassed = entry.TryGetProperty("passed", out var passed);
                if (!hasPassed || passed.ValueKind is not (JsonValueKind.True or JsonValueKind.False))
                {
                    var found = hasPassed ? KindName(passed.ValueKind) : "no 'passed' key";
                    throw Error(hasPassed ? [.. at, JsonStep.Of("passed")] : at, $"rule '{rule}': 'passed' must be true or false, found {found}");
                }

                list.Add(new RuleVerdict(rule, OptionalNumber(entry, [.. at, JsonStep.Of("value")]), passed.GetBoolean()));
            }

            return list;
        }

        private string RequiredString(JsonElement obj, string key, JsonStep[]? parent = null)
        {
            JsonStep[] at = [.. parent ?? [], JsonStep.Of(key)];
            if (!obj.TryGetProperty(key, out var value))
            {
                var what = parent is null ? "not a FitSpec result: no top-level" : $"{JsonStep.Describe(parent)}: no";
                throw Error(parent ?? [], $"{what} '{key}' key");
            }

            return value.ValueKind == JsonValueKind.String
                ? value.GetString()!
                : throw Error(at, $"key '{JsonStep.Describe(at)}': expected a string, found {KindName(value.ValueKind)}");
        }

        private string? OptionalString(JsonElement obj, JsonStep[] at)
        {
            if (!obj.TryGetProperty(at[^1].Member!, out var value) || value.ValueKind == JsonValueKind.Null)
            {
                return null;
            }

            return value.ValueKind == JsonValueKind.String
                ? value.GetString()
                : throw Error(at, $"key '{JsonStep.Describe(at)}': expected a string or null, found {KindName(value.ValueKind)}");
        }

        private double? OptionalNumber(JsonElement obj, JsonStep[] at) =>
            obj.TryGetProperty(at[^1].Member!, out var value) ? Number(value, at) : null;

        private JsonElement? OptionalObject(JsonElement obj, JsonStep[] at)
        {
            if (!obj.TryGetProperty(at[^1].Member!, out var value) || value.ValueKind == JsonValueKind.Null)
            {
                return null;
            }

            return value.ValueKind == JsonValueKind.Object
                ? value
                : throw Error(at, $"key '{JsonStep.Describe(at)}': expected an object, found {KindName(value.ValueKind)}");
        }

        private double? Number(JsonElement value, JsonStep[] at)
        {
            if (value.ValueKind == JsonValueKind.Null)
            {
                return null;
            }

            if (value.ValueKind != JsonValueKind.Number)
            {
                throw Error(at, $"key '{JsonStep.Describe(at)}': expected a number or null, found {KindName(value.ValueKind)}");
            }

            return value.TryGetDouble(out var x) && double.IsFinite(x)
                ? x
                : throw Error(at, $"key '{JsonStep.Describe(at)}': {value.GetRawText()} is outside the range of a double");
        }

        private FitSpecException Error(JsonStep[] at, string message)
        {
            var place = JsonPosition.Locate(json.Span, at);
            return new FitSpecException(new Diagnostic(path, place?.Line, place?.Column, JsonStep.Describe(at), message));
        }

        private static string KindName(JsonValueKind kind) => kind switch
        {
            JsonValueKind.Object => "an object",
            JsonValueKind.Array => "a list",
            JsonValueKind.String => "a string",
            JsonValueKind.Number => "a number",
            JsonValueKind.True or JsonValueKind.False => "true/false",
            JsonValueKind.Null => "null",
            _ => "nothing",
        };
    }
}
