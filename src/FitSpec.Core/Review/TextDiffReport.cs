using System.Text;

namespace FitSpec.Review;

/// <summary>The plain-text layout of a comparison, for a terminal: aligned columns per changed fit.</summary>
public static class TextDiffReport
{
    private static readonly string[] Header = ["item", "old", "new", "change", "relative"];

    /// <summary>Unchanged fits are one line unless <paramref name="all"/>, which details every fit and item.</summary>
    public static string Render(ResultDiff diff, bool all)
    {
        ArgumentNullException.ThrowIfNull(diff);
        var text = new StringBuilder();
        text.Append("fitspec diff: ").Append(diff.OldSource).Append(" → ").Append(diff.NewSource).Append('\n');
        text.Append(DiffRows.ToleranceNote(diff.Tolerance)).Append(diff.Tolerance.IsExact ? " (any change of a stored value counts)\n" : "\n");
        text.Append(diff.HasDifferences ? DiffRows.Counts(diff) : $"no differences in {diff.Fits.Count} {(diff.Fits.Count == 1 ? "fit" : "fits")}").Append('\n');

        var detailed = diff.Fits.Where(f => f.Kind == ChangeKind.Changed)
            .Concat(all ? diff.Fits.Where(f => f.Kind == ChangeKind.Unchanged) : []);
        foreach (var fit in detailed)
        {
            text.Append('\n').Append(fit.Kind == ChangeKind.Changed ? "changed: " : "unchanged: ").Append(fit.Name).Append('\n');
            AppendTable(text, DiffRows.For(fit, diff.Tolerance, all));
        }

        var added = diff.Fits.Where(f => f.Kind == ChangeKind.Added).ToList();
        var removed = diff.Fits.Where(f => f.Kind == ChangeKind.Removed).ToList();
        var unchanged = all ? [] : diff.Fits.Where(f => f.Kind == ChangeKind.Unchanged).ToList();
        if (added.Count + removed.Count + unchanged.Count > 0)
        {
            text.Append('\n');
        }

        foreach (var fit in added)
        {
            text.Append("added: ").Append(fit.Name).Append(" (").Append(DiffRows.Outline(fit.New!)).Append(")\n");
        }

        foreach (var fit in removed)
        {
            text.Append("removed: ").Append(fit.Name).Append(" (was ").Append(DiffRows.Outline(fit.Old!)).Append(")\n");
        }

        if (unchanged.Count > 0)
        {
            text.Append($"unchanged ({unchanged.Count}): ").AppendJoin(", ", unchanged.Select(f => f.Name)).Append('\n');
        }

        return text.ToString();
    }

    private static void AppendTable(StringBuilder text, IReadOnlyList<DiffRow> rows)
    {
        var cells = new List<string[]> { Header };
        cells.AddRange(rows.Select(r => new[] { What(r), r.Old, r.New, r.Change, r.Relative }));
        var widths = Enumerable.Range(0, Header.Length).Select(c => cells.Max(row => row[c].Length)).ToArray();
        foreach (var row in cells)
        {
            var line = new StringBuilder("  ");
            for (var c = 0; c < row.Length; c++)
            {
                line.Append(row[c].PadRight(widths[c])).Append("  ");
            }

            text.Append(line.ToString().TrimEnd()).Append('\n');
        }
    }

    private static string What(DiffRow r) => r.Item is null ? r.Group : r.Group == "rule" ? $"rule \"{r.Item}\"" : $"{r.Group} {r.Item}";
}
