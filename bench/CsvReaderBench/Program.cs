// CsvReaderBench: Sep vs Sylvan.Data.Csv on FitSpec's job.
//
// Job: a delimited file with a header row and 20 numeric columns; look up a chosen subset of
// columns by header name, parse every cell of those columns into one double[] per column
// (growing buffers, the row count is not known up front), invariant culture, and stop at the
// first non-numeric cell reporting its 1-based file line (the header is line 1).
//
// Timing: plain Stopwatch, warm-up runs first, then N repetitions per variant with the variant
// order rotated each repetition; the median is reported. Allocation: GC.GetTotalAllocatedBytes(true)
// delta around one run (the column buffers are included; the "lib overhead" column subtracts them).
// Only clean files are timed; the bad-cell files are checked for the reported line only.
using System.Diagnostics;
using System.Globalization;
using System.Runtime;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Text;
using csFastFloat;
using nietras.SeparatedValues;
using Sylvan.Data.Csv;

namespace CsvReaderBench;

internal static class Program
{
    private const int ColumnCount = 20;
    private const int Seed = 20240611;

    private static int Main(string[] args)
    {
        var options = BenchOptions.Parse(args);
        Directory.CreateDirectory(options.Directory);

        PrintMachine(options);
        var totalTime = Stopwatch.StartNew();

        string[] allNames = Enumerable.Range(1, ColumnCount)
            .Select(i => string.Create(CultureInfo.InvariantCulture, $"col{i:D2}"))
            .ToArray();
        // The subset: every second column, looked up by name (col02, col04, ..., col20).
        string[] subsetNames = allNames.Where((_, i) => i % 2 == 1).ToArray();

        var variants = Variants.All;
        bool allOk = true;

        Console.WriteLine();
        Console.WriteLine("## Cell semantics probe (what each parse path does with odd cells)");
        Probes.CellSemantics();
        Console.WriteLine();
        Probes.TsvCellSemantics();
        Console.WriteLine();
        Console.WriteLine("## Line-number / quoting probe");
        allOk &= Probes.LineNumbersAndQuoting();

        Console.WriteLine();
        Console.WriteLine("## Bad-cell files (not timed): first non-numeric cell must be reported with its file line");
        allOk &= CheckBadFiles(options, allNames, subsetNames, variants);

        var rows = new List<ResultRow>();
        foreach (char sep in new[] { ',', '\t' })
        {
            foreach (int rowCount in options.Rows)
            {
                var sw = Stopwatch.StartNew();
                string path = Path.Combine(options.Directory, string.Create(CultureInfo.InvariantCulture,
                    $"clean_{rowCount}.{(sep == ',' ? "csv" : "tsv")}"));
                ulong[] expectedHashes = DataGen.Write(path, sep, rowCount, allNames, Seed, bad: null);
                long fileBytes = new FileInfo(path).Length;
                Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
                    $"generated {path} ({fileBytes / 1e6:F1} MB) in {sw.Elapsed.TotalSeconds:F1} s"));

                foreach (string[] names in new[] { subsetNames, allNames })
                {
                    int[] nameIdx = names.Select(n => Array.IndexOf(allNames, n)).ToArray();
                    var bench = new CaseBench(path, sep, names, nameIdx, rowCount, expectedHashes, [.. variants, .. Variants.ScanOnly], options);
                    var caseRows = bench.Run();
                    foreach (var r in caseRows)
                    {
                        r.FileBytes = fileBytes;
                        allOk &= r.Verified;
                        Console.Error.WriteLine(r.ToProgressLine());
                    }
                    rows.AddRange(caseRows);
                }
                if (!options.KeepFiles)
                {
                    File.Delete(path);
                }
            }
        }

        Console.WriteLine();
        Console.WriteLine("## Results (clean files, warm page cache)");
        Report.Print(rows);
        Console.WriteLine();
        Console.WriteLine("load average at end: " + LoadAverage() + $" (total bench time {totalTime.Elapsed.TotalMinutes:F1} min)");
        Console.WriteLine(allOk ? "All correctness checks passed." : "SOME CORRECTNESS CHECKS FAILED (see above).");
        return allOk ? 0 : 1;
    }

    private static void PrintMachine(BenchOptions options)
    {
        Console.WriteLine("# CsvReaderBench: Sep vs Sylvan.Data.Csv");
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"runtime: {RuntimeInformation.FrameworkDescription}, {RuntimeInformation.OSDescription}, {RuntimeInformation.ProcessArchitecture}"));
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"cpu: {CpuModel()}, logical cores: {Environment.ProcessorCount}"));
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"gc: server={GCSettings.IsServerGC}, latency={GCSettings.LatencyMode}; build: {BuildConfig()}"));
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"packages: Sep {InfoVersion(typeof(Sep))}, Sylvan.Data.Csv {InfoVersion(typeof(CsvDataReader))}, csFastFloat {InfoVersion(typeof(FastDoubleParser))}"));
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"load average at start: {LoadAverage()}"));
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"rows: {string.Join(", ", options.Rows)}; columns: {ColumnCount}; warm-up runs: {options.Warmup}; timed runs: {options.Reps}; seed: {Seed}; dir: {options.Directory}"));
    }

    private static string InfoVersion(Type t)
    {
        string? v = t.Assembly.GetCustomAttributes(typeof(System.Reflection.AssemblyInformationalVersionAttribute), false)
            .OfType<System.Reflection.AssemblyInformationalVersionAttribute>().FirstOrDefault()?.InformationalVersion;
        return v is null ? t.Assembly.GetName().Version?.ToString() ?? "?" : v.Split('+')[0];
    }

    private static string BuildConfig()
    {
#if DEBUG
        return "DEBUG (numbers meaningless, use -c Release)";
#else
        return "Release";
#endif
    }

    internal static string LoadAverage()
    {
        try
        {
            return File.Exists("/proc/loadavg") ? File.ReadAllText("/proc/loadavg").Trim() : "n/a";
        }
        catch (IOException)
        {
            return "n/a";
        }
    }

    private static string CpuModel()
    {
        try
        {
            if (File.Exists("/proc/cpuinfo"))
            {
                foreach (string line in File.ReadLines("/proc/cpuinfo"))
                {
                    if (line.StartsWith("model name", StringComparison.Ordinal))
                    {
                        return line[(line.IndexOf(':', StringComparison.Ordinal) + 1)..].Trim();
                    }
                }
            }
        }
        catch (IOException)
        {
        }
        return RuntimeInformation.ProcessArchitecture.ToString();
    }

    private static bool CheckBadFiles(BenchOptions options, string[] allNames, string[] subsetNames, IReadOnlyList<Variant> variants)
    {
        bool ok = true;
        const int rowCount = 100_000;
        // (a) bad cell in a selected column: "n/a" at file line 54322, column col08.
        // (b) bad cell in a column NOT in the subset: "1.5x" (numeric prefix!) at line 77777, col07.
        var badCases = new[]
        {
            new BadCell(Line: 54_322, Column: "col08", Text: "n/a"),
            new BadCell(Line: 77_777, Column: "col07", Text: "1.5x"),
        };
        Console.WriteLine("| file | columns | variant | expected | reported | ok |");
        Console.WriteLine("|---|---|---|---|---|---|");
        foreach (char sep in new[] { ',', '\t' })
        {
            foreach (var bad in badCases)
            {
                string path = Path.Combine(options.Directory, string.Create(CultureInfo.InvariantCulture,
                    $"bad_{bad.Line}.{(sep == ',' ? "csv" : "tsv")}"));
                DataGen.Write(path, sep, rowCount, allNames, Seed, bad);
                foreach (string[] names in new[] { subsetNames, allNames })
                {
                    bool selected = names.Contains(bad.Column);
                    string expected = selected
                        ? string.Create(CultureInfo.InvariantCulture, $"line {bad.Line}, {bad.Column}, '{bad.Text}'")
                        : string.Create(CultureInfo.InvariantCulture, $"no error, {rowCount} rows");
                    foreach (var v in variants)
                    {
                        var result = v.Run(path, sep, names);
                        string reported = result.Error is { } e
                            ? string.Create(CultureInfo.InvariantCulture, $"line {e.Line}, {e.Column}, '{e.Text}'")
                            : string.Create(CultureInfo.InvariantCulture, $"no error, {result.RowCount} rows");
                        bool pass = reported == expected;
                        ok &= pass;
                        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
                            $"| {Path.GetFileName(path)} | {names.Length} | {v.Name} | {expected} | {reported} | {(pass ? "yes" : "NO")} |"));
                    }
                }
                if (!options.KeepFiles)
                {
                    File.Delete(path);
                }
            }
        }
        return ok;
    }
}

