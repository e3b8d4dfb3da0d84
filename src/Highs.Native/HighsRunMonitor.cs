using System.Diagnostics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace Highs.Native;

/// <summary>
/// What HiGHS last said about a run under way. Counts are of the current run; a value HiGHS has not reported
/// (yet, or for this kind of model) is NaN or -1.
/// </summary>
/// <param name="Seconds">HiGHS's own run time when it gave one, else the time since the run began.</param>
/// <param name="SimplexIterations">Simplex iterations (LP), -1 when none reported.</param>
/// <param name="IpmIterations">Interior-point iterations (LP), -1 when none reported.</param>
/// <param name="MipNodes">Branch-and-bound nodes (MILP), -1 when none reported.</param>
/// <param name="MipLpIterations">LP iterations inside branch and bound (MILP), -1 when none reported.</param>
/// <param name="Objective">The current objective (for a MILP: of the best point found), NaN when unknown.</param>
/// <param name="MipDualBound">The proven lower bound of a MILP, NaN when unknown.</param>
/// <param name="MipGap">The MILP's relative gap between best point and bound, NaN when unknown.</param>
public readonly record struct HighsProgress(
    double Seconds,
    int SimplexIterations,
    int IpmIterations,
    long MipNodes,
    long MipLpIterations,
    double Objective,
    double MipDualBound,
    double MipGap)
{
    /// <summary>Every iteration of the run so far, whichever method made it.</summary>
    public long Iterations => Math.Max(0, SimplexIterations) + Math.Max(0, IpmIterations) + Math.Max(0, MipLpIterations);
}

/// <summary>
/// Watches HiGHS runs through its C callback: stops a run when the token is cancelled (HiGHS then ends with
/// model status Interrupt) and passes the run's state to <c>report</c> at most every <c>reportEvery</c>.
/// One monitor may watch several runs one after another, not two at once. <c>report</c> is called on the
/// thread that runs HiGHS, inside the solve, so it must be quick and must not throw (if it does, reporting
/// stops; the run goes on).
/// </summary>
public sealed class HighsRunMonitor
{
    private static readonly long Frequency = Stopwatch.Frequency;
    private readonly CancellationToken _cancellation;
    private readonly Action<HighsProgress>? _report;
    private readonly long _reportTicks;
    private long _runStart;
    private long _nextReport;
    private bool _reportFailed;

    // The run's last known values: each callback kind fills only some members (HiGHS clears the others).
    private double _seconds;
    private int _simplex;
    private int _ipm;
    private long _nodes;
    private long _mipLp;
    private double _objective;
    private double _dualBound;
    private double _gap;

    public HighsRunMonitor(CancellationToken cancellation, Action<HighsProgress>? report = null, TimeSpan? reportEvery = null)
    {
        _cancellation = cancellation;
        _report = report;
        _reportTicks = (long)((reportEvery ?? TimeSpan.FromMilliseconds(250)).TotalSeconds * Frequency);
        BeginRun();
    }

    /// <summary>How many times HiGHS called back, over every run watched.</summary>
    public long Callbacks { get; private set; }

    /// <summary>Whether the last run was told to stop because the token was cancelled.</summary>
    public bool Interrupted { get; private set; }

    /// <summary>The last run's state as last reported by HiGHS.</summary>
    public HighsProgress Latest => new(_seconds, _simplex, _ipm, _nodes, _mipLp, _objective, _dualBound, _gap);

    internal static readonly HighsCallbackType[] Watched =
    [
        HighsCallbackType.SimplexInterrupt,
        HighsCallbackType.IpmInterrupt,
        HighsCallbackType.MipInterrupt,
        HighsCallbackType.MipImprovingSolution,
        HighsCallbackType.MipLogging,
    ];

    internal void BeginRun()
    {
        _runStart = Stopwatch.GetTimestamp();
        _nextReport = _runStart;
        Interrupted = false;
        _seconds = 0;
        _simplex = _ipm = -1;
        _nodes = _mipLp = -1;
        _objective = _dualBound = _gap = double.NaN;
    }

    internal static unsafe IntPtr FunctionPointer => (IntPtr)(delegate* unmanaged[Cdecl]<int, byte*, HighsCallbackDataOut*, HighsCallbackDataIn*, IntPtr, void>)&OnCallback;

    // Called by HiGHS once per simplex or interior-point iteration and at MILP events: a few loads and stores,
    // a clock read, and the sink only when a report is due. Nothing may throw into native code.
    [UnmanagedCallersOnly(CallConvs = [typeof(CallConvCdecl)])]
    private static unsafe void OnCallback(int type, byte* message, HighsCallbackDataOut* dataOut, HighsCallbackDataIn* dataIn, IntPtr userData)
    {
        if (userData == IntPtr.Zero || GCHandle.FromIntPtr(userData).Target is not HighsRunMonitor monitor)
        {
            return;
        }

        monitor.On((HighsCallbackType)type, dataOut, dataIn);
    }

    private unsafe void On(HighsCallbackType type, HighsCallbackDataOut* dataOut, HighsCallbackDataIn* dataIn)
    {
        Callbacks++;
        // HiGHS acts on user_interrupt only in the interrupt callbacks (and asserts it is unset in the others).
        if (_cancellation.IsCancellationRequested && dataIn != null
            && type is HighsCallbackType.SimplexInterrupt or HighsCallbackType.IpmInterrupt or HighsCallbackType.MipInterrupt)
        {
            dataIn->UserInterrupt = 1;
            Interrupted = true;
            return;
        }

        var now = Stopwatch.GetTimestamp();
        if (dataOut != null && HighsCallbackLayout.Usable(dataOut))
        {
            Read(type, dataOut, now);
        }

        if (_report is null || _reportFailed || now < _nextReport)
        {
            return;
        }

        _nextReport = now + _reportTicks;
        try
        {
            _report(Latest);
        }
        catch (Exception)
        {
            // A failing sink must not unwind through HiGHS; the solve matters more than its progress line.
            _reportFailed = true;
        }
    }

    private unsafe void Read(HighsCallbackType type, HighsCallbackDataOut* d, long now)
    {
        _seconds = Math.Max(_seconds, d->RunningTime >= 0 ? d->RunningTime : (double)(now - _runStart) / Frequency);
        if (d->SimplexIterationCount >= 0)
        {
            _simplex = d->SimplexIterationCount;
        }

        if (d->IpmIterationCount >= 0)
        {
            _ipm = d->IpmIterationCount;
        }

        if (type is HighsCallbackType.MipInterrupt or HighsCallbackType.MipImprovingSolution or HighsCallbackType.MipLogging)
        {
            if (d->MipNodeCount >= 0)
            {
                _nodes = d->MipNodeCount;
            }

            if (d->MipTotalLpIterations >= 0)
            {
                _mipLp = d->MipTotalLpIterations;
            }

            // Until a point is found the primal bound is +inf and the gap is meaningless.
            if (double.IsFinite(d->MipPrimalBound))
            {
                _objective = d->MipPrimalBound;
                _gap = d->MipGap >= 0 ? d->MipGap : double.NaN;
            }

            if (double.IsFinite(d->MipDualBound))
            {
                _dualBound = d->MipDualBound;
            }
        }
        else if (double.IsFinite(d->ObjectiveFunctionValue))
        {
            _objective = d->ObjectiveFunctionValue;
        }
    }
}
