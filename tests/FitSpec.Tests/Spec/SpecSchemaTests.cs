using System.Text;
using System.Text.Json;
using FitSpec.Spec;
using FitSpec.Spec.Schema;
using FitSpec.Tests.Cli;
using Json.Schema;

namespace FitSpec.Tests.Spec;

/// <summary>
/// The committed JSON Schema is the generator's output, every spec form the project documents or ships
/// validates against it, and it rejects what the reader rejects.
/// </summary>
public sealed class SpecSchemaTests
{
    private const string Minimal = """
        fitspec: 1
        data:
          path: d.csv
        model:
          response: y
          terms:
            b0: 1
            b1: x

        """;

    [Fact]
    public void Committed_schema_is_the_generators_output_byte_for_byte()
    {
        var path = SchemaCheck.CommittedSchemaPath;
        Assert.True(File.Exists(path), $"{path} is missing; create it with: fitspec schema > schema/fitspec.schema.json");
        var committed = File.ReadAllBytes(path);
        var generated = new UTF8Encoding(false).GetBytes(SchemaGenerator.Generate());
        Assert.True(
            committed.AsSpan().SequenceEqual(generated),
            "schema/fitspec.schema.json differs from the spec grammar; regenerate it from the repository root with: "
            + "fitspec schema > schema/fitspec.schema.json (or dotnet run --project src/FitSpec.Cli -- schema --out schema/fitspec.schema.json)");
    }

