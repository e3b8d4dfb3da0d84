namespace FitSpec.Lowering;

/// <summary>Where a variable or row of a <see cref="FitProgram"/> came from.</summary>
public enum OriginKind
{
    Coefficient,
    Loss,
    Penalty,
    Constraint,
}

/// <summary>A spec item that rows and variables point back to (Index is the item's position in its list).</summary>
public readonly record struct Origin(OriginKind Kind, int Index);

public enum ProblemClass
{
    ClosedForm,
    LP,
    QP,
    MILP,
    QPSequence,
    Local,
}

/// <summary>
/// The one intermediate representation: minimise Offset + Cost'x + ½ x'Qx subject to RowLower ≤ A x ≤ RowUpper
/// and Lower ≤ x ≤ Upper, some x integer. A is compressed sparse column; Q is the lower triangle, column-wise.
/// The first CoefficientCount variables are the internal coefficients θ of the design.
/// </summary>
public sealed record FitProgram(
    int CoefficientCount,
    string[] VarNames,
    double[] Cost,
    double[] Lower,
    double[] Upper,
    bool[] Integer,
    Origin[] VarOrigin,
    string[] RowNames,
    double[] RowLower,
    double[] RowUpper,
    Origin[] RowOrigin,
    int[] ColStart,
    int[] RowIndex,
    double[] Values,
    int[] QStart,
    int[] QIndex,
    double[] QValue,
    double Offset)
{
    public int NumVars => Cost.Length;

    public int NumRows => RowLower.Length;

    public int NonZeros => Values.Length;

    public bool HasQuadratic => QValue.Length > 0;

    public bool HasIntegers => Integer.Any(b => b);

    public ProblemClass Class => HasIntegers ? ProblemClass.MILP : HasQuadratic ? ProblemClass.QP : ProblemClass.LP;

    /// <summary>Objective at x: Offset + c'x + ½ x'Qx (Q stored as its lower triangle).</summary>
    public double Objective(ReadOnlySpan<double> x)
    {
        var value = Offset;
        for (var j = 0; j < Cost.Length; j++)
        {
            value += Cost[j] * x[j];
        }

        return value + 0.5 * QuadraticForm(x);
    }

    /// <summary>x'Qx for the symmetric Q whose lower triangle is stored.</summary>
    public double QuadraticForm(ReadOnlySpan<double> x)
    {
        double s = 0;
        for (var j = 0; j < QStart.Length - 1; j++)
        {
            for (var k = QStart[j]; k < QStart[j + 1]; k++)
            {
                var i = QIndex[k];
                var term = QValue[k] * x[i] * x[j];
                s += i == j ? term : 2 * term;
            }
        }

        return s;
    }

    /// <summary>Q x for the symmetric Q.</summary>
    public double[] HessianTimes(ReadOnlySpan<double> x)
    {
        var result = new double[NumVars];
        for (var j = 0; j < QStart.Length - 1; j++)
        {
            for (var k = QStart[j]; k < QStart[j + 1]; k++)
            {
                var i = QIndex[k];
                result[i] += QValue[k] * x[j];
                if (i != j)
                {
                    result[j] += QValue[k] * x[i];
                }
            }
        }

        return result;
    }

    /// <summary>Row activities A x.</summary>
    public double[] RowActivity(ReadOnlySpan<double> x)
    {
        var ax = new double[NumRows];
        for (var j = 0; j < NumVars; j++)
        {
            var xj = x[j];
            if (xj == 0)
            {
                continue;
            }

            for (var k = ColStart[j]; k < ColStart[j + 1]; k++)
            {
                ax[RowIndex[k]] += Values[k] * xj;
            }
        }

        return ax;
    }
}
