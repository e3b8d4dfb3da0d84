using System.Globalization;
using FitSpec.Fuzz.Harness;
using FitSpec.Fuzz.Targets;

namespace FitSpec.Fuzz;

/// <summary>
/// Long fuzzing runs outside CI. 'run' generates N inputs per target from a seed and prints what became of
/// them; every distinct failure is shrunk and saved. 'replay' runs one saved input again.
/// </summary>
public static class Program
{
    private const string Usage = """
        usage:
          fitspec-fuzz run [--target spec|csv|expr|all] [--count N] [--seed S] [--threads T]
                           [--full-fit-fraction F] [--findings DIR] [--hang-seconds H] [--no-trace] [--repo DIR]
          fitspec-fuzz replay TARGET FILE [--variant V] [--full-fit] [--repo DIR]

        run: N inputs per target (default 100000), each generated from (S, its index) alone, so the same
        seed gives the same inputs on any number of threads. A fraction F of the inputs (default 0.002)
        also goes through a whole fit. Failures are shrunk and saved under DIR (default: a folder in the
        temporary folder); an input still running after H seconds (default 300) is saved as a hang and
        ends the run. Exit code: 0 no failures, 1 failures, 2 usage error.
        """;

    public static int Main(string[] args)
    {
        ArgumentNullException.ThrowIfNull(args);
        try
        {
            return args.FirstOrDefault() switch
            {
                "run" => RunCampaigns(new Arguments(args[1..])),
                "replay" when args.Length >= 3 => ReplayOne(args[1], args[2], new Arguments(args[3..])),
                _ => Fail(Usage),
            };
        }
        catch (ArgumentException e)
        {
            return Fail($"{e.Message}\n\n{Usage}");
        }
    }

    private static int RunCampaigns(Arguments arguments)
    {
        var corpus = Corpus.Load(arguments.Text("--repo"));
        var fraction = arguments.Number("--full-fit-fraction", 0.002);
        var names = arguments.Text("--target") is { } t and not "all" ? t.Split(',') : ["spec", "csv", "expr"];
        var findings = arguments.Text("--findings") ?? Path.Combine(Path.GetTempPath(), "fitspec-fuzz-findings");
        var options = new CampaignOptions
        {
            Count = (int)arguments.Number("--count", 100_000),
            Seed = (ulong)arguments.Number("--seed", 20_261_202),
            Threads = (int)arguments.Number("--threads", Environment.ProcessorCount),
            FindingsFolder = findings,
            HangLimit = TimeSpan.FromSeconds(arguments.Number("--hang-seconds", 300)),
            TraceInputs = !arguments.Flag("--no-trace"),
            Log = line => Console.Error.WriteLine(line),
        };
        Console.WriteLine($"seed {options.Seed}, {options.Count} inputs per target, full-fit fraction {fraction}, {options.Threads} threads");
        Console.WriteLine($"seeds: {corpus.Specs.Count} specs, {corpus.DemoData.Count} data files, {corpus.Expressions.Count} expressions; findings go to {findings}");
        var failures = 0L;
        foreach (var name in names)
        {
            var report = Campaign.Run(TargetNamed(name, corpus, fraction), corpus, options);
            Print(report);
            failures += report.Failures;
        }

        Console.WriteLine(failures == 0 ? "no failures" : $"{failures} failing inputs");
        return failures == 0 ? 0 : 1;
    }

    private static int ReplayOne(string target, string file, Arguments arguments)
    {
        var corpus = Corpus.Load(arguments.Text("--repo"));
        var input = new FuzzCase(File.ReadAllBytes(file), (int)arguments.Number("--variant", 0), arguments.Flag("--full-fit"));
        var result = Campaign.Replay(TargetNamed(target, corpus, 0), corpus, input);
        Console.WriteLine($"{target}: {input.Preview()}");
        Console.WriteLine($"took {result.Elapsed.TotalMilliseconds:0} ms, allocated {result.Allocated >> 10} KiB");
        if (result.Failure is { } failure)
        {
            Console.WriteLine($"FAILED ({failure.Kind}, {failure.Signature}): {failure.Message}");
            Console.WriteLine(failure.Detail);
            return 1;
        }

        Console.WriteLine($"ended with: {result.Outcome}");
        return 0;
    }

    private static IFuzzTarget TargetNamed(string name, Corpus corpus, double fraction) => name switch
    {
        "spec" => new SpecTarget(corpus, fraction),
        "csv" => new CsvTarget(corpus, fraction),
        "expr" => new ExpressionTarget(corpus, fraction),
        _ => throw new ArgumentException($"unknown target '{name}'; the targets are spec, csv and expr"),
    };

    private static void Print(CampaignReport report)
    {
        Console.WriteLine(report.Summary());
        foreach (var (label, count) in report.Tally)
        {
            Console.WriteLine($"  {label}: {count}");
        }

        foreach (var finding in report.Findings)
        {
            Console.WriteLine($"  FAILURE {finding.Kind} ({finding.Occurrences} inputs): {finding.Signature}");
            Console.WriteLine($"    {finding.Message.Split('\n')[0]}");
            Console.WriteLine($"    shrunk: {finding.Shrunk.Preview(200)}");
            Console.WriteLine($"    saved: {finding.SavedTo ?? "(not shrunk: too many distinct failures)"}");
        }
    }

    private static int Fail(string message)
    {
        Console.Error.WriteLine(message);
        return 2;
    }

    /// <summary>--name value options and --flag switches, nothing more.</summary>
    private sealed class Arguments
    {
        private readonly string[] _args;

        public Arguments(string[] args)
        {
            _args = args;
            for (var i = 0; i < args.Length; i++)
            {
                if (!args[i].StartsWith("--", StringComparison.Ordinal))
                {
                    throw new ArgumentException($"unexpected argument '{args[i]}'");
                }

                if (args[i] is not ("--no-trace" or "--full-fit"))
                {
                    i++;
                }
            }
        }

        public string? Text(string name)
        {
            var at = Array.IndexOf(_args, name);
            if (at < 0)
            {
                return null;
            }

            return at + 1 < _args.Length ? _args[at + 1] : throw new ArgumentException($"{name} needs a value");
        }

        public double Number(string name, double fallback)
        {
            if (Text(name) is not { } text)
            {
                return fallback;
            }

            return double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) && value >= 0
                ? value
                : throw new ArgumentException($"{name} needs a number, got '{text}'");
        }

        public bool Flag(string name) => _args.Contains(name);
    }
}