internal sealed record BenchOptions(int[] Rows, int Reps, int Warmup, string Directory, bool KeepFiles)
{
    public static BenchOptions Parse(string[] args)
    {
        int[] rows = [100_000, 1_000_000];
        int reps = 7;
        int warmup = 2;
        string dir = Path.Combine(Path.GetTempPath(), "csvbench");
        bool keep = false;
        for (int i = 0; i < args.Length; i++)
        {
            switch (args[i])
            {
                case "--rows":
                    rows = args[++i].Split(',').Select(s => int.Parse(s, CultureInfo.InvariantCulture)).ToArray();
                    break;
                case "--reps":
                    reps = int.Parse(args[++i], CultureInfo.InvariantCulture);
                    break;
                case "--warmup":
                    warmup = int.Parse(args[++i], CultureInfo.InvariantCulture);
                    break;
                case "--dir":
                    dir = args[++i];
                    break;
                case "--keep":
                    keep = true;
                    break;
                default:
                    throw new ArgumentException("unknown argument: " + args[i]);
            }
        }
        return new BenchOptions(rows, Math.Max(reps, 1), Math.Max(warmup, 0), dir, keep);
    }
}

internal enum SepParser
{
    SepTryParse,
    Bcl,
    FastFloatStrict,
}

internal sealed record BadCell(int Line, string Column, string Text);

