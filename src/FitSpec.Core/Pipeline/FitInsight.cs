using FitSpec.Analysis;
using FitSpec.Lowering;
using FitSpec.Results;
using FitSpec.Solving;
using FitSpec.Spec;
using FitSpec.Verification;

namespace FitSpec.Pipeline;

/// <summary>
/// Adds what a reviewer reads beyond the answer itself: plot series, loss guides, leverage, dual sentences,
/// LP ranging and uncertainty. Runs only on a verified solution.
/// </summary>
internal static class FitInsight
{
    public static FitResult Add(FitResult result, LoweredFit fit, Checked check, SolveOptions options, CancellationToken cancellation)
    {
        var spec = fit.Spec;
        var design = fit.Design;
        var isL2 = spec.Loss.Kind == LossKind.L2;
        var unconstrainedL2 = isL2 && fit.ClosedForm is { RidgeRows.Count: 0 } && fit.Constraints.Count == 0;
        var classical = unconstrainedL2 && check.Metrics.ResidualSd is { } sd ? ClassicalErrors.Compute(design, check.Beta, sd) : null;
        var ranging = LpRanging.Compute(fit, check.Objective, cancellation);
        var bootstrap = spec.Report.Uncertainty is { } request ? Bootstrap.Run(fit, check.Beta, request, options, cancellation) : null;
        return result with
        {
            Series = SeriesBuilder.Build(design, spec.Model.Response.Value, check.Beta, check.Residuals),
            Guides = LossShape.Guides(spec, check.Objective),
            LossCurve = LossShape.Curve(spec.Loss, check.Residuals),
            OutsideWidthLines = LossShape.OutsideWidth(spec.Loss, check.Residuals, design.Table.Lines),
            Leverage = isL2 ? LeverageCalculator.Compute(design) : null,
            DualReadings = DualSentences.Read(fit, result.Constraints, ranging),
            Ranging = ranging,
            Uncertainty = classical is null && bootstrap is null ? null : new UncertaintyInfo(classical, bootstrap),
        };
    }
}
