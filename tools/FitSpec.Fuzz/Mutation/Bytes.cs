using System.Text;

namespace FitSpec.Fuzz.Mutation;

/// <summary>Small byte-array helpers the edits share: splicing, and finding the token or line at an offset.</summary>
public static class Bytes
{
    public static byte[] Utf8(string text) => Encoding.UTF8.GetBytes(text);

    /// <summary>data with <paramref name="count"/> bytes at <paramref name="at"/> replaced by <paramref name="insert"/>.</summary>
    public static byte[] Splice(byte[] data, int at, int count, ReadOnlySpan<byte> insert)
    {
        ArgumentNullException.ThrowIfNull(data);
        at = Math.Clamp(at, 0, data.Length);
        count = Math.Clamp(count, 0, data.Length - at);
        var result = new byte[data.Length - count + insert.Length];
        data.AsSpan(0, at).CopyTo(result);
        insert.CopyTo(result.AsSpan(at));
        data.AsSpan(at + count).CopyTo(result.AsSpan(at + insert.Length));
        return result;
    }

    /// <summary>
    /// The token at or after <paramref name="at"/>: a run of word bytes (letters, digits, '_', '.', non-ASCII),
    /// or one punctuation byte. Whitespace before it is skipped; [end, end) at the end of the data.
    /// </summary>
    public static (int Start, int End) TokenAt(byte[] data, int at)
    {
        ArgumentNullException.ThrowIfNull(data);
        var start = at;
        while (start < data.Length && IsSpace(data[start]))
        {
            start++;
        }

        if (start >= data.Length)
        {
            return (data.Length, data.Length);
        }

        if (!IsWord(data[start]))
        {
            return (start, start + 1);
        }

        while (start > 0 && IsWord(data[start - 1]))
        {
            start--;
        }

        var end = start;
        while (end < data.Length && IsWord(data[end]))
        {
            end++;
        }

        return (start, end);
    }

    /// <summary>The line holding <paramref name="at"/>, with its line end.</summary>
    public static (int Start, int End) LineAt(byte[] data, int at)
    {
        ArgumentNullException.ThrowIfNull(data);
        var start = at;
        while (start > 0 && data[start - 1] != '\n')
        {
            start--;
        }

        var end = at;
        while (end < data.Length && data[end] != '\n')
        {
            end++;
        }

        return (start, Math.Min(end + 1, data.Length));
    }

    /// <summary>The offset just after the next occurrence of <paramref name="pattern"/> at or after <paramref name="at"/>, or -1.</summary>
    public static int After(byte[] data, int at, ReadOnlySpan<byte> pattern)
    {
        ArgumentNullException.ThrowIfNull(data);
        var found = data.AsSpan(Math.Clamp(at, 0, data.Length)).IndexOf(pattern);
        return found < 0 ? -1 : at + found + pattern.Length;
    }

    public static byte[] Repeat(string piece, int times)
    {
        var builder = new StringBuilder(piece.Length * times);
        for (var i = 0; i < times; i++)
        {
            builder.Append(piece);
        }

        return Utf8(builder.ToString());
    }

    /// <summary>A depth drawn from a raw argument: mostly shallow, sometimes far beyond any limit (up to 100,000).</summary>
    public static int Depth(int argument) => (argument % 8) switch
    {
        0 => 100_000,
        1 => 10_000 + (argument % 5000),
        2 => 1000 + (argument % 300),
        _ => 1 + (argument % 300),
    };

    private static bool IsSpace(byte b) => b is (byte)' ' or (byte)'\n' or (byte)'\r' or (byte)'\t';

    private static bool IsWord(byte b) => b >= 0x80 || char.IsAsciiLetterOrDigit((char)b) || b is (byte)'_' or (byte)'.';
}
