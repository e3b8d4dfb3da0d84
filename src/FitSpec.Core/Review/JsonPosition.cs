using System.Text.Json;

namespace FitSpec.Review;

/// <summary>One step of a key path in a JSON document: a member name or an array index.</summary>
public readonly record struct JsonStep(string? Member, int Index)
{
    public static JsonStep Of(string member) => new(member, -1);

    public static JsonStep At(int index) => new(null, index);

    /// <summary>A path as the messages print it: coefficients.b1, acceptance[2].passed.</summary>
    public static string Describe(IReadOnlyList<JsonStep> path)
    {
        ArgumentNullException.ThrowIfNull(path);
        var text = new System.Text.StringBuilder();
        foreach (var step in path)
        {
            if (step.Member is { } m)
            {
                text.Append(text.Length == 0 ? "" : ".").Append(m);
            }
            else
            {
                text.Append('[').Append(step.Index).Append(']');
            }
        }

        return text.Length == 0 ? "(top level)" : text.ToString();
    }
}

/// <summary>
/// Finds where a key path sits in UTF-8 JSON text, as a 1-based line and column, so that a message about a
/// well-formed but wrong file can point at the place (a parsed document keeps no positions).
/// </summary>
internal static class JsonPosition
{
    /// <summary>The position of the member's name (or the array element) at <paramref name="path"/>; null if absent.</summary>
    public static (int Line, int Column)? Locate(ReadOnlySpan<byte> json, IReadOnlyList<JsonStep> path)
    {
        var reader = new Utf8JsonReader(json);
        var frames = new List<Frame>();
        try
        {
            while (reader.Read())
            {
                switch (reader.TokenType)
                {
                    case JsonTokenType.PropertyName:
                        frames[^1] = frames[^1] with { Member = reader.GetString() };
                        if (frames.Count == path.Count && Matches(frames, path))
                        {
                            return LineColumn(json, reader.TokenStartIndex);
                        }

                        break;
                    case JsonTokenType.EndObject or JsonTokenType.EndArray:
                        frames.RemoveAt(frames.Count - 1);
                        break;
                    default:
                        if (frames.Count == 0 && path.Count == 0)
                        {
                            return LineColumn(json, reader.TokenStartIndex);
                        }

                        if (frames.Count > 0 && frames[^1].IsArray)
                        {
                            frames[^1] = frames[^1] with { Index = frames[^1].Index + 1 };
                            if (frames.Count == path.Count && Matches(frames, path))
                            {
                                return LineColumn(json, reader.TokenStartIndex);
                            }
                        }

                        if (reader.TokenType is JsonTokenType.StartObject or JsonTokenType.StartArray)
                        {
                            frames.Add(new Frame(reader.TokenType == JsonTokenType.StartArray, null, -1));
                        }

                        break;
                }
            }
        }
        catch (JsonException)
        {
            // Only well-formed documents are located; a malformed one is reported by the parser's own position.
        }

        return null;
    }

    /// <summary>1-based line and column (in characters) of a byte offset.</summary>
    public static (int Line, int Column) LineColumn(ReadOnlySpan<byte> json, long offset)
    {
        var end = (int)Math.Min(offset, json.Length);
        var line = 1;
        var lineStart = 0;
        for (var i = 0; i < end; i++)
        {
            if (json[i] == (byte)'\n')
            {
                line++;
                lineStart = i + 1;
            }
        }

        return (line, 1 + Characters(json[lineStart..end]));
    }

    /// <summary>1-based line and column of a parser position (0-based line, 0-based byte in that line).</summary>
    public static (int Line, int Column) FromParser(ReadOnlySpan<byte> json, long line0, long byteInLine0)
    {
        var start = 0;
        for (long l = 0; l < line0 && start < json.Length; l++)
        {
            var next = json[start..].IndexOf((byte)'\n');
            if (next < 0)
            {
                break;
            }

            start += next + 1;
        }

        var end = (int)Math.Min(json.Length, start + byteInLine0);
        return ((int)line0 + 1, 1 + Characters(json[start..end]));
    }

    // UTF-8 continuation bytes (10xxxxxx) do not start a character.
    private static int Characters(ReadOnlySpan<byte> bytes)
    {
        var count = 0;
        foreach (var b in bytes)
        {
            if ((b & 0xC0) != 0x80)
            {
                count++;
            }
        }

        return count;
    }

    private static bool Matches(List<Frame> frames, IReadOnlyList<JsonStep> path)
    {
        for (var i = 0; i < frames.Count; i++)
        {
            var step = path[i];
            var frame = frames[i];
            var same = step.Member is { } m ? !frame.IsArray && frame.Member == m : frame.IsArray && frame.Index == step.Index;
            if (!same)
            {
                return false;
            }
        }

        return true;
    }

    private readonly record struct Frame(bool IsArray, string? Member, int Index);
}