internal sealed record ParseError(int Line, string Column, string Text);

internal sealed class ParseResult
{
    public required string[] Names { get; init; }
    public double[][] Columns { get; init; } = [];
    public int RowCount { get; init; }
    public ParseError? Error { get; init; }
    public long BufferBytes { get; init; }
    public long Checksum { get; init; }
}

internal sealed record Variant(string Library, string Name, string Api, Func<string, char, string[], ParseResult> Run);

/// <summary>One double[] per column, grown by doubling (row count unknown up front), trimmed at the end.</summary>
internal sealed class ColumnBuffers
{
    private readonly double[][] _cols;
    private int _capacity;
    private long _allocatedBytes;

    public ColumnBuffers(int columnCount, int initialCapacity = 4096)
    {
        _capacity = initialCapacity;
        _cols = new double[columnCount][];
        for (int k = 0; k < columnCount; k++)
        {
            _cols[k] = new double[initialCapacity];
        }
        _allocatedBytes = (long)columnCount * initialCapacity * sizeof(double);
    }

    /// <summary>The outer array never changes; inner arrays are replaced on growth.</summary>
    public double[][] Cols => _cols;

    public int Count { get; private set; }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public int NextRow()
    {
        if (Count == _capacity)
        {
            Grow();
        }
        return Count++;
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private void Grow()
    {
        int newCapacity = checked(_capacity * 2);
        for (int k = 0; k < _cols.Length; k++)
        {
            Array.Resize(ref _cols[k], newCapacity);
        }
        _allocatedBytes += (long)_cols.Length * newCapacity * sizeof(double);
        _capacity = newCapacity;
    }

    public ParseResult ToResult(string[] names, ParseError? error)
    {
        if (error is null && Count != _capacity)
        {
            for (int k = 0; k < _cols.Length; k++)
            {
                Array.Resize(ref _cols[k], Count);
            }
            _allocatedBytes += (long)_cols.Length * Count * sizeof(double);
        }
        return new ParseResult { Names = names, Columns = _cols, RowCount = Count, Error = error, BufferBytes = _allocatedBytes };
    }
}

internal static class Variants
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    private const NumberStyles Float = NumberStyles.Float;

    public static IReadOnlyList<Variant> All { get; } =
    [
        new("Sep", "Sep TryParse", "row[i].TryParse<double>(out v) (csFastFloat), Unescape=false", (p, s, n) => SepRead(p, s, n, unescape: false, SepParser.SepTryParse)),
        new("Sep", "Sep TryParse Unescape", "row[i].TryParse<double>(out v), Unescape=true", (p, s, n) => SepRead(p, s, n, unescape: true, SepParser.SepTryParse)),
        new("Sep", "Sep span+BCL", "double.TryParse(row[i].Span, Float, Invariant), Unescape=true", (p, s, n) => SepRead(p, s, n, unescape: true, SepParser.Bcl)),
        new("Sep", "Sep span+csFastFloat", "FastFloatStrict(row[i].Span) = csFastFloat TryParseDouble + consumed==length, Unescape=true", (p, s, n) => SepRead(p, s, n, unescape: true, SepParser.FastFloatStrict)),
        new("Sylvan", "Sylvan span+BCL", "double.TryParse(dr.GetFieldSpan(i), Float, Invariant)", (p, s, n) => SylvanRead(p, s, n, getDouble: false)),
        new("Sylvan", "Sylvan GetDouble", "dr.GetDouble(i), catch FormatException", (p, s, n) => SylvanRead(p, s, n, getDouble: true)),
        new("Sylvan", "Sylvan span+csFastFloat", "FastFloatStrict(dr.GetFieldSpan(i)) (csFastFloat 4.1.6; referenced here only transitively via Sep)", (p, s, n) => SylvanRead(p, s, n, getDouble: false, fastFloat: true)),
    ];

    /// <summary>Tokenizer cost only: visit the same cells, sum their lengths, parse nothing (not our job; for attribution).</summary>
    public static IReadOnlyList<Variant> ScanOnly { get; } =
    [
        new("Sep", "Sep scan only", "row[i].Span.Length summed, no parsing", (p, s, n) => SepScan(p, s, n)),
        new("Sylvan", "Sylvan scan only", "dr.GetFieldSpan(i).Length summed, no parsing", (p, s, n) => SylvanScan(p, s, n)),
    ];

    public static ParseResult SepScan(string path, char separator, string[] names)
    {
        using var reader = Sep.Reader(o => o with { Sep = new Sep(separator), CultureInfo = Inv, Unescape = true }).FromFile(path);
        int[] idx = names.Select(reader.Header.IndexOf).ToArray();
        long chars = 0;
        int rows = 0;
        foreach (var row in reader)
        {
            for (int k = 0; k < idx.Length; k++)
            {
                chars += row[idx[k]].Span.Length;
            }
            rows++;
        }
        return new ParseResult { Names = names, RowCount = rows, Checksum = chars };
    }

