using System.Globalization;

namespace FitSpec.Review;

/// <summary>
/// One line of a fit's comparison, already worded: what (Group, and Item for a named coefficient, metric or
/// rule), the old and new values, the change and the relative change. FailsNow marks a rule that now fails
/// (its verdict flipped, or it is new and fails).
/// </summary>
public sealed record DiffRow(string Group, string? Item, string Old, string New, string Change, string Relative, bool FailsNow = false);

/// <summary>The words and number formats both report layouts share: which rows a fit shows and how they read.</summary>
public static class DiffRows
{
    /// <summary>Shown for a value a side does not have.</summary>
    public const string Absent = "—";

    /// <summary>The rows of one fit: the differences only, or every compared item when <paramref name="all"/>.</summary>
    public static IReadOnlyList<DiffRow> For(FitChange fit, NumberTolerance tolerance, bool all)
    {
        ArgumentNullException.ThrowIfNull(fit);
        var rows = new List<DiffRow>();
        foreach (var f in fit.Facts.Where(f => all || f.Kind != ChangeKind.Unchanged))
        {
            rows.Add(FactRow(f));
        }

        foreach (var n in new[] { fit.Objective }.Where(n => all || n.Kind != ChangeKind.Unchanged))
        {
            rows.Add(NumberRow("objective", null, n, tolerance));
        }

        rows.AddRange(fit.Coefficients.Where(n => all || n.Kind != ChangeKind.Unchanged).Select(n => NumberRow("coefficient", n.Name, n, tolerance)));
        rows.AddRange(fit.Metrics.Where(n => all || n.Kind != ChangeKind.Unchanged).Select(n => NumberRow("metric", n.Name, n, tolerance)));
        rows.AddRange(fit.Acceptance.Where(r => all || r.Kind != ChangeKind.Unchanged).Select(RuleRow));
        return rows;
    }

    /// <summary>The shortest text that reads back as the same double, so that any change shows.</summary>
    public static string Number(double? value) =>
        value is { } v ? v.ToString("R", CultureInfo.InvariantCulture) : "none";

    /// <summary>A signed difference, six significant digits.</summary>
    public static string Signed(double value) =>
        (value > 0 ? "+" : "") + value.ToString("G6", CultureInfo.InvariantCulture);

    /// <summary>A signed percentage: whole percents from 100 up, else three significant digits.</summary>
    public static string Percent(double relative)
    {
        var percent = relative * 100;
        var digits = Math.Abs(percent) >= 100 ? percent.ToString("0", CultureInfo.InvariantCulture) : percent.ToString("G3", CultureInfo.InvariantCulture);
        return (percent > 0 ? "+" : "") + digits + "%";
    }

    /// <summary>How the tolerance in force reads in a report header.</summary>
    public static string ToleranceNote(NumberTolerance tolerance) =>
        tolerance.IsExact
            ? "numbers compared exactly"
            : $"numbers within {tolerance.Value.ToString("R", CultureInfo.InvariantCulture)} × max(1, |old|) of the old value count as unchanged";

    /// <summary>The counts line: "5 fits: 2 changed, 1 added, 1 removed, 1 unchanged".</summary>
    public static string Counts(ResultDiff diff)
    {
        ArgumentNullException.ThrowIfNull(diff);
        var total = diff.Fits.Count;
        return $"{total} {(total == 1 ? "fit" : "fits")}: {diff.Count(ChangeKind.Changed)} changed, {diff.Count(ChangeKind.Added)} added, "
            + $"{diff.Count(ChangeKind.Removed)} removed, {diff.Count(ChangeKind.Unchanged)} unchanged";
    }

    /// <summary>What a fit present on one side only is: "optimal, objective 0.5, 2 coefficients".</summary>
    public static string Outline(ResultSummary fit)
    {
        ArgumentNullException.ThrowIfNull(fit);
        var parts = new List<string> { fit.Status };
        if (fit.Objective is { } o)
        {
            parts.Add("objective " + o.ToString("G6", CultureInfo.InvariantCulture));
        }

        if (fit.Coefficients.Count > 0)
        {
            parts.Add($"{fit.Coefficients.Count} {(fit.Coefficients.Count == 1 ? "coefficient" : "coefficients")}");
        }

        if (fit.Acceptance.Count > 0)
        {
            var failed = fit.Acceptance.Count(a => !a.Passed);
            parts.Add(failed == 0 ? $"{fit.Acceptance.Count} rules pass" : $"{failed} of {fit.Acceptance.Count} rules fail");
        }

        return string.Join(", ", parts);
    }

    private static DiffRow FactRow(FactChange f)
    {
        var isHash = f.Fact is FitFact.SpecSha256 or FitFact.DataSha256;
        string Show(string? s) => s is null ? Absent : isHash ? Short(s) : s;
        var change = f.Kind switch
        {
            ChangeKind.Unchanged => "",
            ChangeKind.Added => "added",
            ChangeKind.Removed => "removed",
            _ => f.Fact switch
            {
                FitFact.Name => "renamed",
                FitFact.SpecSha256 => "spec edited",
                FitFact.DataSha256 => "data changed",
                _ => "",
            },
        };
        var group = f.Fact switch
        {
            FitFact.Name => "name",
            FitFact.Status => "status",
            FitFact.ProblemClass => "problem class",
            FitFact.SpecSha256 => "spec sha256",
            _ => "data sha256",
        };
        return new DiffRow(group, null, Show(f.Old), Show(f.New), change, "");
    }

    private static DiffRow NumberRow(string group, string? item, NumberChange n, NumberTolerance tolerance)
    {
        var old = n.Kind == ChangeKind.Added ? Absent : Number(n.Old);
        var @new = n.Kind == ChangeKind.Removed ? Absent : Number(n.New);
        var change = "";
        var relative = "";
        switch (n.Kind)
        {
            case ChangeKind.Added:
                change = "added";
                break;
            case ChangeKind.Removed:
                change = "removed";
                break;
            case ChangeKind.Changed when n.Absolute is { } d:
                change = Signed(d);
                relative = n.Relative is { } r ? Percent(r) : "from 0";
                break;
            case ChangeKind.Unchanged when n.Absolute is { } small && small != 0:
                change = Signed(small);
                relative = (n.Relative is { } fraction ? Percent(fraction) + " " : "") + (tolerance.IsExact ? "" : "(within tolerance)");
                break;
        }

        return new DiffRow(group, item, old, @new, change, relative.TrimEnd());
    }

    private static DiffRow RuleRow(RuleChange r)
    {
        var change = r.Kind switch
        {
            ChangeKind.Added => "added",
            ChangeKind.Removed => "removed",
            ChangeKind.Changed => r.New!.Passed ? "now passes" : "now fails",
            _ => "",
        };
        return new DiffRow("rule", r.Rule, Verdict(r.Old), Verdict(r.New), change, "", r.Kind is (ChangeKind.Changed or ChangeKind.Added) && r.New is { Passed: false });
    }

    private static string Verdict(RuleVerdict? v) =>
        v is null ? Absent : (v.Passed ? "PASS" : "FAIL") + (v.Value is { } x ? $" ({Number(x)})" : "");

    private static string Short(string sha) => sha.Length > 12 ? sha[..12] : sha;
}
