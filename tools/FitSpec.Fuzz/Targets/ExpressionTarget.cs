using System.Text;
using CsCheck;
using FitSpec.Design;
using FitSpec.Diagnostics;
using FitSpec.Expressions;
using FitSpec.Fuzz.Harness;
using FitSpec.Fuzz.Mutation;
using FitSpec.Spec;

namespace FitSpec.Fuzz.Targets;

/// <summary>
/// The expression language: ExpressionParser.Parse in the input's context; every tree it accepts is evaluated
/// column-wise, row by row and as a jet (which must agree), relations go through the linearizer, and the text
/// is also compiled inside a spec (ModelCompiler, which maps errors back to spec lines). A fraction of inputs
/// runs a whole fit with the expression as a term, a filter or a constraint.
/// </summary>
public sealed class ExpressionTarget : IFuzzTarget
{
    private const int Contexts = 3;
    private const int ColumnSets = 4;
    private const string SpecFile = "expr.fit.yaml";

    private static readonly double[][] ColumnValues =
    [
        [1, 2, 3, 4, 5, 6],
        [0, -0.0, 1, -1, 0.5, -2.5],
        [1e308, -1e308, 1e-308, 5e-324, 3, -7],
        [2, 2, 2, 2, 2, 2],
    ];

    private static readonly byte[] Data = Encoding.UTF8.GetBytes(
        "x,y,z,w,temp (C),a b\n1,2.1,0,1,20,1\n2,3.9,1,1,21,2\n3,6.2,0,2,22,3\n4,8.1,1,1,23,4\n5,9.8,0,1,24,5\n6,12.2,1,2,25,6\n");

    public ExpressionTarget(Corpus corpus, double fullFitFraction)
    {
        ArgumentNullException.ThrowIfNull(corpus);
        var seeds = corpus.Expressions.Count > 0 ? corpus.Expressions : ["x"];
        var mutator = new Mutator(ExpressionGen.Snippets, [], 1 << 20);
        var mutated = Gen.Select(Gen.Int[0, seeds.Count - 1], EditGen.Edits(0, 0, 4), (s, edits) => Encoding.UTF8.GetString(mutator.Apply(Encoding.UTF8.GetBytes(seeds[s]), edits)));
        var clean = ExpressionGen.Tree(5, noisy: false);
        var noisy = ExpressionGen.Tree(5, noisy: true);
        Gen<string> Text(ExpressionContext context) => Gen.Frequency(
            (5, context switch
            {
                ExpressionContext.Filter => ExpressionGen.Condition(clean),
                ExpressionContext.Relation => ExpressionGen.Relation(),
                _ => clean,
            }),
            (2, context == ExpressionContext.Filter ? ExpressionGen.Condition(noisy) : noisy),
            (2, mutated),
            (1, ExpressionGen.Deep()),
            (1, ExpressionGen.EdgeArithmetic()));
        var byContext = Enumerable.Range(0, Contexts).Select(c => Text((ExpressionContext)c)).ToArray();
        var perTenThousand = (int)Math.Round(fullFitFraction * 10_000);
        Inputs = Gen.Int[0, (Contexts * ColumnSets) - 1].SelectMany(variant => Gen.Select(
            byContext[variant % Contexts],
            Gen.Int[0, 9_999],
            (t, roll) => new FuzzCase(Encoding.UTF8.GetBytes(t), variant, roll < perTenThousand)));
    }

    public string Name => "expr";

    public string FileExtension => ".txt";

    public Gen<FuzzCase> Inputs { get; }

    public long MemoryBudget => 512L << 20;

    public TimeSpan TimeBudget(FuzzCase input) => TimeSpan.FromSeconds(input?.Pipeline == true ? 60 : 3);

    public Outcome Run(FuzzCase input, Workspace workspace, Tally tally)
    {
        ArgumentNullException.ThrowIfNull(input);
        ArgumentNullException.ThrowIfNull(workspace);
        ArgumentNullException.ThrowIfNull(tally);
        var text = input.Text;
        var context = (ExpressionContext)(input.Variant % Contexts);
        var columns = ColumnValues[input.Variant / Contexts % ColumnSets];
        var parsed = ExpressionParser.Parse(text, context);
        CheckParsed(text, parsed);
        if (parsed.Root is { } root)
        {
            Evaluate(root, columns);
            _ = root.ToString();
        }

        if (context == ExpressionContext.Relation)
        {
            var (relation, errors) = Linearizer.Linearize(text);
            if ((relation is null) == (errors.Count == 0))
            {
                throw new ContractViolation($"linearizer answer: relation {(relation is null ? "null" : "given")} with {errors.Count} errors");
            }

            foreach (var error in errors)
            {
                Inside(text, error);
            }

            tally.Add(relation is null ? "relation refused" : "relation linear");
        }

        var spec = SpecAround(text, context);
        var compiled = CompileInSpec(workspace.PathOf(SpecFile), spec);
        tally.Add(parsed.Ok ? $"{context} parsed" : $"{context} refused");
        if (!input.Pipeline)
        {
            return parsed.Ok && compiled ? Outcome.Result : Outcome.CleanError;
        }

        workspace.Write("data.csv", Data);
        workspace.Write(SpecFile, spec);
        return Checks.FullFit(workspace.PathOf(SpecFile), tally);
    }

