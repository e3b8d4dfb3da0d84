using System.Runtime.InteropServices;
using FitSpec.Pipeline.Batch;

namespace FitSpec.Cli;

/// <summary>
/// Ctrl-C (SIGINT) during `fitspec solve`. The first cancels the run: the fits under way stop (HiGHS is
/// interrupted), nothing is written for them and the command ends with exit code 130 once they have stopped.
/// The second ends the process at once, after removing the temp files this process has open in the out
/// folder (a write cut short leaves the old file or none, never a half-written one).
/// </summary>
internal sealed class Interruption : IDisposable
{
    /// <summary>Exit code of a run ended by Ctrl-C: 128 + SIGINT, what shells report for it.</summary>
    public const int ExitCode = BatchRunner.CancelledExitCode;

    private readonly CancellationTokenSource _cancel;
    private readonly string _outDir;
    private readonly Action _cancelling;
    private readonly Action _leaving;
    private readonly PosixSignalRegistration? _registration;
    private int _signals;

    /// <param name="cancel">Cancelled by the first Ctrl-C.</param>
    /// <param name="outDir">The run's out folder, searched for this process's temp files on the second.</param>
    /// <param name="cancelling">Says that the run is being cancelled (called on a signal thread).</param>
    /// <param name="leaving">Puts the terminal right before the process ends on the second.</param>
    /// <param name="listen">False in tests, which raise the signal through <see cref="OnSignal"/>.</param>
    public Interruption(CancellationTokenSource cancel, string outDir, Action cancelling, Action leaving, bool listen = true)
    {
        _cancel = cancel;
        _outDir = outDir;
        _cancelling = cancelling;
        _leaving = leaving;
        _registration = listen ? PosixSignalRegistration.Create(PosixSignal.SIGINT, OnSignal) : null;
    }

    public bool Cancelled => _cancel.IsCancellationRequested;

    internal void OnSignal(PosixSignalContext context)
    {
        // The process goes on either way: the first signal to finish cleanly, the second to clean up first.
        context.Cancel = true;
        if (Interlocked.Increment(ref _signals) == 1)
        {
            _cancelling();
            _cancel.Cancel();
            return;
        }

        RemoveTempFiles(_outDir);
        _leaving();
        Environment.Exit(ExitCode);
    }

    /// <summary>
    /// Deletes the temp files of this process in the out folder and its cache folder (AtomicFile names them
    /// ".NAME.PID.GUID.tmp"); returns how many. Files of other processes writing there are left alone.
    /// </summary>
    internal static int RemoveTempFiles(string outDir)
    {
        var removed = 0;
        foreach (var folder in new[] { outDir, Path.Combine(outDir, FitCache.FolderName) })
        {
            if (!Directory.Exists(folder))
            {
                continue;
            }

            foreach (var file in Directory.EnumerateFiles(folder, $".*.{Environment.ProcessId}.*.tmp"))
            {
                try
                {
                    File.Delete(file);
                    removed++;
                }
                catch (Exception e) when (e is IOException or UnauthorizedAccessException)
                {
                    // Leaving at once matters more than one stray temp file.
                }
            }
        }

        return removed;
    }

    public void Dispose() => _registration?.Dispose();
}
