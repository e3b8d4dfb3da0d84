using System.Runtime.InteropServices;

namespace Highs.Native;

/// <summary>Owns one HiGHS instance; frees it when the handle is released.</summary>
internal sealed class HighsHandle : SafeHandle
{
    public HighsHandle()
        : base(IntPtr.Zero, ownsHandle: true)
    {
        SetHandle(NativeMethods.Highs_create());
        if (handle == IntPtr.Zero)
        {
            throw new InvalidOperationException("Highs_create returned null.");
        }
    }

    public override bool IsInvalid => handle == IntPtr.Zero;

    protected override bool ReleaseHandle()
    {
        NativeMethods.Highs_destroy(handle);
        return true;
    }
}

/// <summary>
/// A thin, fit-agnostic session over one HiGHS instance: pass a model, set options, run, read results.
/// Not thread-safe; use one per solve.
/// </summary>
public sealed class HighsSolver : IDisposable
{
    private const int StatusError = -1;
    private readonly HighsHandle _handle = new();
    private HighsModel? _model;

    public HighsSolver()
    {
        var size = NativeMethods.Highs_getSizeofHighsInt(_handle.DangerousGetHandle());
        if (size != sizeof(int))
        {
            throw new InvalidOperationException($"libhighs uses a {size}-byte HighsInt; this binding expects 4.");
        }
    }

    /// <summary>The library's version string, e.g. "1.12.0".</summary>
    public static string Version => Marshal.PtrToStringUTF8(NativeMethods.Highs_version()) ?? "unknown";

    private IntPtr H => _handle.DangerousGetHandle();

    public void SetOption(string name, bool value) => Check(NativeMethods.Highs_setBoolOptionValue(H, name, value ? 1 : 0), name);

    public void SetOption(string name, int value) => Check(NativeMethods.Highs_setIntOptionValue(H, name, value), name);

    public void SetOption(string name, double value) => Check(NativeMethods.Highs_setDoubleOptionValue(H, name, value), name);

    public void SetOption(string name, string value) => Check(NativeMethods.Highs_setStringOptionValue(H, name, value), name);

    public unsafe void PassModel(HighsModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        Validate(model);
        var inf = NativeMethods.Highs_getInfinity(H);
        var colLower = Clamp(model.ColLower, inf);
        var colUpper = Clamp(model.ColUpper, inf);
        var rowLower = Clamp(model.RowLower, inf);
        var rowUpper = Clamp(model.RowUpper, inf);
        int[]? integrality = model.Integer?.Select(b => b ? 1 : 0).ToArray();
        int qNz = model.QValue?.Length ?? 0;
        // Empty arrays still need a non-null pointer for HiGHS; pad with one element.
        var aIndex = model.AIndex.Length == 0 ? [0] : model.AIndex;
        var aValue = model.AValue.Length == 0 ? [0.0] : model.AValue;
        var rl = rowLower.Length == 0 ? [0.0] : rowLower;
        var ru = rowUpper.Length == 0 ? [0.0] : rowUpper;
        fixed (double* cost = model.ColCost, cl = colLower, cu = colUpper, rlp = rl, rup = ru, av = aValue)
        fixed (int* ast = model.AStart, ai = aIndex)
        fixed (int* qs = model.QStart, qi = model.QIndex)
        fixed (double* qv = model.QValue)
        fixed (int* integ = integrality)
        {
            var status = NativeMethods.Highs_passModel(
                H, model.NumCol, model.NumRow, model.AValue.Length, qNz,
                aFormat: 1, qFormat: 1, sense: 1, model.Offset,
                cost, cl, cu, rlp, rup, ast, ai, av,
                qNz > 0 ? qs : null, qNz > 0 ? qi : null, qNz > 0 ? qv : null, integ);
            Check(status, "Highs_passModel");
        }

        _model = model;
    }

