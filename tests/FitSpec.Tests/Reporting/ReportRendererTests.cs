using System.Globalization;
using System.Net;
using System.Text.RegularExpressions;
using FitSpec.Reporting;
using FitSpec.Results;
using FitSpec.Spec;

namespace FitSpec.Tests.Reporting;

public sealed class ReportRendererTests
{
    public static TheoryData<ReportFormat> Formats => new() { ReportFormat.Md, ReportFormat.Html };

    /// <summary>What a reader sees: tags stripped and entities decoded for HTML, code-span backticks dropped for Markdown.</summary>
    private static string Visible(string output, ReportFormat format) => format == ReportFormat.Html
        ? WebUtility.HtmlDecode(Regex.Replace(output, "<[^>]+>", ""))
        : output.Replace("`", "", StringComparison.Ordinal);

    [Theory]
    [MemberData(nameof(Formats))]
    public void Optimal_fit_shows_its_key_facts(ReportFormat format)
    {
        var text = Visible(ReportRenderer.Render(SampleResults.Optimal(), format), format);

        Assert.Contains("Thermistor calibration", text);
        Assert.Contains(ReportRenderer.Caution, text);
        Assert.Contains("9876.54321012345", text);
        Assert.Contains("-0.000123456789012345", text);
        Assert.Contains("PASS", text);
        Assert.Contains("FAIL", text);
        Assert.Contains("f = a0·1 + a1·t + a2·t^2", text);
        Assert.Contains("minimise Σ", text);
        Assert.Contains("f(25) == 10000", text);
        Assert.Contains("1.5E-12 over 501 points", text);
        Assert.Contains("51 points on", text);
        Assert.Contains("per unit the constraint is relaxed", text);
        Assert.Contains(new string('d', 64), text);
        Assert.Contains(new string('a', 64), text);
        Assert.Contains("0.9999123457", text);
        Assert.Contains("Objective recomputed from the data", text);
        Assert.Contains("10.3765433", text);
        Assert.Contains("one epigraph variable per row", text);
        Assert.Contains("HiGHS 1.12.0", text);
        Assert.DoesNotContain("Errors", text);
        Assert.DoesNotContain("Normal-equation residual", text);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Sections_appear_in_the_documented_order(ReportFormat format)
    {
        var text = Visible(ReportRenderer.Render(SampleSeries.Full(), format), format);
        string[] order =
        [
            "Thermistor calibration", "OPTIMAL", "Bench run 7.", "Caution.", "In brief", "What was fitted", "Data", "Coefficients",
            "Goodness of fit", "Plots", "Constraints", "What the active constraints cost", "Sensitivity ranges", "Acceptance",
            "Verification", "Largest residuals", "Observations outside the loss's width", "Leverage", "Coefficient uncertainty",
            "How it was solved", "Provenance",
        ];
        var at = 0;
        foreach (var marker in order)
        {
            var next = text.IndexOf(marker, at, StringComparison.OrdinalIgnoreCase);
            Assert.True(next >= 0, $"'{marker}' missing or out of order");
            at = next + marker.Length;
        }
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Error_report_lists_every_error_and_nothing_about_a_fit(ReportFormat format)
    {
        var text = Visible(ReportRenderer.Render(SampleResults.Invalid(), format), format);

        Assert.Contains("specs/broken.fit.yaml:12:7: unknown column 'tempp' (did you mean 'temp'?)", text);
        Assert.Contains("model.terms.x2", text);
        Assert.Contains("data/run7.csv:40: value 'abc' is not a number", text);
        Assert.Contains(ReportRenderer.Caution, text);
        Assert.Contains("ERROR", text, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("Coefficients", text);
        Assert.DoesNotContain("Goodness of fit", text);
        Assert.DoesNotContain("Verification", text);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Errors_replace_stale_fit_sections(ReportFormat format)
    {
        // An invalid data file still leaves the statement and data info behind; the report must not show them.
        var stale = SampleResults.Optimal() with { Status = "error", Errors = SampleResults.Invalid().Errors };
        var text = Visible(ReportRenderer.Render(stale, format), format);

        Assert.Contains("data/run7.csv:40: value 'abc' is not a number", text);
        Assert.DoesNotContain("What was fitted", text);
        Assert.DoesNotContain("9876.54321012345", text);
        Assert.DoesNotContain("PASS", text);
        Assert.DoesNotContain("Largest residuals", text);
        Assert.DoesNotContain("How it was solved", text);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Fit_without_a_solution_says_so_briefly(ReportFormat format)
    {
        var text = Visible(ReportRenderer.Render(SampleResults.Infeasible(), format), format);

        Assert.Contains("INFEASIBLE", text, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("the constraints contradict each other", text);
        Assert.Contains("No solution was produced", text);
        Assert.Contains("What was fitted", text);
        Assert.DoesNotContain("Coefficients", text);
        Assert.DoesNotContain("PASS", text);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Closed_form_fits_show_the_normal_equation_residual(ReportFormat format)
    {
        var optimal = SampleResults.Optimal();
        var closed = optimal with { Verification = optimal.Verification! with { Stationarity = 7.5e-14 } };
        var text = Visible(ReportRenderer.Render(closed, format), format);

        Assert.Contains("Normal-equation residual", text);
        Assert.Contains("7.5E-14", text);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Failed_checks_and_rule_errors_are_listed(ReportFormat format)
    {
        var optimal = SampleResults.Optimal();
        var failed = optimal with
        {
            Status = "error",
            StatusDetail = "the solution failed its own verification",
            Verification = optimal.Verification! with { Passed = false, Failures = ["objective differs by 3%", "constraint 2 violated by 0.1"] },
            Acceptance = [new AcceptanceResult("rmsee < 1", null, false, "unknown name 'rmsee'")],
        };
        var text = Visible(ReportRenderer.Render(failed, format), format);

        Assert.Contains("the solution failed its own verification", text);
        Assert.Contains("objective differs by 3%", text);
        Assert.Contains("constraint 2 violated by 0.1", text);
        Assert.Contains("unknown name 'rmsee'", text);
        Assert.Contains("FAIL", text);
        Assert.DoesNotContain("PASS", text);
    }

    [Fact]
    public void Html_escapes_every_user_string()
    {
        var attack = SampleResults.Attack;
        var html = ReportRenderer.Render(SampleResults.Optimal(attack, attack, attack, attack), ReportFormat.Html);

        Assert.DoesNotContain("<script", html, StringComparison.OrdinalIgnoreCase);
        // Title (twice: <title> and <h1>), description, coefficient, constraint in statement, table and lowering notes.
        var escaped = Regex.Matches(html, Regex.Escape("&lt;script&gt;alert(1)&lt;/script&gt;")).Count;
        Assert.True(escaped >= 7, $"expected the escaped attack at least 7 times, found {escaped}");

        var errors = SampleResults.Invalid() with
        {
            Errors = [new ErrorEntry(attack, 1, 2, attack, attack)],
        };
        var errorHtml = ReportRenderer.Render(errors, ReportFormat.Html);
        Assert.DoesNotContain("<script", errorHtml, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("&lt;script&gt;alert(1)&lt;/script&gt;:1:2", errorHtml);
    }

    [Fact]
    public void Html_is_self_contained()
    {
        foreach (var result in new[] { SampleResults.Optimal(), SampleResults.Invalid(), SampleResults.Infeasible(), SampleSeries.Full() })
        {
            var html = ReportRenderer.Render(result, ReportFormat.Html);

            Assert.StartsWith("<!DOCTYPE html>", html, StringComparison.Ordinal);
            Assert.Contains("<meta charset=\"utf-8\">", html);
            Assert.Contains("<style>", html);
            Assert.DoesNotContain("http://", html, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("https://", html, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotMatch(new Regex(@"\b(src|href)\s*=", RegexOptions.IgnoreCase), html);
            Assert.DoesNotContain("<link", html, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("@import", html, StringComparison.OrdinalIgnoreCase);
            // Plots clip to their frame by url(#id) references to their own clip paths; nothing else is referenced.
            Assert.Equal(
                Regex.Matches(html, "url\\(", RegexOptions.IgnoreCase).Count,
                Regex.Matches(html, "url\\(#fitspec-(fit|residuals|histogram|qq)-clip[0-9]+\\)").Count);
            Assert.EndsWith("</html>\n", html, StringComparison.Ordinal);
        }
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Rendering_is_deterministic_across_calls_threads_and_cultures(ReportFormat format)
    {
        foreach (var make in new Func<FitResult>[] { () => SampleResults.Optimal(), () => SampleSeries.Full() })
        {
            var first = ReportRenderer.Render(make(), format);
            Assert.Equal(first, ReportRenderer.Render(make(), format));

            var parallel = new string[32];
            Parallel.For(0, parallel.Length, i => parallel[i] = ReportRenderer.Render(make(), format));
            Assert.All(parallel, p => Assert.Equal(first, p));

            var comma = (CultureInfo)CultureInfo.InvariantCulture.Clone();
            comma.NumberFormat.NumberDecimalSeparator = ",";
            comma.NumberFormat.NegativeSign = "~";
            var saved = CultureInfo.CurrentCulture;
            try
            {
                CultureInfo.CurrentCulture = comma;
                Assert.Equal(first, ReportRenderer.Render(make(), format));
            }
            finally
            {
                CultureInfo.CurrentCulture = saved;
            }

            Assert.DoesNotContain("\r", first, StringComparison.Ordinal);
        }
    }

    [Fact]
    public void Template_override_folder_is_honoured_and_reloaded_when_edited()
    {
        var folder = Directory.CreateTempSubdirectory("fitspec-templates-").FullName;
        try
        {
            var md = Path.Combine(folder, "report.md.sbn");
            File.WriteAllText(md, "custom {{ result.name }} {{ result.objective | fmt }} {{ result.metrics.max_abs_residual | fmt }}");
            Assert.Equal("custom thermistor 1.23456789 0.1234567", ReportRenderer.Render(SampleResults.Optimal(), ReportFormat.Md, folder));

            // Absent values reach helpers as null and show as a dash; absent sections need an if guard.
            File.WriteAllText(md, "{{ result.objective | fmt }} {{ if result.metrics }}{{ result.metrics.rmse | fmt }}{{ else }}no metrics{{ end }}");
            Assert.Equal("— no metrics", ReportRenderer.Render(SampleResults.Infeasible(), ReportFormat.Md, folder));

            File.WriteAllText(md, "edited {{ result.status }}");
            Assert.Equal("edited optimal", ReportRenderer.Render(SampleResults.Optimal(), ReportFormat.Md, folder));

            // A format the folder does not override falls back to the built-in template.
            var html = ReportRenderer.Render(SampleResults.Optimal(), ReportFormat.Html, folder);
            Assert.StartsWith("<!DOCTYPE html>", html, StringComparison.Ordinal);
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    [Fact]
    public void Broken_or_missing_templates_are_reported_clearly()
    {
        var folder = Directory.CreateTempSubdirectory("fitspec-templates-").FullName;
        try
        {
            File.WriteAllText(Path.Combine(folder, "report.md.sbn"), "{{ if result.name }}never closed");
            var parse = Assert.Throws<ReportTemplateException>(() => ReportRenderer.Render(SampleResults.Optimal(), ReportFormat.Md, folder));
            Assert.Contains("report.md.sbn", parse.Message, StringComparison.Ordinal);

            File.WriteAllText(Path.Combine(folder, "report.html.sbn"), "{{ no_such_variable }}");
            var runtime = Assert.Throws<ReportTemplateException>(() => ReportRenderer.Render(SampleResults.Optimal(), ReportFormat.Html, folder));
            Assert.Contains("report.html.sbn", runtime.Message, StringComparison.Ordinal);
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }

        Assert.Throws<ReportTemplateException>(() => ReportRenderer.Render(SampleResults.Optimal(), ReportFormat.Md, folder));
        Assert.Throws<ArgumentOutOfRangeException>(() => ReportRenderer.Render(SampleResults.Optimal(), ReportFormat.Json));
    }

    [Fact]
    public void Default_templates_are_found_from_the_test_output_folder()
    {
        var folder = ReportRenderer.DefaultTemplateFolder;
        Assert.NotNull(folder);
        Assert.True(File.Exists(Path.Combine(folder, "report.md.sbn")));
        Assert.True(File.Exists(Path.Combine(folder, "report.html.sbn")));
    }
}
