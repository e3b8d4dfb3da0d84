using FitSpec.Review;

namespace FitSpec.Tests.Review;

/// <summary>Comparing two folders of real results (the scenario's change).</summary>
public sealed class ResultComparerTests(ReviewScenario scenario) : IClassFixture<ReviewScenario>
{
    private readonly ReviewScenario _scenario = scenario;

    private ResultDiff Diff(NumberTolerance tolerance = default) =>
        ResultComparer.Compare(ResultFolder.Read(_scenario.Workspace.OldResults), ResultFolder.Read(_scenario.Workspace.NewResults), tolerance);

    [Fact]
    public void The_diff_names_exactly_the_changed_added_and_removed_fits()
    {
        var diff = Diff();
        Assert.True(diff.HasDifferences);
        Assert.Equal(["bounded", "fresh", "gauge", "retired", "steady"], diff.Fits.Select(f => f.Name));
        var kinds = diff.Fits.ToDictionary(f => f.Name, f => f.Kind);
        Assert.Equal(ChangeKind.Changed, kinds["bounded"]);
        Assert.Equal(ChangeKind.Changed, kinds["gauge"]);
        Assert.Equal(ChangeKind.Unchanged, kinds["steady"]);
        Assert.Equal(ChangeKind.Added, kinds["fresh"]);
        Assert.Equal(ChangeKind.Removed, kinds["retired"]);
        Assert.Equal(2, diff.Count(ChangeKind.Changed));
    }

    [Fact]
    public void Coefficient_and_objective_deltas_are_the_differences_of_the_two_results()
    {
        var bounded = Diff().Fits.Single(f => f.Name == "bounded");
        var old = _scenario.Old["bounded"];
        var now = _scenario.New["bounded"];
        Assert.Equal(old.Coefficients.Select(c => c.Name), bounded.Coefficients.Select(c => c.Name));
        foreach (var change in bounded.Coefficients)
        {
            var o = old.Coefficients.Single(c => c.Name == change.Name).Value;
            var n = now.Coefficients.Single(c => c.Name == change.Name).Value;
            Assert.Equal(o, change.Old);
            Assert.Equal(n, change.New);
            Assert.Equal(n - o, change.Absolute);
            Assert.Equal((n - o) / Math.Abs(o), change.Relative);
            Assert.Equal(o == n ? ChangeKind.Unchanged : ChangeKind.Changed, change.Kind);
        }

        // The constraint binds: b1 is held at its bound, so it must have moved.
        var b1 = bounded.Coefficients.Single(c => c.Name == "b1");
        Assert.Equal(ChangeKind.Changed, b1.Kind);
        Assert.Equal(1.9, b1.New!.Value, 6);
        Assert.Equal(now.Objective!.Value - old.Objective!.Value, bounded.Objective.Absolute);
        Assert.Equal(ChangeKind.Changed, bounded.Objective.Kind);
        var rmse = bounded.Metrics.Single(m => m.Name == "rmse");
        Assert.Equal(now.Metrics!.Rmse - old.Metrics!.Rmse, rmse.Absolute);
    }

    [Fact]
    public void A_moved_data_point_flips_the_rule_and_changes_only_the_data_hash()
    {
        var diff = Diff();
        var gauge = diff.Fits.Single(f => f.Name == "gauge");
        var rule = Assert.Single(gauge.Acceptance);
        Assert.Equal(ReviewScenario.GaugeRule, rule.Rule);
        Assert.Equal(ChangeKind.Changed, rule.Kind);
        Assert.True(rule.Old!.Passed);
        Assert.False(rule.New!.Passed);
        Assert.Equal(_scenario.Old["gauge"].Acceptance[0].Value, rule.Old.Value);
        Assert.Equal(_scenario.New["gauge"].Acceptance[0].Value, rule.New.Value);
        Assert.Equal(ChangeKind.Changed, Fact(gauge, FitFact.DataSha256).Kind);
        Assert.Equal(ChangeKind.Unchanged, Fact(gauge, FitFact.SpecSha256).Kind);
        Assert.Equal(_scenario.New["gauge"].Provenance.DataSha256, Fact(gauge, FitFact.DataSha256).New);

        var bounded = diff.Fits.Single(f => f.Name == "bounded");
        Assert.Equal(ChangeKind.Changed, Fact(bounded, FitFact.SpecSha256).Kind);
        Assert.Equal(ChangeKind.Unchanged, Fact(bounded, FitFact.DataSha256).Kind);
        Assert.Equal(ChangeKind.Unchanged, Fact(bounded, FitFact.Status).Kind);
        Assert.All(diff.Fits.Single(f => f.Name == "steady").Facts, f => Assert.Equal(ChangeKind.Unchanged, f.Kind));
    }

    [Fact]
    public void A_tolerance_above_a_change_hides_it_and_one_below_keeps_it()
    {
        var b1 = Diff().Fits.Single(f => f.Name == "bounded").Coefficients.Single(c => c.Name == "b1");
        // b1 is near 2, so max(1, |old|) = |old| and the tolerance acts relative to it.
        Assert.True(Math.Abs(b1.Old!.Value) > 1);
        var relative = Math.Abs(b1.Relative!.Value);

        var loose = Diff(new NumberTolerance(relative * 2)).Fits.Single(f => f.Name == "bounded");
        Assert.Equal(ChangeKind.Unchanged, loose.Coefficients.Single(c => c.Name == "b1").Kind);
        // The spec was still edited: the fit stays changed.
        Assert.Equal(ChangeKind.Changed, loose.Kind);

        var tight = Diff(new NumberTolerance(relative / 2)).Fits.Single(f => f.Name == "bounded");
        Assert.Equal(ChangeKind.Changed, tight.Coefficients.Single(c => c.Name == "b1").Kind);
    }

    [Fact]
    public void A_folder_compared_with_itself_has_no_differences()
    {
        var old = ResultFolder.Read(_scenario.Workspace.OldResults);
        var diff = ResultComparer.Compare(old, ResultFolder.Read(_scenario.Workspace.OldResults), NumberTolerance.Exact);
        Assert.False(diff.HasDifferences);
        Assert.Equal(old.Fits.Count, diff.Count(ChangeKind.Unchanged));
    }

    private static FactChange Fact(FitChange fit, FitFact fact) => fit.Facts.Single(f => f.Fact == fact);
}
