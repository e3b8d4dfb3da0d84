using FitSpec.Design;

namespace FitSpec.Lowering;

/// <summary>
/// Collects variables, rows (as sparse entries) and Hessian entries, then packs them into a
/// <see cref="FitProgram"/> in time proportional to the non-zeros.
/// </summary>
public sealed class ProgramBuilder
{
    private readonly List<string> _varNames = [];
    private readonly List<double> _cost = [];
    private readonly List<double> _lower = [];
    private readonly List<double> _upper = [];
    private readonly List<bool> _integer = [];
    private readonly List<Origin> _varOrigin = [];
    private readonly List<string> _rowNames = [];
    private readonly List<double> _rowLower = [];
    private readonly List<double> _rowUpper = [];
    private readonly List<Origin> _rowOrigin = [];
    private readonly List<int> _entryRow = [];
    private readonly List<int> _entryCol = [];
    private readonly List<double> _entryValue = [];
    private readonly Dictionary<(int, int), double> _hessian = [];
    private double _offset;

    public ProgramBuilder(IReadOnlyList<string> coefficientNames)
    {
        ArgumentNullException.ThrowIfNull(coefficientNames);
        CoefficientCount = coefficientNames.Count;
        for (var j = 0; j < coefficientNames.Count; j++)
        {
            AddVar(coefficientNames[j], double.NegativeInfinity, double.PositiveInfinity, 0, new Origin(OriginKind.Coefficient, j));
        }
    }

    public int CoefficientCount { get; }

    /// <summary>Sizes the lists for what is about to be added, so that large fits do not grow them step by step.</summary>
    public void Reserve(int vars, int rows, int entries)
    {
        _varNames.EnsureCapacity(_varNames.Count + vars);
        _cost.EnsureCapacity(_cost.Count + vars);
        _lower.EnsureCapacity(_lower.Count + vars);
        _upper.EnsureCapacity(_upper.Count + vars);
        _integer.EnsureCapacity(_integer.Count + vars);
        _varOrigin.EnsureCapacity(_varOrigin.Count + vars);
        _rowNames.EnsureCapacity(_rowNames.Count + rows);
        _rowLower.EnsureCapacity(_rowLower.Count + rows);
        _rowUpper.EnsureCapacity(_rowUpper.Count + rows);
        _rowOrigin.EnsureCapacity(_rowOrigin.Count + rows);
        _entryRow.EnsureCapacity(_entryRow.Count + entries);
        _entryCol.EnsureCapacity(_entryCol.Count + entries);
        _entryValue.EnsureCapacity(_entryValue.Count + entries);
    }

    public int VarCount => _cost.Count;

    public int RowCount => _rowLower.Count;

    /// <summary>Whether any Hessian entry has been added so far (the program will be a QP, not an LP).</summary>
    public bool HasHessian => _hessian.Count > 0;

    public int AddVar(string name, double lower, double upper, double cost, Origin origin, bool integer = false)
    {
        _varNames.Add(name);
        _lower.Add(lower);
        _upper.Add(upper);
        _cost.Add(cost);
        _integer.Add(integer);
        _varOrigin.Add(origin);
        return _cost.Count - 1;
    }

    public void AddCost(int var, double cost) => _cost[var] += cost;

    public void AddOffset(double value) => _offset += value;

    public double GetLower(int var) => _lower[var];

    public double GetUpper(int var) => _upper[var];

    public void SetBounds(int var, double lower, double upper)
    {
        _lower[var] = lower;
        _upper[var] = upper;
    }

    /// <summary>Adds a row lower ≤ Σ entries ≤ upper and returns its index. Entries may repeat a variable.</summary>
    public int AddRow(string name, double lower, double upper, ReadOnlySpan<Entry> entries, Origin origin)
    {
        var row = _rowLower.Count;
        _rowNames.Add(name);
        _rowLower.Add(lower);
        _rowUpper.Add(upper);
        _rowOrigin.Add(origin);
        foreach (var e in entries)
        {
            if (e.Value != 0)
            {
                _entryRow.Add(row);
                _entryCol.Add(e.Index);
                _entryValue.Add(e.Value);
            }
        }

        return row;
    }

    /// <summary>Adds value to Q[i,j] of the symmetric Hessian (and so to Q[j,i]); objective gains ½x'Qx.</summary>
    public void AddHessian(int i, int j, double value)
    {
        if (value == 0)
        {
            return;
        }

        var key = i >= j ? (i, j) : (j, i);
        _hessian[key] = _hessian.GetValueOrDefault(key) + value;
    }

    public FitProgram Build()
    {
        var nVars = _cost.Count;
        // Counting sort by column gives CSC in O(nnz); duplicates within a column are summed.
        var colCount = new int[nVars + 1];
        foreach (var c in _entryCol)
        {
            colCount[c + 1]++;
        }

        for (var j = 0; j < nVars; j++)
        {
            colCount[j + 1] += colCount[j];
        }

        var next = (int[])colCount.Clone();
        var rowIndex = new int[_entryCol.Count];
        var values = new double[_entryCol.Count];
        for (var k = 0; k < _entryCol.Count; k++)
        {
            var pos = next[_entryCol[k]]++;
            rowIndex[pos] = _entryRow[k];
            values[pos] = _entryValue[k];
        }

        (var colStart, rowIndex, values) = MergeDuplicates(colCount, rowIndex, values, nVars, _rowLower.Count);

        var qCount = new int[nVars + 1];
        foreach (var ((i, j), _) in _hessian)
        {
            qCount[j + 1]++;
        }

        for (var j = 0; j < nVars; j++)
        {
            qCount[j + 1] += qCount[j];
        }

        var qNext = (int[])qCount.Clone();
        var qIndex = new int[_hessian.Count];
        var qValue = new double[_hessian.Count];
        foreach (var ((i, j), v) in _hessian.OrderBy(kv => kv.Key.Item2).ThenBy(kv => kv.Key.Item1))
        {
            var pos = qNext[j]++;
            qIndex[pos] = i;
            qValue[pos] = v;
        }

        return new FitProgram(
            CoefficientCount, [.. _varNames], [.. _cost], [.. _lower], [.. _upper], [.. _integer], [.. _varOrigin],
            [.. _rowNames], [.. _rowLower], [.. _rowUpper], [.. _rowOrigin],
            colStart, rowIndex, values,
            _hessian.Count == 0 ? [] : qCount, qIndex, qValue, _offset);
    }

    private static (int[] Start, int[] Index, double[] Value) MergeDuplicates(int[] start, int[] index, double[] value, int nVars, int nRows)
    {
        var last = new int[nRows];
        Array.Fill(last, -1);
        var newStart = new int[nVars + 1];
        var outIndex = new List<int>(index.Length);
        var outValue = new List<double>(index.Length);
        for (var j = 0; j < nVars; j++)
        {
            var colBegin = outIndex.Count;
            for (var k = start[j]; k < start[j + 1]; k++)
            {
                var r = index[k];
                if (last[r] >= colBegin)
                {
                    outValue[last[r]] += value[k];
                }
                else
                {
                    last[r] = outIndex.Count;
                    outIndex.Add(r);
                    outValue.Add(value[k]);
                }
            }

            newStart[j + 1] = outIndex.Count;
        }

        return (newStart, [.. outIndex], [.. outValue]);
    }
}