    private static void CheckParsed(string text, ParsedExpression parsed)
    {
        if (parsed.Ok != (parsed.Errors.Count == 0) || (parsed.Root is not null) != parsed.Ok)
        {
            throw new ContractViolation($"parse answer: Ok {parsed.Ok}, root {(parsed.Root is null ? "null" : "given")}, {parsed.Errors.Count} errors");
        }

        foreach (var error in parsed.Errors)
        {
            Inside(text, error);
            if (string.IsNullOrWhiteSpace(error.Message))
            {
                throw new ContractViolation("empty message: an expression error says nothing");
            }
        }

        if (parsed.Root is { } root && (root.Start < 0 || root.Length < 0 || root.Start + root.Length > text.Length))
        {
            throw new ContractViolation($"tree outside text: root spans {root.Start}+{root.Length} of {text.Length}");
        }
    }

    private static void Inside(string text, ExprError error)
    {
        if (error.Offset < 0 || error.Length < 0 || error.Offset + error.Length > text.Length)
        {
            throw new ContractViolation($"error outside text: '{error.Message}' at {error.Offset}+{error.Length} of {text.Length}");
        }
    }

    // The three evaluators share one arithmetic (Ops), so they must agree value for value.
    private static void Evaluate(Expr root, double[] values)
    {
        var rows = values.Length;
        // Half the names get the values in another order, so that different columns differ.
        double[] rotated = [.. values.Skip(1), values[0]];
        double[] Column(string name) => StableHash(name) % 2 == 0 ? values : rotated;
        var columnWise = ExpressionEvaluator.Evaluate(root, Column, rows);
        if (columnWise.Length != rows)
        {
            throw new ContractViolation($"wrong length: column-wise evaluation gave {columnWise.Length} values for {rows} rows");
        }

        for (var r = 0; r < rows; r++)
        {
            var row = r;
            var scalar = ExpressionEvaluator.EvaluateScalar(root, name => Column(name)[row]);
            if (!Same(scalar, columnWise[r]))
            {
                throw new ContractViolation($"evaluators disagree: row {r}: column-wise {columnWise[r]:R}, scalar {scalar:R} for {root}");
            }

            var jet = ExpressionEvaluator.EvaluateJet(root, name => Jet.Constant(Column(name)[row]));
            if (!Same(scalar, jet.Value))
            {
                throw new ContractViolation($"evaluators disagree: row {r}: jet {jet.Value:R}, scalar {scalar:R} for {root}");
            }
        }
    }

    private static bool Same(double a, double b) => a == b || (double.IsNaN(a) && double.IsNaN(b));

    private static uint StableHash(string name)
    {
        uint hash = 2166136261;
        foreach (var c in name)
        {
            hash = (hash ^ c) * 16777619;
        }

        return hash;
    }

    /// <summary>A spec that uses the text where its context belongs: a term, the filter, or a constraint.</summary>
    public static byte[] SpecAround(string expression, ExpressionContext context)
    {
        var quoted = YamlQuote(expression);
        var builder = new StringBuilder("fitspec: 1\nname: expr-fuzz\ndata:\n  path: data.csv\n");
        if (context == ExpressionContext.Filter)
        {
            builder.Append($"  filter: {quoted}\n");
        }

        builder.Append("model:\n  response: y\n  terms:\n    b0: 1\n");
        builder.Append(context == ExpressionContext.Value ? $"    b1: {quoted}\n" : "    b1: x\n");
        if (context == ExpressionContext.Relation)
        {
            builder.Append($"constraints:\n  - {quoted}\n");
        }

        return Encoding.UTF8.GetBytes(builder.ToString());
    }

    // A YAML double-quoted scalar holding exactly the text (escapes for quotes, backslashes and control characters).
    private static string YamlQuote(string text)
    {
        var builder = new StringBuilder("\"");
        foreach (var c in text)
        {
            builder.Append(c switch
            {
                '"' => "\\\"",
                '\\' => "\\\\",
                _ when char.IsControl(c) || char.IsSurrogate(c) || c is '\u2028' or '\u2029' or '\u0085' or '\uFEFF' => $"\\u{(int)c:X4}",
                _ => c.ToString(),
            });
        }

        return builder.Append('"').ToString();
    }

    private static bool CompileInSpec(string path, byte[] spec)
    {
        var read = SpecReader.Parse(path, spec);
        Checks.SpecErrors(read.Errors, "SpecReader.Parse (expression in a spec)");
        if (read.Document is not { } document)
        {
            return false;
        }

        try
        {
            ModelCompiler.Compile(document);
            return true;
        }
        catch (FitSpecException e)
        {
            Checks.SpecErrors(e.Diagnostics, "ModelCompiler.Compile (expression in a spec)");
            return false;
        }
    }
}
