using CsCheck;
using FitSpec.Design;
using FitSpec.Diagnostics;
using FitSpec.Fuzz.Harness;
using FitSpec.Fuzz.Mutation;
using FitSpec.Spec;

namespace FitSpec.Fuzz.Targets;

/// <summary>
/// The spec reader: SpecReader.Parse on mutations of the demo specs and SPEC.md's examples, then the
/// expression compiler on every spec that reads; a fraction of inputs also go through a whole fit
/// (FitRunner.Run), from a spec file in the worker's folder beside a copy of the demo data.
/// </summary>
public sealed class SpecTarget : IFuzzTarget
{
    private const string SpecFile = "fuzz.fit.yaml";

    private readonly IReadOnlyList<NamedBytes> _seeds;

    public SpecTarget(Corpus corpus, double fullFitFraction)
    {
        ArgumentNullException.ThrowIfNull(corpus);
        _seeds = corpus.Specs;
        var mutator = new Mutator(YamlMutations.Snippets, YamlMutations.Transforms, SpecReader.MaxSpecBytes);
        var perTenThousand = (int)Math.Round(fullFitFraction * 10_000);
        var mutatedSeeds = Gen.Select(
            Gen.Int[0, _seeds.Count - 1],
            EditGen.Edits(mutator.TransformCount, transformWeight: 3, maxEdits: 6),
            Gen.Int[0, 9_999],
            (seed, edits, roll) => new FuzzCase(mutator.Apply(_seeds[seed].Bytes, edits), seed, roll < perTenThousand));

        // Composed specs mostly read, so they carry the full fits deeper; a light mutation or two keeps them honest.
        var composed = Gen.Select(
            new SpecComposer(corpus.DemoData).Specs,
            EditGen.Edits(mutator.TransformCount, transformWeight: 2, maxEdits: 2),
            Gen.Int[0, 9_999],
            (text, edits, roll) => new FuzzCase(mutator.Apply(System.Text.Encoding.UTF8.GetBytes(text), edits), ComposedVariant, roll < perTenThousand));
        Inputs = Gen.Frequency((3, mutatedSeeds), (2, composed));
    }

    /// <summary>The variant of a composed spec (variants below it name the seed a mutated spec came from).</summary>
    public const int ComposedVariant = 1000;

    public string Name => "spec";

    public string FileExtension => ".fit.yaml";

    public Gen<FuzzCase> Inputs { get; }

    public long MemoryBudget => 512L << 20;

    public TimeSpan TimeBudget(FuzzCase input) => TimeSpan.FromSeconds(input?.Pipeline == true ? 60 : 3);

    public Outcome Run(FuzzCase input, Workspace workspace, Tally tally)
    {
        ArgumentNullException.ThrowIfNull(input);
        ArgumentNullException.ThrowIfNull(workspace);
        var path = workspace.PathOf(SpecFile);
        var outcome = Read(path, input.Data, tally);
        if (!input.Pipeline)
        {
            return outcome;
        }

        workspace.Write(SpecFile, input.Data);
        return Checks.FullFit(path, tally);
    }

    /// <summary>Parse, then compile the expressions of a spec that reads: a document or located errors.</summary>
    public static Outcome Read(string path, byte[] bytes, Tally tally)
    {
        ArgumentNullException.ThrowIfNull(tally);
        var read = SpecReader.Parse(path, bytes);
        if (read.Document is null && read.Errors.Count == 0)
        {
            throw new ContractViolation("silent refusal: SpecReader.Parse gave neither a document nor an error");
        }

        if (read.Document is not null && read.Errors.Count > 0)
        {
            throw new ContractViolation("document with errors: SpecReader.Parse gave a document and errors");
        }

        Checks.SpecErrors(read.Errors, "SpecReader.Parse");
        if (read.Document is not { } document)
        {
            tally.Add("spec refused");
            return Outcome.CleanError;
        }

        try
        {
            ModelCompiler.Compile(document);
        }
        catch (FitSpecException e)
        {
            Checks.SpecErrors(e.Diagnostics, "ModelCompiler.Compile");
            tally.Add("spec read, expressions refused");
            return Outcome.CleanError;
        }

        tally.Add("spec read and compiled");
        return Outcome.Result;
    }
}
