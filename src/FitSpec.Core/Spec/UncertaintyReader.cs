using FitSpec.Spec.Schema;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>Reads report.uncertainty: {bootstrap: N, seed: S, level: L}.</summary>
internal static class UncertaintyReader
{
    private const string Field = "report.uncertainty";
    private const double DefaultLevel = 0.95;

    public static UncertaintySpec? Read(YamlFields f, YamlNode node)
    {
        if (f.Mapping(node, Field) is not { } map)
        {
            return null;
        }

        var grammar = SpecGrammar.Uncertainty;
        var e = f.Entries(map, Field, grammar);
        var ok = true;

        int? bootstrap = null;
        var resamples = grammar.RangeOf("bootstrap");
        if (!e.TryGetValue("bootstrap", out var b))
        {
            f.Error(map, $"{Field}.bootstrap", $"{Field} needs 'bootstrap:' (the number of resamples, {resamples.Describe()})");
            ok = false;
        }
        else if (f.Integer(b.Value, $"{Field}.bootstrap") is { } n)
        {
            if (!resamples.Contains(n))
            {
                f.Error(b.Value, $"{Field}.bootstrap", $"{Field}.bootstrap must be {resamples.Describe()} resamples, got {n}");
                ok = false;
            }

            bootstrap = n;
        }

        int? seed = null;
        var seeds = grammar.RangeOf("seed");
        if (!e.TryGetValue("seed", out var s))
        {
            // No default on purpose: a run must be repeatable from the spec alone.
            f.Error(map, $"{Field}.seed", $"{Field} needs 'seed:' (a whole number, {seeds.Describe()}): the resamples are drawn from it, so the same spec always gives the same intervals");
            ok = false;
        }
        else if (f.Integer(s.Value, $"{Field}.seed") is { } si)
        {
            if (!seeds.Contains(si))
            {
                f.Error(s.Value, $"{Field}.seed", $"{Field}.seed must be a whole number, {seeds.Describe()}, got {si}");
                ok = false;
            }

            seed = si;
        }

        var level = DefaultLevel;
        if (e.TryGetValue("level", out var l) && f.Number(l.Value, $"{Field}.level") is { } x)
        {
            var levels = grammar.RangeOf("level");
            if (!levels.Contains(x))
            {
                f.Error(l.Value, $"{Field}.level", $"{Field}.level must be {levels.Describe()} (0.95 gives 95% intervals), got {NumberRange.Num(x)}");
                ok = false;
            }

            level = x;
        }

        return ok && bootstrap is { } count && seed is { } start ? new UncertaintySpec(count, start, level, f.Pos(map)) : null;
    }
}
