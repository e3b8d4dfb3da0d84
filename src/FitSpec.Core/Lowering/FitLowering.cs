using FitSpec.Diagnostics;
using FitSpec.Spec;

namespace FitSpec.Lowering;

/// <summary>
/// Stage 4: design + spec → <see cref="LoweredFit"/>. Each loss, penalty and constraint kind is one unit class
/// (ILossUnit, IPenaltyUnit, IConstraintUnit) found in this assembly; adding a kind means adding a unit.
/// </summary>
public static class FitLowering
{
    private static readonly ILossUnit[] LossUnits = Units<ILossUnit>();
    private static readonly IPenaltyUnit[] PenaltyUnits = Units<IPenaltyUnit>();
    private static readonly IConstraintUnit[] ConstraintUnits = Units<IConstraintUnit>();

    private static T[] Units<T>() => typeof(FitLowering).Assembly.GetTypes()
        .Where(t => typeof(T).IsAssignableFrom(t) && t is { IsAbstract: false, IsInterface: false })
        .OrderBy(t => t.FullName, StringComparer.Ordinal)
        .Select(t => (T)Activator.CreateInstance(t)!)
        .ToArray();

    /// <param name="forceProgram">Build the full program even where the closed form will solve it (for export).</param>
    public static LoweredFit Lower(FitSpecDocument spec, Design.Design design, bool forceProgram = false)
    {
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(design);
        var context = new LoweringContext(spec, design);
        var closedForm = spec.Loss.Kind == LossKind.L2
            && spec.Constraints.Count == 0
            && spec.Penalties.All(p => p.Kind == PenaltyKind.L2 || (p.Kind == PenaltyKind.Smoothness && !p.NormL1))
            && spec.Solve.Method is SolveMethod.Auto or SolveMethod.Qr;
        if (spec.Solve.Method == SolveMethod.Qr && !closedForm)
        {
            context.Error(spec.Loss.Pos, "solve.method", "solve.method 'qr' solves only an l2 loss with no constraints and only l2 or (squared) smoothness penalties; use auto, simplex or ipm");
        }

        context.BuildGramHessian = !closedForm || forceProgram;

        var penaltyTargets = new List<IReadOnlyList<int>>();
        CheckUnsupported(context, spec);
        if (context.Errors.Count == 0)
        {
            LossUnits.First(u => u.Kind == spec.Loss.Kind).Lower(context, spec.Loss);
            for (var k = 0; k < spec.Penalties.Count; k++)
            {
                var p = spec.Penalties[k];
                var on = context.Resolve(p.On, p.Pos, "penalties.on");
                penaltyTargets.Add(on);
                PenaltyUnits.First(u => u.Kind == p.Kind).Lower(context, p, k, on);
            }

            if (context.Errors.Count == 0)
            {
                context.Errors.AddRange(Design.RankCheck.Diagnose(spec, design, penaltyTargets));
            }

            for (var k = 0; k < spec.Constraints.Count; k++)
            {
                var c = spec.Constraints[k];
                ConstraintUnits.First(u => u.Handles(c)).Lower(context, c, k);
            }
        }

        if (context.Errors.Count > 0)
        {
            throw new FitSpecException(context.Errors);
        }

        var program = context.Builder.Build();
        var problemClass = closedForm ? ProblemClass.ClosedForm : context.Strategy?.Class ?? program.Class;
        return new LoweredFit(
            spec, design, program, problemClass, context.Constraints, context.Notes,
            closedForm ? new LeastSquaresForm(context.RidgeRows, context.RidgeRaw) : null,
            penaltyTargets,
            context.Strategy,
            context.PreferredForm);
    }

    private static void CheckUnsupported(LoweringContext context, FitSpecDocument spec)
    {
        if (!LossUnits.Any(u => u.Kind == spec.Loss.Kind))
        {
            context.Error(spec.Loss.Pos, "loss.kind", $"loss kind '{spec.Loss.KindName}' is not supported yet");
        }

        foreach (var p in spec.Penalties)
        {
            if (!PenaltyUnits.Any(u => u.Kind == p.Kind))
            {
                context.Error(p.Pos, "penalties.kind", $"penalty kind '{p.KindName}' is not supported yet");
            }
        }

        foreach (var c in spec.Constraints)
        {
            if (!ConstraintUnits.Any(u => u.Handles(c)))
            {
                var kind = c is ShapeConstraint s ? s.Shape.ToString().ToLowerInvariant() : c.GetType().Name;
                context.Error(c.Pos, "constraints.kind", $"constraint kind '{kind}' is not supported yet");
            }
        }
    }
}
