using FitSpec.Review;

namespace FitSpec.Tests.Review;

/// <summary>The comparison's rules on hand-made summaries (behaviour, invented numbers).</summary>
public sealed class ComparisonRuleTests
{
    [Fact]
    public void Zero_old_values_have_no_relative_change_and_appearing_values_are_added()
    {
        var old = Summary("f", [new("a", 0), new("b", 1), new("gone", 3), new("blank", null)]);
        var now = Summary("f", [new("a", 0.5), new("b", 1), new("blank", null), new("extra", 4)]);
        var fit = ResultComparer.CompareFit(old, now, NumberTolerance.Exact);
        var byName = fit.Coefficients.ToDictionary(c => c.Name);
        Assert.Equal(["a", "b", "gone", "blank", "extra"], fit.Coefficients.Select(c => c.Name));
        Assert.Equal(ChangeKind.Changed, byName["a"].Kind);
        Assert.Equal(0.5, byName["a"].Absolute);
        Assert.Null(byName["a"].Relative);
        Assert.Equal(ChangeKind.Unchanged, byName["b"].Kind);
        Assert.Equal(ChangeKind.Removed, byName["gone"].Kind);
        Assert.Null(byName["gone"].Absolute);
        Assert.Equal(ChangeKind.Unchanged, byName["blank"].Kind);
        Assert.Equal(ChangeKind.Added, byName["extra"].Kind);
        Assert.Equal(4, byName["extra"].New);
        Assert.Equal(ChangeKind.Changed, fit.Kind);
    }

    [Fact]
    public void A_value_that_becomes_null_is_a_change_and_the_smallest_step_counts_exactly()
    {
        var step = Math.BitIncrement(2.0);
        var fit = ResultComparer.CompareFit(Summary("f", [new("a", 1), new("b", 2)]), Summary("f", [new("a", null), new("b", step)]), NumberTolerance.Exact);
        Assert.Equal(ChangeKind.Changed, fit.Coefficients[0].Kind);
        Assert.Null(fit.Coefficients[0].Absolute);
        Assert.Equal(ChangeKind.Changed, fit.Coefficients[1].Kind);
        Assert.Equal(step - 2.0, fit.Coefficients[1].Absolute);
    }

    [Fact]
    public void Rules_are_matched_by_text_and_occurrence_with_new_and_removed_ones()
    {
        var old = Summary("f", [], [new("r2 >= 0.9", 0.95, true), new("b1 >= 0", 1, true), new("b1 >= 0", 1, true), new("rmse < 1", 0.5, true)]);
        var now = Summary("f", [], [new("b1 >= 0", 1, true), new("b1 >= 0", -1, false), new("r2 >= 0.9", 0.85, false), new("mae < 1", 0.2, true)]);
        var rules = ResultComparer.CompareFit(old, now, NumberTolerance.Exact).Acceptance;
        Assert.Equal(
            [("r2 >= 0.9", ChangeKind.Changed), ("b1 >= 0", ChangeKind.Unchanged), ("b1 >= 0", ChangeKind.Changed), ("rmse < 1", ChangeKind.Removed), ("mae < 1", ChangeKind.Added)],
            rules.Select(r => (r.Rule, r.Kind)));
    }

    [Fact]
    public void Two_single_results_with_different_names_are_compared_and_the_rename_reported()
    {
        var fit = Assert.Single(ResultComparer.Compare(Summary("before", []), Summary("after", []), NumberTolerance.Exact).Fits);
        Assert.Equal(ChangeKind.Changed, fit.Kind);
        var rename = Assert.Single(fit.Facts, f => f.Fact == FitFact.Name);
        Assert.Equal(("before", "after"), (rename.Old, rename.New));
    }

    [Fact]
    public void A_negative_or_non_finite_tolerance_is_refused()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => new NumberTolerance(-1e-9));
        Assert.Throws<ArgumentOutOfRangeException>(() => new NumberTolerance(double.NaN));
        Assert.True(new NumberTolerance(0.1).Same(0.05, 0.14));
        Assert.False(new NumberTolerance(0.1).Same(0.05, 0.16));
        Assert.True(new NumberTolerance(0.1).Same(100, 109));
        Assert.False(new NumberTolerance(0.1).Same(100, 111));
    }

    internal static ResultSummary Summary(string name, NamedNumber[] coefficients, RuleVerdict[]? rules = null) =>
        new($"{name}.result.json", name, "optimal", "QP", 1, coefficients, [], rules ?? [], "spec", "data");
}