    public static ParseResult SylvanScan(string path, char separator, string[] names)
    {
        using var dr = CsvDataReader.Create(path, new CsvDataReaderOptions { Delimiter = separator, HasHeaders = true, Culture = Inv });
        int[] idx = names.Select(dr.GetOrdinal).ToArray();
        long chars = 0;
        int rows = 0;
        while (dr.Read())
        {
            for (int k = 0; k < idx.Length; k++)
            {
                chars += dr.GetFieldSpan(idx[k]).Length;
            }
            rows++;
        }
        return new ParseResult { Names = names, RowCount = rows, Checksum = chars };
    }

    /// <summary>
    /// csFastFloat ignores trailing content ("1.5x" -> 1.5), so require the whole cell to be consumed.
    /// NumberStyles.Float: no thousands separators ("1,5" is rejected, unlike Sep's Col.TryParse).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool FastFloatStrict(ReadOnlySpan<char> span, out double value) =>
        FastDoubleParser.TryParseDouble(span, out int consumed, out value, Float, '.') && consumed == span.Length;

    public static ParseResult SepRead(string path, char separator, string[] names, bool unescape, SepParser parser)
    {
        using var reader = Sep.Reader(o => o with
        {
            Sep = new Sep(separator),
            HasHeader = true,
            CultureInfo = CultureInfo.InvariantCulture,
            Unescape = unescape,
        }).FromFile(path);

        var header = reader.Header;
        int[] idx = new int[names.Length];
        for (int k = 0; k < names.Length; k++)
        {
            if (!header.TryIndexOf(names[k], out idx[k]))
            {
                return new ParseResult { Names = names, Error = new ParseError(1, names[k], "<missing column>") };
            }
        }

        var buffers = new ColumnBuffers(names.Length);
        double[][] cols = buffers.Cols;
        foreach (var row in reader)
        {
            int r = buffers.NextRow();
            for (int k = 0; k < idx.Length; k++)
            {
                var col = row[idx[k]];
                double v;
                bool ok = parser switch
                {
                    SepParser.SepTryParse => col.TryParse(out v),
                    SepParser.Bcl => double.TryParse(col.Span, Float, Inv, out v),
                    _ => FastFloatStrict(col.Span, out v),
                };
                if (!ok)
                {
                    return buffers.ToResult(names, new ParseError(row.LineNumberFrom, names[k], col.ToString()));
                }
                cols[k][r] = v;
            }
        }
        return buffers.ToResult(names, null);
    }

    public static ParseResult SylvanRead(string path, char separator, string[] names, bool getDouble, bool fastFloat = false)
    {
        var opts = new CsvDataReaderOptions
        {
            Delimiter = separator,
            HasHeaders = true,
            Culture = CultureInfo.InvariantCulture,
        };
        using var dr = CsvDataReader.Create(path, opts);

        int[] idx = new int[names.Length];
        for (int k = 0; k < names.Length; k++)
        {
            idx[k] = -1;
            for (int i = 0; i < dr.FieldCount; i++)
            {
                if (string.Equals(dr.GetName(i), names[k], StringComparison.Ordinal))
                {
                    idx[k] = i;
                    break;
                }
            }
            if (idx[k] < 0)
            {
                return new ParseResult { Names = names, Error = new ParseError(1, names[k], "<missing column>") };
            }
        }

        var buffers = new ColumnBuffers(names.Length);
        double[][] cols = buffers.Cols;
        // Sylvan's RowNumber is the 1-based number of the *data record* (the header is not counted:
        // first data record => 1), so file line = RowNumber + 1 with a header, valid only while no
        // quoted field contains a newline (RowNumber counts records, not lines).
        while (dr.Read())
        {
            int r = buffers.NextRow();
            for (int k = 0; k < idx.Length; k++)
            {
                double v;
                if (getDouble)
                {
                    try
                    {
                        v = dr.GetDouble(idx[k]);
                    }
                    catch (FormatException)
                    {
                        return buffers.ToResult(names, new ParseError(dr.RowNumber + 1, names[k], dr.GetString(idx[k])));
                    }
                }
                else if (!(fastFloat
                    ? FastFloatStrict(dr.GetFieldSpan(idx[k]), out v)
                    : double.TryParse(dr.GetFieldSpan(idx[k]), Float, Inv, out v)))
                {
                    return buffers.ToResult(names, new ParseError(dr.RowNumber + 1, names[k], dr.GetString(idx[k])));
                }
                cols[k][r] = v;
            }
        }
        return buffers.ToResult(names, null);
    }
}

