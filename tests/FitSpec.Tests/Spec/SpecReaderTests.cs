using System.Text;
using FitSpec.Spec;

namespace FitSpec.Tests.Spec;

public sealed class SpecReaderTests
{
    private static SpecReadResult Parse(string yaml, string file = "demo.fit.yaml") =>
        SpecReader.Parse(file, Encoding.UTF8.GetBytes(yaml));

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
    public void Minimal_spec_gets_defaults()
    {
        var r = Parse(Minimal);
        Assert.Empty(r.Errors);
        var doc = r.Document!;
        Assert.Equal("demo", doc.Name);
        Assert.Equal(LossKind.L2, doc.Loss.Kind);
        Assert.Equal([ReportFormat.Html, ReportFormat.Md, ReportFormat.Json], doc.Report.Formats);
        Assert.Equal(2, doc.Model.Terms.Count);
    }

    [Fact]
    public void Every_form_of_the_language_parses()
    {
        var yaml = """
            fitspec: 1
            name: lc7-calibration
            title: Load cell
            description: free text
            data:
              path: data/lc7.csv
              filter: "load_kg >= 0"
              weight: inv_var
              missing: drop
            model:
              response: reading_mv
              terms:
                b0: 1
                b1: load_kg
                b2: load_kg^2
                t:  {polynomial: temp_c, degree: 3}
                s:  {spline: temp_c, knots: 6, degree: 3}
                a:  {columns: "a*"}
            loss: {kind: huber, width: 0.5}
            penalties:
              - {kind: l1, weight: 0.01}
              - {kind: l2, weight: 1.0e-4, on: [t*]}
              - {kind: smoothness, order: 2, weight: 5, on: [s*]}
              - {kind: count, max: 2, on: [b1, b2]}
            constraints:
              - "b1 >= 0"
              - "b0 + 2*b2 <= 1"
              - {kind: bounds, on: [b1, b2], min: 0, max: 10}
              - {kind: increasing, in: load_kg, over: [0, 500]}
              - {kind: convex, in: temp_c, over: [-40, 125]}
              - {kind: value, at: {load_kg: 0}, equals: 0}
              - {kind: residuals, max-abs: 0.05}
            solve:
              method: auto
              time-limit: 60
            report:
              formats: [html, md, json]
              accept:
                - "max_abs_residual <= 0.05"
                - "r2 >= 0.999"
            """;
        var r = Parse(yaml);
        Assert.Empty(r.Errors);
        var doc = r.Document!;
        Assert.Equal(LossKind.Huber, doc.Loss.Kind);
        Assert.Equal(0.5, doc.Loss.Parameter);
        Assert.Equal(4, doc.Penalties.Count);
        Assert.Equal(7, doc.Constraints.Count);
        Assert.IsType<SplineTerm>(doc.Model.Terms[4]);
        Assert.Equal(MissingPolicy.Drop, doc.Data.Missing);
        Assert.Equal(60, doc.Solve.TimeLimit);
    }

    [Fact]
    public void Unknown_key_gets_did_you_mean_with_position()
    {
        var r = Parse(Minimal + "\nconstraint:\n  - \"b1 >= 0\"\n");
        var e = Assert.Single(r.Errors);
        Assert.Equal(9, e.Line);
        Assert.Equal(1, e.Column);
        Assert.Contains("unknown key 'constraint'", e.Message, StringComparison.Ordinal);
        Assert.Contains("did you mean 'constraints'?", e.Message, StringComparison.Ordinal);
        Assert.StartsWith("demo.fit.yaml:9:1: error:", e.ToString(), StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("loss: {kind: quantile, tau: 1.5}", "strictly between 0 and 1")]
    [InlineData("loss: {kind: quantile, tau: 0}", "strictly between 0 and 1")]
    [InlineData("loss: {kind: huber, width: -1}", "greater than 0")]
    [InlineData("loss: {kind: deadzone, width: -0.1}", "0 or more")]
    [InlineData("loss: {kind: lp, p: 1}", "greater than 1")]
    [InlineData("loss: quantile", "needs a parameter")]
    [InlineData("loss: {kind: l1, tau: 0.5}", "takes no parameters")]
    [InlineData("loss: l3", "unknown loss 'l3'")]
    [InlineData("penalties:\n  - {kind: l1, weight: -1}", "0 or more")]
    [InlineData("constraints:\n  - {kind: residuals, max-abs: -0.1}", "0 or more")]
    [InlineData("constraints:\n  - {kind: increasing, in: x, over: [5, 1]}", "lower to a higher")]
    [InlineData("solve:\n  method: simplx", "did you mean 'simplex'")]
    [InlineData("solve:\n  time-limit: 0", "positive")]
    public void Out_of_range_values_are_errors(string extra, string expected)
    {
        var r = Parse(Minimal + "\n" + extra + "\n");
        Assert.Contains(r.Errors, e => e.Message.Contains(expected, StringComparison.Ordinal));
        Assert.Null(r.Document);
    }

    [Fact]
    public void On_key_is_a_plain_string_not_a_boolean()
    {
        var r = Parse(Minimal + "\npenalties:\n  - {kind: l2, weight: 1, on: [b1]}\n");
        Assert.Empty(r.Errors);
        Assert.Equal("b1", r.Document!.Penalties[0].On![0].Value);
    }

    [Fact]
    public void Malformed_yaml_names_line_and_column()
    {
        var r = Parse("fitspec: 1\ndata: {path: d.csv\nmodel: x\n");
        var e = Assert.Single(r.Errors);
        Assert.NotNull(e.Line);
        Assert.Contains("invalid YAML", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Several_errors_are_collected()
    {
        var r = Parse("fitspec: 2\ndata:\n  path: d.xls\nmodel:\n  terms:\n    b0: 1\nlos: l1\n");
        Assert.True(r.Errors.Count >= 4, string.Join("\n", r.Errors));
    }

    [Fact]
    public void Custom_tags_are_refused()
    {
        var r = Parse(Minimal + "\ntitle: !!python/object x\n");
        Assert.Contains(r.Errors, e => e.Message.Contains("tags", StringComparison.Ordinal));
    }

    [Fact]
    public void Minimax_is_an_alias_of_linf()
    {
        var r = Parse(Minimal + "\nloss: minimax\n");
        Assert.Equal(LossKind.Linf, r.Document!.Loss.Kind);
    }

    [Fact]
    public void Object_constraints_get_readable_labels()
    {
        var r = Parse(Minimal + "\nconstraints:\n  - {kind: bounds, on: [b1], min: 0}\n  - {kind: increasing, in: x, over: [0, 5]}\n  - {kind: value, at: {x: 0}, equals: 0}\n");
        Assert.Equal(["b1 >= 0", "increasing in x over [0, 5]", "f(x=0) == 0"], r.Document!.Constraints.Select(c => c.Label));
    }

    [Fact]
    public void Invalid_name_is_an_error()
    {
        var r = Parse(Minimal.Replace("fitspec: 1", "fitspec: 1\nname: Bad Name", StringComparison.Ordinal));
        Assert.Contains(r.Errors, e => e.Message.Contains("a-z", StringComparison.Ordinal));
    }
}
