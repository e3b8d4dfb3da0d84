using System.Globalization;
using System.Numerics;
using System.Text;
using FitSpec.Results;

namespace FitSpec.Reporting;

/// <summary>
/// Helpers exposed to report templates. Every number goes through here so reports are invariant-culture and
/// byte-identical for the same result, whatever the machine's locale.
/// </summary>
internal static class ReportFunctions
{
    /// <summary>Shown wherever a value is absent (null, NaN, empty text).</summary>
    public const string Missing = "—";

    /// <summary>A number with up to 10 significant digits; integers in full.</summary>
    public static string Number(object? value) => Format(value, "G10");

    /// <summary>A number with 15 significant digits, for coefficients that users copy elsewhere.</summary>
    public static string FullNumber(object? value) => Format(value, "G15");

    private static string Format(object? value, string format) => value switch
    {
        null => Missing,
        double d => FormatDouble(d, format),
        float f => FormatDouble(f, format),
        decimal m => FormatDouble((double)m, format),
        int or long or short or byte or sbyte or uint or ulong or ushort or BigInteger =>
            ((IFormattable)value).ToString(null, CultureInfo.InvariantCulture),
        bool b => YesNo(b),
        string s => s.Length == 0 ? Missing : s,
        IFormattable other => other.ToString(null, CultureInfo.InvariantCulture),
        _ => value.ToString() ?? Missing,
    };

    private static string FormatDouble(double d, string format)
    {
        if (double.IsNaN(d))
        {
            return Missing;
        }

        if (double.IsInfinity(d))
        {
            return d > 0 ? "∞" : "-∞";
        }

        // Negative zero would print as "-0", which reads as a sign error.
        return d == 0 ? "0" : d.ToString(format, CultureInfo.InvariantCulture);
    }

    public static string YesNo(object? value) => value is bool b ? (b ? "yes" : "no") : Missing;

    public static string PassFail(object? value) => value is bool b ? (b ? "PASS" : "FAIL") : Missing;

    /// <summary>Text or the missing marker, unescaped (for callers that escape afterwards).</summary>
    public static string Text(object? value) => value is null || (value is string s && string.IsNullOrWhiteSpace(s))
        ? Missing
        : Convert.ToString(value, CultureInfo.InvariantCulture) ?? Missing;

    /// <summary>Escapes text for HTML element content and quoted attribute values.</summary>
    public static string Html(object? value)
    {
        var text = Text(value);
        var sb = new StringBuilder(text.Length + 16);
        foreach (var ch in text)
        {
            sb.Append(ch switch
            {
                '&' => "&amp;",
                '<' => "&lt;",
                '>' => "&gt;",
                '"' => "&quot;",
                '\'' => "&#39;",
                _ => ch.ToString(),
            });
        }

        return sb.ToString();
    }

    /// <summary>Markdown inline text on one line: punctuation that would start markup or break a table is escaped.</summary>
    public static string Markdown(object? value) => EscapeMarkdown(OneLine(Text(value)));

    /// <summary>
    /// Markdown prose that keeps the user's line breaks; markers that would open a heading, quote, list or
    /// setext underline at the start of a line are escaped so the text cannot restructure the report.
    /// </summary>
    public static string MarkdownBlock(object? value)
    {
        var lines = Text(value).Replace("\r\n", "\n", StringComparison.Ordinal).Replace('\r', '\n').Split('\n');
        var sb = new StringBuilder();
        for (var i = 0; i < lines.Length; i++)
        {
            if (i > 0)
            {
                sb.Append('\n');
            }

            var line = lines[i].TrimEnd();
            var start = line.Length - line.TrimStart().Length;
            var escaped = EscapeMarkdown(line[start..]);
            if (escaped.Length > 0 && "#>-+=".Contains(escaped[0], StringComparison.Ordinal))
            {
                escaped = "\\" + escaped;
            }

            sb.Append(escaped);
        }

        return sb.ToString();
    }

    /// <summary>A Markdown code span whose fence is longer than any backtick run inside, so user text cannot close it.</summary>
    public static string MarkdownCode(object? value) => CodeSpan(value, inTable: false);

    /// <summary>As <see cref="MarkdownCode"/>, with pipes escaped so the span stays inside one table cell.</summary>
    public static string MarkdownCodeCell(object? value) => CodeSpan(value, inTable: true);

    private static string CodeSpan(object? value, bool inTable)
    {
        if (value is null || (value is string s && string.IsNullOrWhiteSpace(s)))
        {
            return Missing;
        }

        var text = OneLine(Text(value));
        var longest = 0;
        var run = 0;
        foreach (var ch in text)
        {
            run = ch == '`' ? run + 1 : 0;
            longest = Math.Max(longest, run);
        }

        var fence = new string('`', longest + 1);
        var pad = text.StartsWith('`') || text.EndsWith('`') ? " " : "";
        if (inTable)
        {
            text = text.Replace("|", "\\|", StringComparison.Ordinal);
        }

        return fence + pad + text + pad + fence;
    }

    /// <summary>Where an error was found, as file:line:column (parts that are unknown are left out).</summary>
    public static string Location(object? value)
    {
        if (value is not ErrorEntry e)
        {
            return Missing;
        }

        var sb = new StringBuilder(e.File);
        if (e.Line is { } line)
        {
            sb.Append(':').Append(line.ToString(CultureInfo.InvariantCulture));
            if (e.Column is { } column)
            {
                sb.Append(':').Append(column.ToString(CultureInfo.InvariantCulture));
            }
        }

        return sb.ToString();
    }

    private static string OneLine(string text)
    {
        if (text.IndexOfAny(['\r', '\n']) < 0)
        {
            return text;
        }

        var parts = text.Split(['\r', '\n'], StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        return string.Join(' ', parts);
    }

    private static string EscapeMarkdown(string text)
    {
        var sb = new StringBuilder(text.Length + 8);
        foreach (var ch in text)
        {
            if (ch is '\\' or '`' or '*' or '_' or '[' or ']' or '<' or '>' or '|' or '~' or '&')
            {
                sb.Append('\\');
            }

            sb.Append(ch);
        }

        return sb.ToString();
    }
}