internal static class DataGen
{
    /// <summary>
    /// Writes header + rowCount rows of 20 round-trip ("R") invariant doubles; returns a hash of
    /// the bit patterns of each column so the readers' output can be verified exactly.
    /// </summary>
    public static ulong[] Write(string path, char sep, int rowCount, string[] names, int seed, BadCell? bad)
    {
        var rng = new Random(seed);
        ulong[] hashes = new ulong[names.Length];
        Array.Fill(hashes, Hash.Offset);
        int badColumn = bad is null ? -1 : Array.IndexOf(names, bad.Column);
        using var writer = new StreamWriter(path, append: false, new UTF8Encoding(false), bufferSize: 1 << 20);
        writer.Write(string.Join(sep, names));
        writer.Write('\n');
        Span<char> buf = stackalloc char[64];
        for (int r = 0; r < rowCount; r++)
        {
            int line = r + 2;
            for (int c = 0; c < names.Length; c++)
            {
                // Magnitudes 1e-3 .. 1e3 with full 15-17 significant digits, some negative.
                double scale = Math.Pow(10, rng.Next(-3, 4));
                double v = (rng.NextDouble() * 2 - 1) * scale;
                if (c > 0)
                {
                    writer.Write(sep);
                }
                if (bad is not null && line == bad.Line && c == badColumn)
                {
                    writer.Write(bad.Text);
                    continue;
                }
                if (!v.TryFormat(buf, out int written, "R", CultureInfo.InvariantCulture))
                {
                    throw new InvalidOperationException("format");
                }
                writer.Write(buf[..written]);
                hashes[c] = Hash.Add(hashes[c], v);
            }
            writer.Write('\n');
        }
        return hashes;
    }
}

internal static class Hash
{
    public const ulong Offset = 14695981039346656037UL;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static ulong Add(ulong h, double v) => (h ^ (ulong)BitConverter.DoubleToInt64Bits(v)) * 1099511628211UL;

    public static ulong Of(double[] values, int count)
    {
        ulong h = Offset;
        for (int i = 0; i < count; i++)
        {
            h = Add(h, values[i]);
        }
        return h;
    }
}

internal sealed class ResultRow
{
    public required string Format { get; init; }
    public required int Rows { get; init; }
    public required int Columns { get; init; }
    public required string Variant { get; init; }
    public required string Library { get; init; }
    public required double[] TimesMs { get; init; }
    public required double[] CpuMs { get; init; }
    public required long[] AllocBytes { get; init; }
    public required long BufferBytes { get; init; }
    public required bool Verified { get; init; }
    public long FileBytes { get; set; }
    public string Load { get; init; } = "";

    public double MedianMs => Stats.Median(TimesMs);
    public double MinMs => TimesMs.Min();
    public double MaxMs => TimesMs.Max();
    public long MedianAlloc => (long)Stats.Median(AllocBytes.Select(a => (double)a).ToArray());

    public string ToProgressLine() => string.Create(CultureInfo.InvariantCulture,
        $"  {Format} {Rows,9} rows {Columns,2} cols {Variant,-22} median {MedianMs,9:F1} ms  [{string.Join(' ', TimesMs.Select(t => t.ToString("F0", CultureInfo.InvariantCulture)))}]  alloc {MedianAlloc / 1e6:F1} MB  ok={Verified}  load {Program.LoadAverage()}");
}

internal static class Stats
{
    public static double Median(double[] xs)
    {
        var s = xs.OrderBy(x => x).ToArray();
        int n = s.Length;
        return n % 2 == 1 ? s[n / 2] : (s[(n / 2) - 1] + s[n / 2]) / 2;
    }
}

