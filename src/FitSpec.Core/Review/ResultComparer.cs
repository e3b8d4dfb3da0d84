namespace FitSpec.Review;

/// <summary>Compares results: pure functions of the summaries and the tolerance, no files read.</summary>
public static class ResultComparer
{
    /// <summary>Two folders' results, fit by fit (matched by name).</summary>
    public static ResultDiff Compare(ResultSet old, ResultSet @new, NumberTolerance tolerance)
    {
        ArgumentNullException.ThrowIfNull(old);
        ArgumentNullException.ThrowIfNull(@new);
        var names = old.Fits.Keys.Union(@new.Fits.Keys).Order(StringComparer.Ordinal);
        var fits = names.Select(n => CompareFit(old.Fits.GetValueOrDefault(n), @new.Fits.GetValueOrDefault(n), tolerance)).ToList();
        return new ResultDiff(old.Source, @new.Source, tolerance, fits);
    }

    /// <summary>Two single results, compared whatever their names (a rename is reported as a difference).</summary>
    public static ResultDiff Compare(ResultSummary old, ResultSummary @new, NumberTolerance tolerance)
    {
        ArgumentNullException.ThrowIfNull(old);
        ArgumentNullException.ThrowIfNull(@new);
        return new ResultDiff(old.File, @new.File, tolerance, [CompareFit(old, @new, tolerance)]);
    }

    /// <summary>One fit; a null side means the fit is only in the other set.</summary>
    public static FitChange CompareFit(ResultSummary? old, ResultSummary? @new, NumberTolerance tolerance)
    {
        if (old is null && @new is null)
        {
            throw new ArgumentException("at least one side of a comparison must be present");
        }

        var facts = new List<FactChange>();
        if (old is not null && @new is not null && old.Name != @new.Name)
        {
            facts.Add(new FactChange(FitFact.Name, ChangeKind.Changed, old.Name, @new.Name));
        }

        facts.Add(Fact(FitFact.Status, old, @new, s => s.Status));
        facts.Add(Fact(FitFact.ProblemClass, old, @new, s => s.ProblemClass));
        facts.Add(Fact(FitFact.SpecSha256, old, @new, s => s.SpecSha256));
        facts.Add(Fact(FitFact.DataSha256, old, @new, s => s.DataSha256));

        var objective = new NumberChange(
            "objective",
            Kind(old is not null, @new is not null, () => tolerance.Same(old!.Objective, @new!.Objective)),
            old?.Objective,
            @new?.Objective);
        var coefficients = Numbers(old?.Coefficients ?? [], @new?.Coefficients ?? [], tolerance);
        var metrics = Numbers(old?.Metrics ?? [], @new?.Metrics ?? [], tolerance);
        var rules = Rules(old?.Acceptance ?? [], @new?.Acceptance ?? []);

        var kind = old is null ? ChangeKind.Added
            : @new is null ? ChangeKind.Removed
            : facts.Any(f => f.Kind != ChangeKind.Unchanged) || objective.Kind != ChangeKind.Unchanged
              || coefficients.Any(c => c.Kind != ChangeKind.Unchanged) || metrics.Any(m => m.Kind != ChangeKind.Unchanged)
              || rules.Any(r => r.Kind != ChangeKind.Unchanged)
                ? ChangeKind.Changed
                : ChangeKind.Unchanged;
        return new FitChange((@new ?? old)!.Name, kind, old, @new, facts, objective, coefficients, metrics, rules);
    }

    private static FactChange Fact(FitFact fact, ResultSummary? old, ResultSummary? @new, Func<ResultSummary, string?> value)
    {
        var o = old is null ? null : value(old);
        var n = @new is null ? null : value(@new);
        return new FactChange(fact, Kind(old is not null, @new is not null, () => o == n), o, n);
    }

    // Old order first, then the names only the new side has, in its order.
    private static List<NumberChange> Numbers(IReadOnlyList<NamedNumber> old, IReadOnlyList<NamedNumber> @new, NumberTolerance tolerance)
    {
        var oldByName = FirstByName(old);
        var newByName = FirstByName(@new);
        var names = old.Select(x => x.Name).Concat(@new.Select(x => x.Name)).Distinct(StringComparer.Ordinal);
        return names.Select(name =>
        {
            var inOld = oldByName.TryGetValue(name, out var o);
            var inNew = newByName.TryGetValue(name, out var n);
            return new NumberChange(name, Kind(inOld, inNew, () => tolerance.Same(o, n)), o, n);
        }).ToList();
    }

    private static Dictionary<string, double?> FirstByName(IReadOnlyList<NamedNumber> values)
    {
        var byName = new Dictionary<string, double?>(StringComparer.Ordinal);
        foreach (var v in values)
        {
            byName.TryAdd(v.Name, v.Value);
        }

        return byName;
    }

    // A rule text may be listed twice; the k-th occurrence on one side is matched with the k-th on the other.
    private static List<RuleChange> Rules(IReadOnlyList<RuleVerdict> old, IReadOnlyList<RuleVerdict> @new)
    {
        var oldKeyed = Keyed(old);
        var newKeyed = Keyed(@new);
        var newByKey = newKeyed.ToDictionary(k => k.Key, k => k.Verdict);
        var oldKeys = oldKeyed.Select(k => k.Key).ToHashSet();
        var changes = new List<RuleChange>();
        foreach (var (key, verdict) in oldKeyed)
        {
            changes.Add(newByKey.TryGetValue(key, out var now)
                ? new RuleChange(verdict.Rule, now.Passed == verdict.Passed ? ChangeKind.Unchanged : ChangeKind.Changed, verdict, now)
                : new RuleChange(verdict.Rule, ChangeKind.Removed, verdict, null));
        }

        changes.AddRange(newKeyed.Where(k => !oldKeys.Contains(k.Key)).Select(k => new RuleChange(k.Verdict.Rule, ChangeKind.Added, null, k.Verdict)));
        return changes;
    }

    private static List<(RuleKey Key, RuleVerdict Verdict)> Keyed(IReadOnlyList<RuleVerdict> rules)
    {
        var seen = new Dictionary<string, int>(StringComparer.Ordinal);
        return rules.Select(r =>
        {
            var occurrence = seen[r.Rule] = seen.GetValueOrDefault(r.Rule) + 1;
            return (new RuleKey(r.Rule, occurrence), r);
        }).ToList();
    }

    private static ChangeKind Kind(bool inOld, bool inNew, Func<bool> same) =>
        (inOld, inNew) switch
        {
            (true, true) => same() ? ChangeKind.Unchanged : ChangeKind.Changed,
            (false, true) => ChangeKind.Added,
            (true, false) => ChangeKind.Removed,
            _ => ChangeKind.Unchanged,
        };

    private readonly record struct RuleKey(string Rule, int Occurrence);
}
