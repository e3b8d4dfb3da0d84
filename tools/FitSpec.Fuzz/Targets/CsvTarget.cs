using System.Text;
using CsCheck;
using FitSpec.Data;
using FitSpec.Design;
using FitSpec.Diagnostics;
using FitSpec.Fuzz.Harness;
using FitSpec.Fuzz.Mutation;
using FitSpec.Spec;

namespace FitSpec.Fuzz.Targets;

/// <summary>
/// The CSV reader, through its entry point TableLoader.Load: mutated small CSV/TSV files read by a fixed
/// spec (which columns, missing: error or drop, with or without a filter and a weight). A table that comes
/// back must be consistent; a refusal must be a data error. A fraction also goes through a whole fit.
/// </summary>
public sealed class CsvTarget : IFuzzTarget
{
    private const int OptionCount = 8;
    private const string SpecFile = "csv.fit.yaml";

    private readonly List<CsvSeed> _seeds;
    private readonly byte[][] _specs;

    public CsvTarget(Corpus corpus, double fullFitFraction)
    {
        ArgumentNullException.ThrowIfNull(corpus);
        _seeds = Seeds(corpus);
        _specs = new byte[_seeds.Count * OptionCount][];
        for (var v = 0; v < _specs.Length; v++)
        {
            _specs[v] = SpecFor(_seeds[v / OptionCount], v % OptionCount);
        }

        var mutator = new Mutator(CsvMutations.Snippets, CsvMutations.Transforms, 4 << 20);
        var perTenThousand = (int)Math.Round(fullFitFraction * 10_000);
        Inputs = Gen.Select(
            Gen.Int[0, _seeds.Count - 1],
            Gen.Int[0, OptionCount - 1],
            EditGen.Edits(mutator.TransformCount, transformWeight: 5, maxEdits: 5),
            Gen.Int[0, 9_999],
            (seed, options, edits, roll) => new FuzzCase(mutator.Apply(_seeds[seed].Bytes, edits), (seed * OptionCount) + options, roll < perTenThousand));
    }

    public string Name => "csv";

    public string FileExtension => ".csv";

    public Gen<FuzzCase> Inputs { get; }

    public long MemoryBudget => 1L << 30;

    public TimeSpan TimeBudget(FuzzCase input) => TimeSpan.FromSeconds(input?.Pipeline == true ? 60 : 5);

    /// <summary>The spec that reads variant <paramref name="variant"/>'s data file (for tests and replays).</summary>
    public string SpecText(int variant) => Encoding.UTF8.GetString(_specs[variant % _specs.Length]);

    public Outcome Run(FuzzCase input, Workspace workspace, Tally tally)
    {
        ArgumentNullException.ThrowIfNull(input);
        ArgumentNullException.ThrowIfNull(workspace);
        ArgumentNullException.ThrowIfNull(tally);
        var variant = input.Variant % _specs.Length;
        var seed = _seeds[variant / OptionCount];
        workspace.Write(seed.Tsv ? "d.tsv" : "d.csv", input.Data);
        var specPath = workspace.PathOf(SpecFile);
        var read = SpecReader.Parse(specPath, _specs[variant]);
        var spec = read.Document ?? throw new InvalidOperationException($"harness: the CSV spec of variant {variant} does not read: {string.Join("; ", read.Errors)}");
        var model = ModelCompiler.Compile(spec);
        Outcome outcome;
        try
        {
            var table = TableLoader.Load(spec, new DataRequest(model.ColumnsToRead, model.Filter?.Root));
            CheckTable(table);
            tally.Add("table read");
            outcome = Outcome.Result;
        }
        catch (FitSpecException e)
        {
            Checks.DataErrors(e.Diagnostics, "TableLoader.Load");
            tally.Add("data refused");
            outcome = Outcome.CleanError;
        }

        if (!input.Pipeline)
        {
            return outcome;
        }

        workspace.Write(SpecFile, _specs[variant]);
        return Checks.FullFit(specPath, tally);
    }