    [Fact]
    public void Generated_schema_is_a_valid_draft_2020_12_schema()
    {
        using var doc = JsonDocument.Parse(SchemaGenerator.Generate());
        Assert.Equal(SchemaGenerator.Draft, doc.RootElement.GetProperty("$schema").GetString());
        var meta = MetaSchemas.Draft202012.Evaluate(doc.RootElement, new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.True(meta.IsValid, "the generated schema does not validate against the draft 2020-12 meta-schema");
    }

    [Fact]
    public void Generation_is_deterministic_and_ends_in_one_newline()
    {
        var a = SchemaGenerator.Generate();
        Assert.Equal(a, SchemaGenerator.Generate());
        Assert.EndsWith("}\n", a, StringComparison.Ordinal);
        Assert.DoesNotContain('\r', a);
    }

    public static TheoryData<string> DemoSpecs()
    {
        var data = new TheoryData<string>();
        foreach (var file in Directory.GetFiles(Path.Combine(CliHarness.RepositoryRoot(), "specs"), "*.fit.yaml").Order(StringComparer.Ordinal))
        {
            data.Add(Path.GetFileName(file));
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(DemoSpecs))]
    public void Every_demo_spec_validates(string file)
    {
        var path = Path.Combine(CliHarness.RepositoryRoot(), "specs", file);
        Assert.Empty(SpecReader.Read(path).Errors);
        Assert.Empty(SchemaCheck.Errors(File.ReadAllText(path)));
    }

    [Fact]
    public void There_are_demo_specs_to_validate() => Assert.True(DemoSpecs().Count >= 5);

    [Fact]
    public void Every_example_in_the_language_contract_validates()
    {
        var blocks = SchemaCheck.YamlBlocks(File.ReadAllText(SchemaCheck.SpecContractPath()));
        Assert.NotEmpty(blocks);
        foreach (var yaml in blocks)
        {
            Assert.Empty(Parse(yaml).Errors);
            AssertValid(yaml, "an example in SPEC.md");
        }
    }

    [Fact]
    public void The_readme_example_validates()
    {
        var blocks = SchemaCheck.YamlBlocks(File.ReadAllText(Path.Combine(CliHarness.RepositoryRoot(), "README.md")));
        Assert.NotEmpty(blocks);
        foreach (var yaml in blocks)
        {
            AssertValid(yaml, "a YAML example in README.md");
        }
    }

    // Forms the reader accepts beyond the contract's big example: each must validate too.
    [Theory]
    [InlineData("loss: l1\n")]
    [InlineData("loss: minimax\n")]
    [InlineData("loss: none\n")]
    [InlineData("loss: {kind: quantile, tau: 0.9}\n")]
    [InlineData("loss: {kind: deadzone, width: 0}\n")]
    [InlineData("loss: {kind: log-barrier, limit: 0.02}\n")]
    [InlineData("loss: {kind: lp, p: 1.5}\n")]
    [InlineData("loss: {kind: truncated-l2, cap: 2}\n")]
    [InlineData("loss: {kind: linf}\n")]
    [InlineData("report: {formats: html}\n")]
    [InlineData("report: {formats: [markdown, json], accept: \"r2 >= 0.9\", templates: tpl}\n")]
    [InlineData("report: {uncertainty: {bootstrap: 500, seed: 7}}\n")]
    [InlineData("report: {uncertainty: {bootstrap: 10, seed: 0, level: 0.9}}\n")]
    [InlineData("solve: {method: ipm, time-limit: 0.5, formulation: dual}\n")]
    [InlineData("penalties:\n  - {kind: smoothness, weight: 1, norm: l1, order: 1, on: b1}\n  - {kind: count, max: 1}\n")]
    [InlineData("constraints:\n  - {kind: bounds, max: 3}\n  - {kind: value, at: {x: 1}, min: 0, max: 2}\n  - {kind: concave, in: x, over: [0, 1], grid: 11}\n  - {kind: residuals, max-abs: 0}\n")]
    [InlineData("name: a.b_c-1\ntitle: 2024\n")]
    public void Reader_forms_validate(string extra)
    {
        var yaml = Minimal + extra;
        Assert.Empty(Parse(yaml).Errors);
        Assert.Empty(SchemaCheck.Errors(yaml));
    }

    [Theory]
    [InlineData("fitspec: 1\ndata:\n  sqlite: lab.db\n  query: SELECT x, y FROM t\nmodel:\n  response: y\n  terms: {b0: 1}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.TSV, missing: drop, weight: 2}\nmodel:\n  response: y\n  terms:\n    s: {spline: x, at: [0, 1, 2], degree: 2}\n    p: {polynomial: x, degree: 30}\n    c: {columns: \"c*\"}\n")]
    public void Other_data_and_term_forms_validate(string yaml)
    {
        Assert.Empty(Parse(yaml).Errors);
        Assert.Empty(SchemaCheck.Errors(yaml));
    }

    // Each of these is refused by the reader; the schema must refuse it as well.
    [Theory]
    [InlineData("constraint:\n  - \"b1 >= 0\"\n")]
    [InlineData("solve: {method: fastest}\n")]
    [InlineData("solve: {formulation: both}\n")]
    [InlineData("solve: {time-limit: 0}\n")]
    [InlineData("solve: {methods: qr}\n")]
    [InlineData("loss: huber\n")]
    [InlineData("loss: l3\n")]
    [InlineData("loss: {kind: huber}\n")]
    [InlineData("loss: {kind: huber, width: 0}\n")]
    [InlineData("loss: {kind: quantile, tau: 1}\n")]
    [InlineData("loss: {kind: l1, width: 1}\n")]
    [InlineData("loss: {width: 1}\n")]
    [InlineData("penalties:\n  - {kind: count, max: 2, weight: 1}\n")]
    [InlineData("penalties:\n  - {kind: l1}\n")]
    [InlineData("penalties:\n  - {kind: l2, weight: -1}\n")]
    [InlineData("penalties:\n  - {kind: ridge, weight: 1}\n")]
    [InlineData("penalties:\n  - {kind: smoothness, weight: 1, norm: l3}\n")]
    [InlineData("penalties:\n  - {kind: smoothness, weight: 1, order: 11}\n")]
    [InlineData("penalties:\n  - {kind: count}\n")]
    [InlineData("penalties:\n  - {weight: 1}\n")]
    [InlineData("constraints:\n  - {kind: bounds, on: [b1]}\n")]
    [InlineData("constraints:\n  - {kind: value, at: {x: 0}, equals: 0, min: 1}\n")]
    [InlineData("constraints:\n  - {kind: value, equals: 0}\n")]
    [InlineData("constraints:\n  - {kind: residuals, max-abs: -1}\n")]
    [InlineData("constraints:\n  - {kind: increasing, in: x, over: [0, 1], grid: 1}\n")]
    [InlineData("constraints:\n  - {kind: increasing, in: x, over: [0]}\n")]
    [InlineData("constraints:\n  - {kind: increasing, over: [0, 1]}\n")]
    [InlineData("constraints:\n  - {kind: monotone, in: x, over: [0, 1]}\n")]
    [InlineData("constraints:\n  - {kind: bounds, min: 0, in: x}\n")]
    [InlineData("report: {formats: [pdf]}\n")]
    [InlineData("report: {uncertainty: {bootstrap: 500}}\n")]
    [InlineData("report: {uncertainty: {seed: 1}}\n")]
    [InlineData("report: {uncertainty: {bootstrap: 5, seed: 1}}\n")]
    [InlineData("report: {uncertainty: {bootstrap: 500, seed: -1}}\n")]
    [InlineData("report: {uncertainty: {bootstrap: 500, seed: 2147483648}}\n")]
    [InlineData("report: {uncertainty: {bootstrap: 500, seed: 1, level: 1}}\n")]
    [InlineData("report: {uncertainty: {bootstrap: 500, seed: 1, levels: 0.9}}\n")]
    [InlineData("report: {uncertainty: 500}\n")]
    [InlineData("name: Upper Case\n")]
    public void Invalid_forms_fail_both_reader_and_schema(string extra)
    {
        var yaml = Minimal + extra;
        Assert.NotEmpty(Parse(yaml).Errors);
        Assert.NotEmpty(SchemaCheck.Errors(yaml));
    }

    [Theory]
    [InlineData("fitspec: 2\ndata: {path: d.csv}\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("data: {path: d.csv}\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {1b: x}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.txt}\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv, sqlite: lab.db, query: q}\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\ndata: {sqlite: lab.db}\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv, query: q}\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\ndata: {filter: x > 0}\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv, missing: skip}\nmodel: {response: y, terms: {b0: 1}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {p: {polynomial: x}}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {p: {polynomial: x, degree: 0}}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {s: {spline: x}}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {s: {spline: x, knots: 1}}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {s: {spline: x, knots: 4, degree: 11}}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {s: {spline: x, knots: 4, order: 3}}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {s: {polynomial: x, spline: x, degree: 2}}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {s: {knots: 4}}}\n")]
    [InlineData("fitspec: 1\ndata: {path: d.csv}\nmodel: {response: y, terms: {s: [x]}}\n")]
    public void Invalid_documents_fail_both_reader_and_schema(string yaml)
    {
        Assert.NotEmpty(Parse(yaml).Errors);
        Assert.NotEmpty(SchemaCheck.Errors(yaml));
    }

    [Fact]
    public void Unknown_key_is_reported_where_it_is()
    {
        var errors = SchemaCheck.Errors(Minimal + "report: {formats: [html], acept: [\"r2 >= 0.9\"]}\n");
        Assert.Contains(errors, e => e.StartsWith("/report", StringComparison.Ordinal));
    }

    [Fact]
    public void Schema_keeps_the_grammars_descriptions_and_words()
    {
        using var doc = JsonDocument.Parse(SchemaGenerator.Generate());
        var solve = doc.RootElement.GetProperty("properties").GetProperty("solve");
        Assert.False(solve.GetProperty("additionalProperties").GetBoolean());
        var method = solve.GetProperty("properties").GetProperty("method");
        Assert.Equal(SpecGrammar.Solve["method"].Description, method.GetProperty("description").GetString());
        Assert.Equal(["auto", "qr", "simplex", "ipm"], method.GetProperty("enum").EnumerateArray().Select(e => e.GetString()));
    }

    private static void AssertValid(string yaml, string what)
    {
        var errors = SchemaCheck.Errors(yaml);
        Assert.True(errors.Count == 0, $"{what} fails the schema:\n{yaml}\n{string.Join("\n", errors)}");
    }

    private static SpecReadResult Parse(string yaml) => SpecReader.Parse("demo.fit.yaml", Encoding.UTF8.GetBytes(yaml));
}
