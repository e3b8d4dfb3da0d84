using FitSpec.Results;
using FitSpec.Spec;
using FitSpec.Verification;

namespace FitSpec.Analysis;

/// <summary>What a residual plot draws for the fit's loss: its width or limit, bands, and φ(r) itself.</summary>
public static class LossShape
{
    private const int CurvePoints = 201;

    public static IReadOnlyList<ResidualGuide> Guides(FitSpecDocument spec, double objective)
    {
        ArgumentNullException.ThrowIfNull(spec);
        var guides = new List<ResidualGuide>();
        var p = spec.Loss.Parameter;
        switch (spec.Loss.Kind)
        {
            case LossKind.Huber:
                guides.Add(new ResidualGuide("Huber width", p!.Value));
                break;
            case LossKind.Deadzone:
                guides.Add(new ResidualGuide("dead-zone width", p!.Value));
                break;
            case LossKind.LogBarrier:
                guides.Add(new ResidualGuide("barrier limit", p!.Value));
                break;
            case LossKind.TruncatedL2:
                guides.Add(new ResidualGuide("truncation cap", p!.Value));
                break;
            case LossKind.Linf when spec.Data.Weight is null:
                guides.Add(new ResidualGuide("minimax level", objective));
                break;
        }

        foreach (var c in spec.Constraints.OfType<ResidualsConstraint>())
        {
            guides.Add(new ResidualGuide($"band of `{c.Label}`", c.MaxAbs));
        }

        return guides;
    }

    /// <summary>φ(r) over the residuals' range (and the loss's width); null where φ is not per observation.</summary>
    public static LossCurve? Curve(LossSpec loss, IReadOnlyList<double> residuals)
    {
        ArgumentNullException.ThrowIfNull(loss);
        ArgumentNullException.ThrowIfNull(residuals);
        if (loss.Kind is LossKind.Linf or LossKind.None || residuals.Count == 0)
        {
            return null;
        }

        var reach = residuals.Max(Math.Abs);
        if (loss.Parameter is { } width && loss.Kind is LossKind.Huber or LossKind.Deadzone or LossKind.TruncatedL2)
        {
            reach = Math.Max(reach, width);
        }

        reach = reach > 0 && double.IsFinite(reach) ? reach * 1.1 : 1;
        if (loss.Kind == LossKind.LogBarrier)
        {
            // φ is infinite at the limit: stop just short of it.
            reach = 0.995 * loss.Parameter!.Value;
        }

        var r = new double[CurvePoints];
        var phi = new double[CurvePoints];
        for (var k = 0; k < CurvePoints; k++)
        {
            r[k] = -reach + (2 * reach * k / (CurvePoints - 1));
            phi[k] = Objectives.Phi(loss.Kind, loss.Parameter, r[k]);
        }

        return new LossCurve(loss.KindName, r, phi);
    }

    /// <summary>Data-file lines of the observations beyond the loss's width (robust losses with a width).</summary>
    public static IReadOnlyList<int> OutsideWidth(LossSpec loss, IReadOnlyList<double> residuals, IReadOnlyList<int> lines)
    {
        ArgumentNullException.ThrowIfNull(loss);
        ArgumentNullException.ThrowIfNull(residuals);
        ArgumentNullException.ThrowIfNull(lines);
        if (loss.Kind is not (LossKind.Huber or LossKind.Deadzone or LossKind.TruncatedL2) || loss.Parameter is not { } width)
        {
            return [];
        }

        var outside = new List<int>();
        for (var i = 0; i < residuals.Count; i++)
        {
            if (Math.Abs(residuals[i]) > width)
            {
                outside.Add(lines[i]);
            }
        }

        return outside;
    }
}