internal sealed class CaseBench(
    string path, char sep, string[] names, int[] nameIdx, int rowCount, ulong[] expectedHashes,
    IReadOnlyList<Variant> variants, BenchOptions options)
{
    private long? _scanChecksum;

    public List<ResultRow> Run()
    {
        string loadStart = Load1();
        int n = variants.Count;
        var times = new List<double>[n];
        var cpus = new List<double>[n];
        var allocs = new List<long>[n];
        var verified = new bool[n];
        var bufferBytes = new long[n];
        for (int v = 0; v < n; v++)
        {
            times[v] = [];
            cpus[v] = [];
            allocs[v] = [];
            verified[v] = true;
        }

        for (int w = 0; w < options.Warmup; w++)
        {
            for (int v = 0; v < n; v++)
            {
                Measure(v, out _, out _, out _, ref verified[v], ref bufferBytes[v]);
            }
        }
        for (int rep = 0; rep < options.Reps; rep++)
        {
            for (int j = 0; j < n; j++)
            {
                int v = (j + rep) % n; // rotate order so no variant always runs first/last
                Measure(v, out double ms, out double cpuMs, out long alloc, ref verified[v], ref bufferBytes[v]);
                times[v].Add(ms);
                cpus[v].Add(cpuMs);
                allocs[v].Add(alloc);
            }
        }

        string format = sep == ',' ? "CSV" : "TSV";
        string load = loadStart + "->" + Load1();
        return Enumerable.Range(0, n).Select(v => new ResultRow
        {
            Format = format,
            Rows = rowCount,
            Columns = names.Length,
            Variant = variants[v].Name,
            Library = variants[v].Library,
            TimesMs = [.. times[v]],
            CpuMs = [.. cpus[v]],
            AllocBytes = [.. allocs[v]],
            BufferBytes = bufferBytes[v],
            Verified = verified[v],
            Load = load,
        }).ToList();
    }

    private static TimeSpan CpuTime()
    {
        using var p = Process.GetCurrentProcess();
        return p.TotalProcessorTime;
    }

    private static string Load1() => Program.LoadAverage().Split(' ')[0];

    private void Measure(int v, out double ms, out double cpuMs, out long alloc, ref bool verified, ref long bufferBytes)
    {
        GC.Collect(2, GCCollectionMode.Forced, blocking: true, compacting: true);
        GC.WaitForPendingFinalizers();
        GC.Collect(2, GCCollectionMode.Forced, blocking: true, compacting: true);

        TimeSpan cpu0 = CpuTime();
        long a0 = GC.GetTotalAllocatedBytes(precise: true);
        long t0 = Stopwatch.GetTimestamp();
        ParseResult result = variants[v].Run(path, sep, names);
        long t1 = Stopwatch.GetTimestamp();
        long a1 = GC.GetTotalAllocatedBytes(precise: true);
        cpuMs = (CpuTime() - cpu0).TotalMilliseconds;

        ms = Stopwatch.GetElapsedTime(t0, t1).TotalMilliseconds;
        alloc = a1 - a0;
        bufferBytes = result.BufferBytes;
        verified &= Verify(result);
    }

    private bool Verify(ParseResult result)
    {
        if (result.Columns.Length == 0 && result.Error is null)
        {
            // scan-only: same row count and the same number of cell chars for every scanner
            _scanChecksum ??= result.Checksum;
            return result.RowCount == rowCount && result.Checksum == _scanChecksum;
        }
        if (result.Error is not null || result.RowCount != rowCount || result.Columns.Length != names.Length)
        {
            return false;
        }
        for (int k = 0; k < names.Length; k++)
        {
            if (result.Columns[k].Length != rowCount || Hash.Of(result.Columns[k], rowCount) != expectedHashes[nameIdx[k]])
            {
                return false;
            }
        }
        return true;
    }
}

internal static class Report
{
    public static void Print(List<ResultRow> rows)
    {
        Console.WriteLine("| format | rows | cols | variant | median ms | min..max ms | MB/s | Mcells/s | process CPU ms (median) | alloc MB (median) | lib overhead KB | verified |");
        Console.WriteLine("|---|---:|---:|---|---:|---:|---:|---:|---:|---:|---:|---|");
        foreach (var r in rows)
        {
            double mbps = r.FileBytes / 1e6 / (r.MedianMs / 1000);
            double mcells = (double)r.Rows * r.Columns / 1e6 / (r.MedianMs / 1000);
            double overheadKb = (r.MedianAlloc - r.BufferBytes) / 1024.0;
            Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"| {r.Format} | {r.Rows} | {r.Columns} | {r.Variant} | {r.MedianMs:F1} | {r.MinMs:F1}..{r.MaxMs:F1} | {mbps:F0} | {mcells:F1} | {Stats.Median(r.CpuMs):F0} | {r.MedianAlloc / 1e6:F1} | {overheadKb:F1} | {(r.Verified ? "yes" : "NO")} |"));
        }

        Console.WriteLine();
        Console.WriteLine("### Head-to-head (median ms; a ratio > 1 means Sylvan is slower than Sep)");
        Console.WriteLine("Ratios are medians of per-repetition ratios (both variants timed in the same round), which is robust to load drifting between rounds.");
        Console.WriteLine("| format | rows | cols | Sep TryParse | Sep TryParse Unescape | Sep span+csFastFloat | Sylvan span+BCL | Sylvan GetDouble | Sylvan span+csFastFloat | Sylvan GetDouble / Sep TryParse Unescape | same parser csFastFloat: Sylvan / Sep | same parser BCL: Sylvan / Sep | scan only: Sylvan / Sep | load 1-min start->end |");
        Console.WriteLine("|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---|");
        foreach (var g in rows.GroupBy(r => (r.Format, r.Rows, r.Columns)))
        {
            double T(string name) => g.First(r => r.Variant == name).MedianMs;
            double R(string a, string b)
            {
                double[] ta = g.First(r => r.Variant == a).TimesMs;
                double[] tb = g.First(r => r.Variant == b).TimesMs;
                return Stats.Median(ta.Zip(tb, (x, y) => x / y).ToArray());
            }
            Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"| {g.Key.Format} | {g.Key.Rows} | {g.Key.Columns} | {T("Sep TryParse"):F1} | {T("Sep TryParse Unescape"):F1} | {T("Sep span+csFastFloat"):F1} | {T("Sylvan span+BCL"):F1} | {T("Sylvan GetDouble"):F1} | {T("Sylvan span+csFastFloat"):F1} | {R("Sylvan GetDouble", "Sep TryParse Unescape"):F2} | {R("Sylvan span+csFastFloat", "Sep span+csFastFloat"):F2} | {R("Sylvan span+BCL", "Sep span+BCL"):F2} | {R("Sylvan scan only", "Sep scan only"):F2} | {g.First().Load} |"));
        }

        Console.WriteLine();
        Console.WriteLine("Variants:");
        foreach (var v in Variants.All.Concat(Variants.ScanOnly))
        {
            Console.WriteLine($"- {v.Name}: {v.Api}");
        }
        Console.WriteLine("alloc MB = GC.GetTotalAllocatedBytes(true) delta for one whole read, incl. the growing double[] buffers;");
        Console.WriteLine("process CPU ms = Process.TotalProcessorTime delta over the run (all threads, incl. GC and JIT); less sensitive than wall time to other load on the machine;");
        Console.WriteLine("lib overhead KB = that minus the bytes of the double[] buffers the harness allocated (same for all variants).");
    }
}

