using System.Reflection;
using System.Runtime.InteropServices;

namespace Highs.Native;

/// <summary>Raw entry points of the HiGHS C API (HighsInt is 32-bit in the shipped build; checked at load).</summary>
internal static partial class NativeMethods
{
    internal const string Library = "highs";

    static NativeMethods()
    {
        NativeLibrary.SetDllImportResolver(typeof(NativeMethods).Assembly, Resolve);
    }

    // The runtime package ships the library as libhighs.so.1, which the default probing does not find.
    private static IntPtr Resolve(string name, Assembly assembly, DllImportSearchPath? searchPath)
    {
        if (name != Library)
        {
            return IntPtr.Zero;
        }

        var baseDir = AppContext.BaseDirectory;
        string[] candidates =
        [
            Path.Combine(baseDir, "runtimes", "linux-x64", "native", "libhighs.so.1"),
            Path.Combine(baseDir, "libhighs.so.1"),
            Path.Combine(baseDir, "runtimes", "linux-arm64", "native", "libhighs.so.1"),
            Path.Combine(baseDir, "runtimes", "osx-x64", "native", "libhighs.dylib"),
            Path.Combine(baseDir, "runtimes", "osx-arm64", "native", "libhighs.dylib"),
            Path.Combine(baseDir, "runtimes", "win-x64", "native", "highs.dll"),
        ];
        foreach (var path in candidates)
        {
            if (File.Exists(path) && NativeLibrary.TryLoad(path, out var handle))
            {
                return handle;
            }
        }

        return NativeLibrary.TryLoad("libhighs.so.1", assembly, searchPath, out var fallback) ? fallback : IntPtr.Zero;
    }

    [LibraryImport(Library)]
    internal static partial IntPtr Highs_create();

    [LibraryImport(Library)]
    internal static partial void Highs_destroy(IntPtr highs);

    [LibraryImport(Library)]
    internal static partial IntPtr Highs_version();

    [LibraryImport(Library)]
    internal static partial int Highs_getSizeofHighsInt(IntPtr highs);

    [LibraryImport(Library)]
    internal static unsafe partial int Highs_passModel(
        IntPtr highs, int numCol, int numRow, int numNz, int qNumNz, int aFormat, int qFormat, int sense, double offset,
        double* colCost, double* colLower, double* colUpper, double* rowLower, double* rowUpper,
        int* aStart, int* aIndex, double* aValue, int* qStart, int* qIndex, double* qValue, int* integrality);

    [LibraryImport(Library)]
    internal static partial int Highs_run(IntPtr highs);

    [LibraryImport(Library)]
    internal static partial int Highs_getModelStatus(IntPtr highs);

    [LibraryImport(Library)]
    internal static unsafe partial int Highs_getSolution(IntPtr highs, double* colValue, double* colDual, double* rowValue, double* rowDual);

    [LibraryImport(Library)]
    internal static partial double Highs_getObjectiveValue(IntPtr highs);

    [LibraryImport(Library)]
    internal static partial double Highs_getRunTime(IntPtr highs);

    [LibraryImport(Library)]
    internal static partial double Highs_getInfinity(IntPtr highs);

    [LibraryImport(Library, StringMarshalling = StringMarshalling.Utf8)]
    internal static partial int Highs_setBoolOptionValue(IntPtr highs, string option, int value);

    [LibraryImport(Library, StringMarshalling = StringMarshalling.Utf8)]
    internal static partial int Highs_setIntOptionValue(IntPtr highs, string option, int value);

    [LibraryImport(Library, StringMarshalling = StringMarshalling.Utf8)]
    internal static partial int Highs_setDoubleOptionValue(IntPtr highs, string option, double value);

    [LibraryImport(Library, StringMarshalling = StringMarshalling.Utf8)]
    internal static partial int Highs_setStringOptionValue(IntPtr highs, string option, string value);

    [LibraryImport(Library, StringMarshalling = StringMarshalling.Utf8)]
    internal static partial int Highs_getIntInfoValue(IntPtr highs, string info, out int value);

    [LibraryImport(Library, StringMarshalling = StringMarshalling.Utf8)]
    internal static partial int Highs_getDoubleInfoValue(IntPtr highs, string info, out double value);

    [LibraryImport(Library, StringMarshalling = StringMarshalling.Utf8)]
    internal static partial int Highs_writeModel(IntPtr highs, string filename);

    [LibraryImport(Library)]
    internal static unsafe partial int Highs_getBasis(IntPtr highs, int* colStatus, int* rowStatus);

    [LibraryImport(Library)]
    internal static unsafe partial int Highs_setBasis(IntPtr highs, int* colStatus, int* rowStatus);

    [LibraryImport(Library)]
    internal static unsafe partial int Highs_setSolution(IntPtr highs, double* colValue, double* rowValue, double* colDual, double* rowDual);

    // user_callback: void (*)(int type, const char* message, const HighsCallbackDataOut*, HighsCallbackDataIn*, void* data).
    [LibraryImport(Library)]
    internal static partial int Highs_setCallback(IntPtr highs, IntPtr userCallback, IntPtr userCallbackData);

    [LibraryImport(Library)]
    internal static partial int Highs_startCallback(IntPtr highs, int callbackType);

    [LibraryImport(Library)]
    internal static partial int Highs_stopCallback(IntPtr highs, int callbackType);

    /// <summary>The address of a named member of the callback's output struct (null for an unknown name).</summary>
    [LibraryImport(Library)]
    internal static unsafe partial IntPtr Highs_getCallbackDataOutItem(HighsCallbackDataOut* dataOut, byte* itemName);

    [LibraryImport(Library)]
    internal static unsafe partial int Highs_getIis(
        IntPtr highs, int* iisNumCol, int* iisNumRow, int* colIndex, int* rowIndex,
        int* colBound, int* rowBound, int* colStatus, int* rowStatus);

    [LibraryImport(Library)]
    internal static unsafe partial int Highs_getRanging(
        IntPtr highs,
        double* colCostUpValue, double* colCostUpObjective, int* colCostUpInVar, int* colCostUpOutVar,
        double* colCostDnValue, double* colCostDnObjective, int* colCostDnInVar, int* colCostDnOutVar,
        double* colBoundUpValue, double* colBoundUpObjective, int* colBoundUpInVar, int* colBoundUpOutVar,
        double* colBoundDnValue, double* colBoundDnObjective, int* colBoundDnInVar, int* colBoundDnOutVar,
        double* rowBoundUpValue, double* rowBoundUpObjective, int* rowBoundUpInVar, int* rowBoundUpOutVar,
        double* rowBoundDnValue, double* rowBoundDnObjective, int* rowBoundDnInVar, int* rowBoundDnOutVar);
}