    private static void CheckTable(Table table)
    {
        var n = table.RowCount;
        if (table.Lines.Length != n || table.Columns.Values.Any(c => c.Length != n))
        {
            throw new ContractViolation($"ragged table: {n} rows but columns of lengths {string.Join(", ", table.Columns.Values.Select(c => c.Length))}");
        }

        if (table.Columns.Values.Any(c => c.Any(v => !double.IsFinite(v))))
        {
            throw new ContractViolation("non-finite value: a table holds NaN or an infinity");
        }

        for (var i = 0; i < n; i++)
        {
            if (table.Lines[i] < 2 || (i > 0 && table.Lines[i] <= table.Lines[i - 1]))
            {
                throw new ContractViolation($"bad line numbers: row {i} is said to be on line {table.Lines[i]}");
            }
        }

        if (table.RowsRead != n + table.DroppedMissing + table.DroppedFilter)
        {
            throw new ContractViolation($"rows do not add up: read {table.RowsRead}, used {n}, dropped {table.DroppedMissing} + {table.DroppedFilter}");
        }
    }

    private static byte[] SpecFor(CsvSeed seed, int options)
    {
        var drop = (options & 1) != 0;
        var filter = (options & 2) != 0;
        var weight = (options & 4) != 0;
        var builder = new StringBuilder()
            .Append("fitspec: 1\nname: csv-fuzz\ndata:\n")
            .Append($"  path: {(seed.Tsv ? "d.tsv" : "d.csv")}\n")
            .Append($"  missing: {(drop ? "drop" : "error")}\n");
        if (filter)
        {
            builder.Append($"  filter: \"`{seed.Input}` > -1e300\"\n");
        }

        if (weight)
        {
            builder.Append(seed.Weight is { } w ? $"  weight: \"abs(`{w}`) + 1\"\n" : "  weight: \"2\"\n");
        }

        builder.Append($"model:\n  response: \"`{seed.Response}`\"\n  terms:\n    b0: 1\n    b1: \"`{seed.Input}`\"\n");
        return Encoding.UTF8.GetBytes(builder.ToString());
    }

    // Small tables of our own, then the demo data cut to a dozen lines; the spec reads each file's first
    // column as the input, its second as the response and its third (if any) as a weight.
    private static List<CsvSeed> Seeds(Corpus corpus)
    {
        var seeds = new List<CsvSeed>
        {
            Make("x,y\n1,2\n2,4.1\n3,5.9\n4,8.2\n", tsv: false),
            Make("x,y,w\n0,1,1\n1,3,0.5\n2,5,2\n3,7.5,1\n4,9,1\n", tsv: false),
            Make("\"x\",\"y\"\n\"1\",\"2\"\n\"2\",\"3.5\"\n\"3\",\"6\"\n", tsv: false),
            Make("x\ty\n-1\t0.5\n0\t1\n1\t1.5\n2\t2.25\n", tsv: true),
            Make("x,y\n1e-3,1e3\n-2.5E+2,3.25e-1\n.5,5.\n", tsv: false),
        };
        foreach (var data in corpus.DemoData)
        {
            var lines = Encoding.UTF8.GetString(data.Bytes).Split('\n').Take(12);
            seeds.Add(Make(string.Join('\n', lines) + "\n", data.Name.EndsWith(".tsv", StringComparison.Ordinal)));
        }

        return seeds;
    }

    private static CsvSeed Make(string text, bool tsv)
    {
        var header = text[..text.IndexOf('\n', StringComparison.Ordinal)].Split(tsv ? '\t' : ',').Select(h => h.Trim('"')).ToArray();
        return new CsvSeed(Encoding.UTF8.GetBytes(text), tsv, header[0], header[1], header.Length > 2 ? header[2] : null);
    }

    private sealed record CsvSeed(byte[] Bytes, bool Tsv, string Input, string Response, string? Weight);
}
