using System.Runtime.InteropServices;

namespace Highs.Native;

/// <summary>The callback kinds of HiGHS's C API this binding starts (its kHighsCallback* numbers).</summary>
internal enum HighsCallbackType
{
    Logging = 0,
    SimplexInterrupt = 1,
    IpmInterrupt = 2,
    MipSolution = 3,
    MipImprovingSolution = 4,
    MipLogging = 5,
    MipInterrupt = 6,
}

/// <summary>
/// The leading members of HiGHS 1.12's HighsCallbackDataOut, in its order (HighsInt is 32-bit, checked at load).
/// The struct goes on with the incumbent, cut pool and solution-origin members, which this binding never reads:
/// it only ever reads through a pointer HiGHS passes, so declaring the prefix is enough.
/// <see cref="HighsCallbackLayout"/> checks these offsets against the library's own accessor.
/// </summary>
[StructLayout(LayoutKind.Sequential)]
internal struct HighsCallbackDataOut
{
    public IntPtr CallbackData;
    public int LogType;
    public double RunningTime;
    public int SimplexIterationCount;
    public int IpmIterationCount;
    public int PdlpIterationCount;
    public double ObjectiveFunctionValue;
    public long MipNodeCount;
    public long MipTotalLpIterations;
    public double MipPrimalBound;
    public double MipDualBound;
    public double MipGap;
}

/// <summary>The leading member of HighsCallbackDataIn: set to 1 in an interrupt callback to stop the run.</summary>
[StructLayout(LayoutKind.Sequential)]
internal struct HighsCallbackDataIn
{
    public int UserInterrupt;
}

/// <summary>
/// Whether <see cref="HighsCallbackDataOut"/> matches the loaded library: each member's offset is compared,
/// once per process, with the address HiGHS's accessor (Highs_getCallbackDataOutItem) gives for its name.
/// Until it has been checked, and if it does not match, no values are read from the struct (interrupting
/// still works: user_interrupt is the first member of the input struct in every version).
/// </summary>
public static unsafe class HighsCallbackLayout
{
    private const int Unchecked = 0;
    private const int Matching = 1;
    private const int Different = -1;
    private static int state = Unchecked;

    /// <summary>True once a callback has shown the declared layout to be the library's.</summary>
    public static bool Verified => Volatile.Read(ref state) == Matching;

    /// <summary>The members that differ, empty when the layout matches or has not been checked.</summary>
    public static IReadOnlyList<string> Mismatches { get; private set; } = [];

    internal static bool Usable(HighsCallbackDataOut* data)
    {
        var current = Volatile.Read(ref state);
        if (current == Unchecked)
        {
            current = Check(data);
        }

        return current == Matching;
    }

    private static int Check(HighsCallbackDataOut* data)
    {
        var origin = (byte*)data;
        var mismatches = new List<string>();
        Compare("running_time\0"u8, (byte*)&data->RunningTime);
        Compare("simplex_iteration_count\0"u8, (byte*)&data->SimplexIterationCount);
        Compare("ipm_iteration_count\0"u8, (byte*)&data->IpmIterationCount);
        Compare("objective_function_value\0"u8, (byte*)&data->ObjectiveFunctionValue);
        Compare("mip_node_count\0"u8, (byte*)&data->MipNodeCount);
        Compare("mip_total_lp_iterations\0"u8, (byte*)&data->MipTotalLpIterations);
        Compare("mip_primal_bound\0"u8, (byte*)&data->MipPrimalBound);
        Compare("mip_dual_bound\0"u8, (byte*)&data->MipDualBound);
        Compare("mip_gap\0"u8, (byte*)&data->MipGap);
        Mismatches = mismatches;
        var result = mismatches.Count == 0 ? Matching : Different;
        Interlocked.CompareExchange(ref state, result, Unchecked);
        return Volatile.Read(ref state);

        void Compare(ReadOnlySpan<byte> name, byte* declared)
        {
            fixed (byte* n = name)
            {
                var actual = (byte*)NativeMethods.Highs_getCallbackDataOutItem(data, n);
                if (actual != declared)
                {
                    var label = System.Text.Encoding.UTF8.GetString(name[..^1]);
                    mismatches.Add(actual == null
                        ? $"{label}: unknown to the library"
                        : $"{label}: declared at {declared - origin}, library at {actual - origin}");
                }
            }
        }
    }
}