internal static class Probes
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static void CellSemantics()
    {
        // Raw CSV text of the cell (already quoted where the content needs it).
        string[] cells =
        [
            "-12.3456789012345", "1E5", "1e-7", "+1.5", ".5", "5.", "-0", "1e400", "NaN", "Infinity", "-inf",
            "n/a", "1.5x", "", " 1.5", "1.5 ", "\"1,5\"", "\"1.5\"", "0x10", "1_000",
        ];
        Console.WriteLine("| cell (raw CSV) | Sep TryParse | Sep TryParse Unescape | Sep span+BCL(Unescape) | Sep span+csFastFloat(Unescape) | Sylvan span+BCL | Sylvan GetDouble | Sylvan span+csFastFloat |");
        Console.WriteLine("|---|---|---|---|---|---|---|---|");
        foreach (string cell in cells)
        {
            string text = "a,b\n" + cell + ",0\n";
            Console.WriteLine($"| `{cell}` | {SepCell(text, false, SepParser.SepTryParse)} | {SepCell(text, true, SepParser.SepTryParse)} | {SepCell(text, true, SepParser.Bcl)} | {SepCell(text, true, SepParser.FastFloatStrict)} | {SylvanCell(text, false, false)} | {SylvanCell(text, true, false)} | {SylvanCell(text, false, true)} |");
        }
    }

    private static string SepCell(string text, bool unescape, SepParser parser, char sep = ',')
    {
        try
        {
            using var reader = Sep.Reader(o => o with { Sep = new Sep(sep), CultureInfo = Inv, Unescape = unescape }).FromText(text);
            foreach (var row in reader)
            {
                var col = row[0];
                double v;
                bool ok = parser switch
                {
                    SepParser.SepTryParse => col.TryParse(out v),
                    SepParser.Bcl => double.TryParse(col.Span, NumberStyles.Float, Inv, out v),
                    _ => Variants.FastFloatStrict(col.Span, out v),
                };
                return ok ? v.ToString("R", Inv) : "reject";
            }
            return "no row";
        }
        catch (Exception ex) when (ex is FormatException or InvalidDataException or ArgumentException)
        {
            return "throws " + ex.GetType().Name;
        }
    }

    private static string SylvanCell(string text, bool getDouble, bool fastFloat, char sep = ',')
    {
        try
        {
            using var dr = CsvDataReader.Create(new StringReader(text), new CsvDataReaderOptions { Delimiter = sep, Culture = Inv });
            while (dr.Read())
            {
                if (getDouble)
                {
                    return dr.GetDouble(0).ToString("R", Inv);
                }
                double v;
                bool ok = fastFloat
                    ? Variants.FastFloatStrict(dr.GetFieldSpan(0), out v)
                    : double.TryParse(dr.GetFieldSpan(0), NumberStyles.Float, Inv, out v);
                return ok ? v.ToString("R", Inv) : "reject";
            }
            return "no row";
        }
        catch (Exception ex) when (ex is FormatException or InvalidDataException or ArgumentException or CsvFormatException)
        {
            return "throws " + ex.GetType().Name;
        }
    }

    public static void TsvCellSemantics()
    {
        // In TSV a comma is not a separator, so "1,5" reaches the number parser unquoted.
        string[] cells = ["1,5", "1,000.5", "1,2,3", "1.5"];
        Console.WriteLine("| cell (raw TSV) | Sep TryParse | Sep span+BCL | Sep span+csFastFloat | Sylvan span+BCL | Sylvan GetDouble | Sylvan span+csFastFloat |");
        Console.WriteLine("|---|---|---|---|---|---|---|");
        foreach (string cell in cells)
        {
            string text = "a\tb\n" + cell + "\t0\n";
            Console.WriteLine($"| `{cell}` | {SepCell(text, false, SepParser.SepTryParse, '\t')} | {SepCell(text, false, SepParser.Bcl, '\t')} | {SepCell(text, false, SepParser.FastFloatStrict, '\t')} | {SylvanCell(text, false, false, '\t')} | {SylvanCell(text, true, false, '\t')} | {SylvanCell(text, false, true, '\t')} |");
        }
    }

    public static bool LineNumbersAndQuoting()
    {
        bool ok = true;
        // Line 1 header, line 2 a row, lines 3-4 one record with a quoted newline, line 5 has the bad cell.
        const string multiLine = "id,v\n1,0.5\n\"two\nlines\",1.5\n3,bad\n";
        Console.WriteLine("Text (bad cell 'bad' is on file line 5; lines 3-4 are one record with a quoted newline):");
        Console.WriteLine("    " + multiLine.Replace("\n", "\\n", StringComparison.Ordinal));
        foreach (bool unescape in new[] { false, true })
        {
            using var reader = Sep.Reader(o => o with { Sep = new Sep(','), CultureInfo = Inv, Unescape = unescape }).FromText(multiLine);
            int vIdx = reader.Header.IndexOf("v");
            foreach (var row in reader)
            {
                if (!row[vIdx].TryParse<double>(out _))
                {
                    Console.WriteLine(string.Create(Inv,
                        $"- Sep (Unescape={unescape}): bad cell at row.LineNumberFrom={row.LineNumberFrom}, LineNumberToExcl={row.LineNumberToExcl}, RowIndex={row.RowIndex}; id col = [{row[0].ToString().Replace("\n", "\\n", StringComparison.Ordinal)}] (previous row spanned lines 3-4)"));
                    ok &= row.LineNumberFrom == 5;
                }
            }
        }
        {
            using var dr = CsvDataReader.Create(new StringReader(multiLine), new CsvDataReaderOptions { Delimiter = ',', Culture = Inv });
            int vIdx = dr.GetOrdinal("v");
            var seen = new List<string>();
            while (dr.Read())
            {
                seen.Add(string.Create(Inv, $"{dr.GetString(0).Replace("\n", "\\n", StringComparison.Ordinal)}:RowNumber={dr.RowNumber}"));
                if (!double.TryParse(dr.GetFieldSpan(vIdx), NumberStyles.Float, Inv, out _))
                {
                    Console.WriteLine(string.Create(Inv,
                        $"- Sylvan: bad cell at dr.RowNumber={dr.RowNumber} -> RowNumber+1 = {dr.RowNumber + 1} (true line 5); rows seen: {string.Join(", ", seen)}"));
                }
            }
        }

        // Quoted header and quoted numeric cells.
        const string quoted = "\"id\",\"v\"\n\"1\",\"0.5\"\n";
        Console.WriteLine("Quoted header/cells text: " + quoted.Replace("\n", "\\n", StringComparison.Ordinal));
        foreach (bool unescape in new[] { false, true })
        {
            using var reader = Sep.Reader(o => o with { Sep = new Sep(','), CultureInfo = Inv, Unescape = unescape }).FromText(quoted);
            bool found = reader.Header.TryIndexOf("v", out int vIdx);
            string cell = "n/a";
            if (found)
            {
                foreach (var row in reader)
                {
                    cell = row[vIdx].TryParse(out double d) ? d.ToString("R", Inv) : "reject [" + row[vIdx].ToString() + "]";
                }
            }
            Console.WriteLine(string.Create(Inv,
                $"- Sep Unescape={unescape}: Header.TryIndexOf(\"v\")={found} (header names: {string.Join("|", reader.Header.ColNames)}), v parsed: {cell}"));
            if (unescape)
            {
                ok &= found && cell == "0.5";
            }
        }
        {
            using var dr = CsvDataReader.Create(new StringReader(quoted), new CsvDataReaderOptions { Delimiter = ',', Culture = Inv });
            int vIdx = dr.GetOrdinal("v");
            dr.Read();
            Console.WriteLine(string.Create(Inv, $"- Sylvan: GetOrdinal(\"v\")={vIdx}, GetFieldSpan -> [{dr.GetFieldSpan(vIdx).ToString()}], GetDouble={dr.GetDouble(vIdx)}"));
        }

        // TSV via Sep separator option and via Sep's auto-detection.
        const string tsv = "id\tv\n1\t0.5\n";
        using (var reader = Sep.Reader(o => o with { Sep = new Sep('\t') }).FromText(tsv))
        {
            Console.WriteLine($"- Sep TSV explicit (Sep = new Sep('\\t')): ColCount={reader.Header.ColNames.Count}, separator='{Escape(reader.Spec.Sep.Separator)}'");
        }
        using (var reader = Sep.Reader().FromText(tsv))
        {
            Console.WriteLine($"- Sep TSV auto-detect (Sep.Reader()): ColCount={reader.Header.ColNames.Count}, separator='{Escape(reader.Spec.Sep.Separator)}'");
        }
        return ok;
    }

    private static string Escape(char c) => c == '\t' ? "\\t" : c.ToString();
}