    /// <summary>
    /// Solves the passed model. With a monitor, HiGHS calls back during the run: the monitor may stop it (model
    /// status Interrupt, with whatever point HiGHS had) and reports the run's progress.
    /// </summary>
    public HighsResult Run(HighsRunMonitor? monitor = null)
    {
        var model = _model ?? throw new InvalidOperationException("PassModel first.");
        var runStatus = monitor is null ? NativeMethods.Highs_run(H) : RunWatched(monitor);
        var modelStatus = (HighsModelStatus)NativeMethods.Highs_getModelStatus(H);
        var colValue = new double[model.NumCol];
        var colDual = new double[model.NumCol];
        var rowValue = new double[model.NumRow];
        var rowDual = new double[model.NumRow];
        unsafe
        {
            fixed (double* cv = colValue, cd = colDual, rv = rowValue, rd = rowDual)
            {
                NativeMethods.Highs_getSolution(H, cv, cd, rv, rd);
            }
        }

        NativeMethods.Highs_getIntInfoValue(H, "primal_solution_status", out var primalStatus);
        NativeMethods.Highs_getIntInfoValue(H, "dual_solution_status", out var dualStatus);
        NativeMethods.Highs_getIntInfoValue(H, "simplex_iteration_count", out var simplex);
        NativeMethods.Highs_getIntInfoValue(H, "ipm_iteration_count", out var ipm);
        NativeMethods.Highs_getIntInfoValue(H, "qp_iteration_count", out var qp);
        NativeMethods.Highs_getDoubleInfoValue(H, "mip_gap", out var mipGap);
        // HiGHS solution status 2 means "feasible".
        return new HighsResult(
            runStatus, modelStatus, NativeMethods.Highs_getObjectiveValue(H),
            colValue, colDual, rowValue, rowDual, NativeMethods.Highs_getRunTime(H),
            simplex, ipm, qp, mipGap, primalStatus == 2, dualStatus == 2);
    }

    // A handle keeps the monitor reachable for the length of the run only: HiGHS holds the handle's value, and
    // the callbacks are stopped before the handle is freed.
    private int RunWatched(HighsRunMonitor monitor)
    {
        var handle = GCHandle.Alloc(monitor);
        try
        {
            monitor.BeginRun();
            Check(NativeMethods.Highs_setCallback(H, HighsRunMonitor.FunctionPointer, GCHandle.ToIntPtr(handle)), "Highs_setCallback");
            foreach (var type in HighsRunMonitor.Watched)
            {
                Check(NativeMethods.Highs_startCallback(H, (int)type), "Highs_startCallback");
            }

            return NativeMethods.Highs_run(H);
        }
        finally
        {
            foreach (var type in HighsRunMonitor.Watched)
            {
                NativeMethods.Highs_stopCallback(H, (int)type);
            }

            handle.Free();
        }
    }

    /// <summary>The basis status of every column and row after a simplex run (HiGHS's codes).</summary>
    public unsafe (int[] Columns, int[] Rows) GetBasis()
    {
        var model = _model ?? throw new InvalidOperationException("PassModel first.");
        var cols = new int[model.NumCol];
        var rows = new int[Math.Max(1, model.NumRow)];
        fixed (int* c = cols, r = rows)
        {
            Check(NativeMethods.Highs_getBasis(H, c, r), "Highs_getBasis");
        }

        return (cols, rows[..model.NumRow]);
    }

    /// <summary>Starts the next run from this basis (e.g. an LP's, for a QP with the same rows).</summary>
    public unsafe void SetBasis(int[] columns, int[] rows)
    {
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentNullException.ThrowIfNull(rows);
        var r = rows.Length == 0 ? [0] : rows;
        fixed (int* c = columns, rp = r)
        {
            Check(NativeMethods.Highs_setBasis(H, c, rp), "Highs_setBasis");
        }
    }

    /// <summary>Offers a primal point as the start of the next run.</summary>
    public unsafe void SetSolution(double[] columnValues)
    {
        ArgumentNullException.ThrowIfNull(columnValues);
        fixed (double* c = columnValues)
        {
            Check(NativeMethods.Highs_setSolution(H, c, null, null, null), "Highs_setSolution");
        }
    }

