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

    /// <summary>A number with 4 significant digits, for diagnostics read by eye (t values, leverage, errors).</summary>
    public static string BriefNumber(object? value) => Format(value, "G4");

    /// <summary>A fraction as a percentage (0.95 → "95%"), up to 4 significant digits.</summary>
    public static string Percent(object? value) => value switch
    {
        double d when double.IsFinite(d) => FormatDouble(d * 100, "G4") + "%",
        float f when float.IsFinite(f) => FormatDouble(f * 100.0, "G4") + "%",
        _ => Format(value, "G4"),
    };

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

    /// <summary>
    /// Prose for HTML in which `backticked` parts are code (as in the tool's own sentences): everything is
    /// escaped, and each backticked part becomes a code element.
    /// </summary>
    public static string HtmlProse(object? value)
    {
        var sb = new StringBuilder();
        foreach (var (text, code) in ProseParts(Text(value)))
        {
            sb.Append(code ? "<code>" + Html(text) + "</code>" : Html(text));
        }

        return sb.ToString();
    }

    /// <summary>As <see cref="HtmlProse"/> for Markdown: backticked parts become safe code spans, the rest escaped text.</summary>
    public static string MarkdownProse(object? value)
    {
        var sb = new StringBuilder();
        foreach (var (text, code) in ProseParts(OneLine(Text(value))))
        {
            sb.Append(code ? CodeSpan(text, inTable: false) : EscapeMarkdown(text));
        }

        return sb.ToString();
    }

    /// <summary>A relative link target: each path segment percent-encoded, so any file name stays one link.</summary>
    public static string LinkTarget(object? value) =>
        string.Join('/', Text(value).Split('/').Select(Uri.EscapeDataString));

    // Splits at backtick pairs; an unpaired backtick is kept as text.
    private static IEnumerable<(string Text, bool Code)> ProseParts(string text)
    {
        var at = 0;
        while (at < text.Length)
        {
            var open = text.IndexOf('`', at);
            var close = open < 0 ? -1 : text.IndexOf('`', open + 1);
            if (close < 0)
            {
                yield return (text[at..], false);
                yield break;
            }

            if (open > at)
            {
                yield return (text[at..open], false);
            }

            if (close > open + 1)
            {
                yield return (text[(open + 1)..close], true);
            }

            at = close + 1;
        }
    }

    /// <summary>Markdown inline text on one line: punctuation that would start markup or break a table is escaped.</summary>
    public static string Markdown(object? value) => EscapeMarkdown(OneLine(Text(value)));

    /// <summary>
    /// Markdown prose that keeps the user's line breaks; markers that would open a heading, quote, list or
    /// setext underline at the start of a line are escaped so the text cannot restructure the report.
    /// </summary>
    public static string MarkdownBlock(object? value)
    {
        // Trailing blank lines (a folded YAML block ends in a newline) would leave an empty paragraph.
        var lines = Text(value).Replace("\r\n", "\n", StringComparison.Ordinal).Replace('\r', '\n').TrimEnd().Split('\n');
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
