using FitSpec.Design;
using FitSpec.Lowering;

namespace FitSpec.Solving.Sequential;

/// <summary>
/// Programs derived from the lowered one for the steps of a sequential method. Every derived program keeps
/// the lowered program's variables and rows at their indices (so its duals map to the user's constraints)
/// and may append more.
/// </summary>
internal static class Subproblems
{
    /// <summary>A copy of the program with variables and rows appended by <paramref name="add"/>.</summary>
    public static FitProgram Extend(FitProgram program, Action<ProgramBuilder> add)
    {
        var p = program.CoefficientCount;
        var b = new ProgramBuilder(program.VarNames[..p]);
        for (var j = 0; j < program.NumVars; j++)
        {
            if (j < p)
            {
                b.SetBounds(j, program.Lower[j], program.Upper[j]);
                b.AddCost(j, program.Cost[j]);
            }
            else
            {
                b.AddVar(program.VarNames[j], program.Lower[j], program.Upper[j], program.Cost[j], program.VarOrigin[j], program.Integer[j]);
            }
        }

        var rows = new List<Entry>[program.NumRows];
        for (var r = 0; r < rows.Length; r++)
        {
            rows[r] = [];
        }

        for (var j = 0; j < program.NumVars; j++)
        {
            for (var k = program.ColStart[j]; k < program.ColStart[j + 1]; k++)
            {
                rows[program.RowIndex[k]].Add(new Entry(j, program.Values[k]));
            }
        }

        for (var r = 0; r < rows.Length; r++)
        {
            b.AddRow(program.RowNames[r], program.RowLower[r], program.RowUpper[r], rows[r].ToArray(), program.RowOrigin[r]);
        }

        for (var j = 0; j < program.QStart.Length - 1; j++)
        {
            for (var k = program.QStart[j]; k < program.QStart[j + 1]; k++)
            {
                b.AddHessian(program.QIndex[k], j, program.QValue[k]);
            }
        }

        b.AddOffset(program.Offset);
        add(b);
        return b.Build();
    }

    /// <summary>The same feasible set with a zero objective (for a feasibility problem of one's own).</summary>
    public static FitProgram WithoutObjective(FitProgram program) => program with
    {
        Cost = new double[program.NumVars],
        QStart = [],
        QIndex = [],
        QValue = [],
        Offset = 0,
    };

    /// <summary>
    /// The program plus Σ_i q_i(f_i), f_i = x_i'θ the fitted value of row i and q_i(f) = A_i f² + B_i f + C_i:
    /// a Gram-form Hessian 2 Σ A_i x_i x_i' over the p coefficients θ, linear cost Σ B_i x_i, offset Σ C_i.
    /// Writing each observation's model in the fitted value (not in θ − θ_k) keeps the program's own
    /// constraints on θ as they are.
    /// </summary>
    public static FitProgram WithQuadratic(FitProgram program, Design.Design design, double[] a, double[] b, double[] c)
    {
        var p = design.P;
        var n = design.Rows;
        var cost = (double[])program.Cost.Clone();
        var offset = program.Offset;
        for (var i = 0; i < n; i++)
        {
            offset += c[i];
        }

        var hessian = new double[p, p];
        for (var u = 0; u < p; u++)
        {
            var xu = design.X[u];
            double g = 0;
            for (var i = 0; i < n; i++)
            {
                g += b[i] * xu[i];
            }

            cost[u] += g;
            for (var v = u; v < p; v++)
            {
                var xv = design.X[v];
                double h = 0;
                for (var i = 0; i < n; i++)
                {
                    h += a[i] * xu[i] * xv[i];
                }

                hessian[v, u] = 2 * h;
            }
        }

        var (qStart, qIndex, qValue) = MergeHessian(program, hessian, p);
        return program with { Cost = cost, QStart = qStart, QIndex = qIndex, QValue = qValue, Offset = offset };
    }

    // Lower triangle, column-wise, of the program's Q plus a dense block on the first p variables.
    private static (int[] Start, int[] Index, double[] Value) MergeHessian(FitProgram program, double[,] block, int p)
    {
        var nVars = program.NumVars;
        var start = new int[nVars + 1];
        var index = new List<int>();
        var value = new List<double>();
        var column = new SortedDictionary<int, double>();
        for (var j = 0; j < nVars; j++)
        {
            column.Clear();
            if (program.HasQuadratic)
            {
                for (var k = program.QStart[j]; k < program.QStart[j + 1]; k++)
                {
                    column[program.QIndex[k]] = column.GetValueOrDefault(program.QIndex[k]) + program.QValue[k];
                }
            }

            if (j < p)
            {
                for (var i = j; i < p; i++)
                {
                    column[i] = column.GetValueOrDefault(i) + block[i, j];
                }
            }

            foreach (var (i, v) in column)
            {
                if (v != 0)
                {
                    index.Add(i);
                    value.Add(v);
                }
            }

            start[j + 1] = index.Count;
        }

        return index.Count == 0 ? ([], [], []) : (start, [.. index], [.. value]);
    }
}
