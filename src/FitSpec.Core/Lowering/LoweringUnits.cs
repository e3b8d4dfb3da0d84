using FitSpec.Spec;

namespace FitSpec.Lowering;

/// <summary>Adds one loss kind's variables, rows and objective terms.</summary>
public interface ILossUnit
{
    LossKind Kind { get; }

    void Lower(LoweringContext context, LossSpec loss);
}

/// <summary>Adds one penalty kind's terms over the coefficients it is on.</summary>
public interface IPenaltyUnit
{
    PenaltyKind Kind { get; }

    void Lower(LoweringContext context, PenaltySpec penalty, int index, IReadOnlyList<int> on);
}

/// <summary>Adds the rows of one constraint kind and records them for reporting.</summary>
public interface IConstraintUnit
{
    bool Handles(ConstraintSpec constraint);

    void Lower(LoweringContext context, ConstraintSpec constraint, int index);
}
