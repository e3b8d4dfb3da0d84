using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;
using OxyPlot;

namespace FitSpec.Reporting.Plots;

/// <summary>
/// Turns a plot model into SVG text that is the same bytes for the same model on any machine: a fixed size,
/// text measured with built-in font metrics (no system fonts), invariant numbers, ids derived from the plot's
/// key so several plots can sit in one HTML page.
/// </summary>
internal static partial class SvgExport
{
    public const int Width = 760;
    public const int Height = 430;

    /// <summary>The font the metrics are taken for, and the fallbacks a viewer may use.</summary>
    public const string Font = "Arial";

    private const string FontStack = "Arial, Liberation Sans, Helvetica, sans-serif";

    /// <summary>A standalone .svg file's text (with the SVG namespace) and the form inlined in HTML (without).</summary>
    public static (string File, string Inline) Export(PlotModel model, string key, string description)
    {
        ArgumentNullException.ThrowIfNull(model);
        var exporter = new SvgExporter
        {
            Width = Width,
            Height = Height,
            IsDocument = false,
            TextMeasurer = new TextMeasurer(),
            // Explicit offsets instead of dominant-baseline, which some SVG viewers ignore.
            UseVerticalTextAlignmentWorkaround = true,
        };
        string raw;
        using (var stream = new MemoryStream())
        {
            exporter.Export(model, stream);
            raw = Encoding.UTF8.GetString(stream.ToArray());
        }

        var body = Tidy(raw, key);
        var root = RootElement(description, withNamespace: true);
        var inlineRoot = RootElement(description, withNamespace: false);
        return (root + body, inlineRoot + body);
    }

    // Everything after the exporter's own <svg ...> start tag, with ids, fonts and line endings settled.
    private static string Tidy(string raw, string key)
    {
        var text = raw.Replace("\r\n", "\n", StringComparison.Ordinal).TrimStart('\uFEFF');
        var start = SvgStart().Match(text);
        if (!start.Success)
        {
            throw new InvalidOperationException("the plot exporter wrote no <svg> element");
        }

        var body = text[(start.Index + start.Length)..];

        // Rewrite only inside tags: user text in element content is escaped and never contains '<'.
        body = Tag().Replace(body, m => m.Value
            .Replace("id=\"clipPath", $"id=\"fitspec-{key}-clip", StringComparison.Ordinal)
            .Replace("url(#clipPath", $"url(#fitspec-{key}-clip", StringComparison.Ordinal)
            .Replace($"font-family=\"{Font}\"", $"font-family=\"{FontStack}\"", StringComparison.Ordinal)
            .Replace(" shape-rendering=\"geometricPrecision\"", "", StringComparison.Ordinal));

        // One element per line without indentation: a thinned scatter still has 2000 markers, and the
        // indentation alone would be a tenth of the file.
        var lines = body.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        return string.Join('\n', lines) + "\n";
    }

    private static string RootElement(string description, bool withNamespace)
    {
        var size = string.Create(CultureInfo.InvariantCulture, $"width=\"{Width}\" height=\"{Height}\" viewBox=\"0 0 {Width} {Height}\"");
        var ns = withNamespace ? " xmlns=\"http://www.w3.org/2000/svg\"" : "";
        return $"<svg{ns} {size} role=\"img\" aria-label=\"{EscapeAttribute(description)}\">\n";
    }

    /// <summary>Escapes text for a double-quoted XML/HTML attribute.</summary>
    public static string EscapeAttribute(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var sb = new StringBuilder(text.Length + 8);
        foreach (var ch in PlotText.Clean(text))
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

    [GeneratedRegex("<svg\\b[^>]*>")]
    private static partial Regex SvgStart();

    [GeneratedRegex("<[^>]+>")]
    private static partial Regex Tag();
}
