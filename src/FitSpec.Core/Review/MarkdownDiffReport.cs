using System.Text;

namespace FitSpec.Review;

/// <summary>
/// The Markdown layout of a comparison, for a pull-request comment: a bold summary line first, then a table
/// per changed fit, then the added and removed fits as lists and the unchanged ones in one line.
/// </summary>
public static class MarkdownDiffReport
{
    public static string Render(ResultDiff diff, bool all)
    {
        ArgumentNullException.ThrowIfNull(diff);
        var md = new StringBuilder();
        var total = $"{diff.Fits.Count} {(diff.Fits.Count == 1 ? "fit" : "fits")}";
        var headline = diff.HasDifferences
            ? $"{diff.Count(ChangeKind.Changed)} changed, {diff.Count(ChangeKind.Added)} added, {diff.Count(ChangeKind.Removed)} removed, {diff.Count(ChangeKind.Unchanged)} unchanged"
            : "no differences";
        md.Append($"**FitSpec diff: {headline}** ({total}, {DiffRows.ToleranceNote(diff.Tolerance)})\n\n");
        md.Append($"Old results: {Code(diff.OldSource)} · new results: {Code(diff.NewSource)}\n");

        var detailed = diff.Fits.Where(f => f.Kind == ChangeKind.Changed)
            .Concat(all ? diff.Fits.Where(f => f.Kind == ChangeKind.Unchanged) : []);
        foreach (var fit in detailed)
        {
            md.Append($"\n#### {Code(fit.Name)} — {(fit.Kind == ChangeKind.Changed ? "changed" : "unchanged")}\n\n");
            md.Append("| item | old | new | change | relative |\n| --- | ---: | ---: | ---: | ---: |\n");
            foreach (var r in DiffRows.For(fit, diff.Tolerance, all))
            {
                var @new = r.FailsNow ? $"**{r.New}**" : r.New;
                md.Append($"| {Cell(What(r))} | {Cell(r.Old)} | {Cell(@new)} | {Cell(r.Change)} | {Cell(r.Relative)} |\n");
            }
        }

        List(md, "Added", diff.Fits.Where(f => f.Kind == ChangeKind.Added).Select(f => $"{Code(f.Name)}: {DiffRows.Outline(f.New!)}"));
        List(md, "Removed", diff.Fits.Where(f => f.Kind == ChangeKind.Removed).Select(f => $"{Code(f.Name)} (was {DiffRows.Outline(f.Old!)})"));
        var unchanged = diff.Fits.Where(f => f.Kind == ChangeKind.Unchanged).ToList();
        if (!all && unchanged.Count > 0)
        {
            md.Append($"\nUnchanged ({unchanged.Count}): ").AppendJoin(", ", unchanged.Select(f => Code(f.Name))).Append('\n');
        }

        return md.ToString();
    }

    private static void List(StringBuilder md, string title, IEnumerable<string> items)
    {
        var lines = items.ToList();
        if (lines.Count == 0)
        {
            return;
        }

        md.Append($"\n**{title}**\n\n");
        foreach (var line in lines)
        {
            md.Append("- ").Append(line).Append('\n');
        }
    }

    private static string What(DiffRow r) => r.Item is null ? r.Group : $"{r.Group} {Code(r.Item)}";

    // A pipe would end the table cell; a line break would end the row.
    private static string Cell(string text) => text.Replace("|", "\\|", StringComparison.Ordinal).ReplaceLineEndings(" ");

    /// <summary>A code span that survives backticks in the text (a longer fence, padded when needed).</summary>
    private static string Code(string text)
    {
        var longest = 0;
        var run = 0;
        foreach (var c in text)
        {
            run = c == '`' ? run + 1 : 0;
            longest = Math.Max(longest, run);
        }

        var fence = new string('`', longest + 1);
        var pad = text.StartsWith('`') || text.EndsWith('`') ? " " : "";
        return fence + pad + text.ReplaceLineEndings(" ") + pad + fence;
    }
}
