using FitSpec.Lowering;

namespace FitSpec.Solving.Screening;

/// <summary>
/// Where a check-loss program keeps each observation: its residual row x_i'θ + u_i − v_i = y_i and the split
/// variables u_i (coefficient +1) and v_i (−1). Read from the program itself, so it holds for any lowering
/// that writes one such row per observation in order.
/// </summary>
internal sealed record CheckLossLayout(int[] Row, int[] Above, int[] Below, int[] OtherVars, int[] OtherRows)
{
    public static CheckLossLayout? Find(FitProgram program, int observations)
    {
        var lossRows = new List<int>();
        var otherRows = new List<int>();
        for (var r = 0; r < program.NumRows; r++)
        {
            (program.RowOrigin[r].Kind == OriginKind.Loss ? lossRows : otherRows).Add(r);
        }

        if (lossRows.Count != observations)
        {
            return null;
        }

        var observationOfRow = new int[program.NumRows];
        Array.Fill(observationOfRow, -1);
        for (var i = 0; i < lossRows.Count; i++)
        {
            observationOfRow[lossRows[i]] = i;
        }

        var above = new int[observations];
        var below = new int[observations];
        Array.Fill(above, -1);
        Array.Fill(below, -1);
        var otherVars = new List<int>();
        for (var j = 0; j < program.NumVars; j++)
        {
            if (program.VarOrigin[j].Kind != OriginKind.Loss)
            {
                otherVars.Add(j);
                continue;
            }

            // A split variable sits in exactly one residual row, with coefficient ±1.
            if (program.ColStart[j + 1] - program.ColStart[j] != 1)
            {
                return null;
            }

            var k = program.ColStart[j];
            var i = observationOfRow[program.RowIndex[k]];
            if (i < 0)
            {
                return null;
            }

            switch (program.Values[k])
            {
                case 1.0 when above[i] < 0:
                    above[i] = j;
                    break;
                case -1.0 when below[i] < 0:
                    below[i] = j;
                    break;
                default:
                    return null;
            }
        }

        if (above.Any(j => j < 0) || below.Any(j => j < 0))
        {
            return null;
        }

        return new CheckLossLayout([.. lossRows], above, below, [.. otherVars], [.. otherRows]);
    }
}