    /// <summary>
    /// LP sensitivity after a simplex solve: for each column the cost interval keeping the basis optimal, and for
    /// each column and row bound the interval over which the basis (so the duals) stays the same, with the
    /// objective at either end. Null when HiGHS has no basis to range.
    /// </summary>
    public unsafe HighsRanging? GetRanging()
    {
        var model = _model ?? throw new InvalidOperationException("PassModel first.");
        int nc = Math.Max(1, model.NumCol), nr = Math.Max(1, model.NumRow);
        double[] ccuV = new double[nc], ccuO = new double[nc], ccdV = new double[nc], ccdO = new double[nc];
        double[] cbuV = new double[nc], cbuO = new double[nc], cbdV = new double[nc], cbdO = new double[nc];
        double[] rbuV = new double[nr], rbuO = new double[nr], rbdV = new double[nr], rbdO = new double[nr];
        int[] i1 = new int[nc], i2 = new int[nc], i3 = new int[nc], i4 = new int[nc], i5 = new int[nc], i6 = new int[nc], i7 = new int[nc], i8 = new int[nc];
        int[] r1 = new int[nr], r2 = new int[nr], r3 = new int[nr], r4 = new int[nr];
        int status;
        fixed (double* a = ccuV, b = ccuO, c = ccdV, d = ccdO, e = cbuV, f = cbuO, g = cbdV, h = cbdO, k = rbuV, l = rbuO, m = rbdV, n = rbdO)
        fixed (int* j1 = i1, j2 = i2, j3 = i3, j4 = i4, j5 = i5, j6 = i6, j7 = i7, j8 = i8, q1 = r1, q2 = r2, q3 = r3, q4 = r4)
        {
            status = NativeMethods.Highs_getRanging(H, a, b, j1, j2, c, d, j3, j4, e, f, j5, j6, g, h, j7, j8, k, l, q1, q2, m, n, q3, q4);
        }

        if (status == -1)
        {
            return null;
        }

        var cols = model.NumCol;
        var rows = model.NumRow;
        return new HighsRanging(
            ccdV[..cols], ccuV[..cols], cbdV[..cols], cbdO[..cols], cbuV[..cols], cbuO[..cols],
            rbdV[..rows], rbdO[..rows], rbuV[..rows], rbuO[..rows]);
    }

    /// <summary>
    /// An irreducible infeasible subsystem of the passed LP: the columns whose bounds and the rows that together
    /// admit no point, every one of them needed. Null when HiGHS finds none (the model is feasible, or HiGHS
    /// cannot tell).
    /// </summary>
    public unsafe HighsIis? GetIis()
    {
        var model = _model ?? throw new InvalidOperationException("PassModel first.");
        int nc = Math.Max(1, model.NumCol), nr = Math.Max(1, model.NumRow);
        int[] colIndex = new int[nc], rowIndex = new int[nr], colBound = new int[nc], rowBound = new int[nr];
        int numCol = 0, numRow = 0, status;
        fixed (int* ci = colIndex, ri = rowIndex, cb = colBound, rb = rowBound)
        {
            status = NativeMethods.Highs_getIis(H, &numCol, &numRow, ci, ri, cb, rb, null, null);
        }

        // Warning: HiGHS could not confirm the subsystem infeasible; error: none was computed.
        if (status != 0 || numCol < 0 || numRow < 0 || numCol > model.NumCol || numRow > model.NumRow || numCol + numRow == 0)
        {
            return null;
        }

        return new HighsIis(colIndex[..numCol], rowIndex[..numRow]);
    }

    /// <summary>Writes the passed model with HiGHS's own writer; the extension picks the format (.mps, .lp).</summary>
    public void WriteModel(string path) => Check(NativeMethods.Highs_writeModel(H, path), "Highs_writeModel");

    public void Dispose() => _handle.Dispose();

    private static double[] Clamp(double[] values, double inf)
    {
        var result = new double[values.Length];
        for (var i = 0; i < values.Length; i++)
        {
            result[i] = Math.Clamp(values[i], -inf, inf);
        }

        return result;
    }

    private static void Validate(HighsModel m)
    {
        if (m.ColCost.Length != m.NumCol || m.ColLower.Length != m.NumCol || m.ColUpper.Length != m.NumCol
            || m.AStart.Length != m.NumCol + 1 || m.RowLower.Length != m.NumRow || m.RowUpper.Length != m.NumRow
            || m.AIndex.Length != m.AValue.Length)
        {
            throw new ArgumentException("Model arrays do not match its dimensions.", nameof(m));
        }

        if (m.QValue is not null && (m.QStart is null || m.QIndex is null || m.QStart.Length != m.NumCol + 1))
        {
            throw new ArgumentException("Hessian arrays do not match the number of columns.", nameof(m));
        }
    }

    private static void Check(int status, string what)
    {
        if (status == StatusError)
        {
            throw new InvalidOperationException($"HiGHS rejected {what}.");
        }
    }
}

/// <summary>HiGHS's ranging output (Dn = the lower end, Up = the upper end; Objective = the objective there).</summary>
public sealed record HighsRanging(
    double[] ColCostDn,
    double[] ColCostUp,
    double[] ColBoundDn,
    double[] ColBoundDnObjective,
    double[] ColBoundUp,
    double[] ColBoundUpObjective,
    double[] RowBoundDn,
    double[] RowBoundDnObjective,
    double[] RowBoundUp,
    double[] RowBoundUpObjective);

/// <summary>An irreducible infeasible subsystem: indices of the columns (by their bounds) and rows in it.</summary>
public sealed record HighsIis(int[] Columns, int[] Rows);
