using System.Net;
using System.Text.RegularExpressions;
using FitSpec.Reporting;
using FitSpec.Results;
using FitSpec.Spec;

namespace FitSpec.Tests.Reporting;

/// <summary>The report sections drawn from the diagnostics: each shown when its data is there, and only then.</summary>
public sealed partial class DiagnosticSectionsTests
{
    public static TheoryData<ReportFormat> Formats => new() { ReportFormat.Md, ReportFormat.Html };

    private static string Visible(string output, ReportFormat format) => format == ReportFormat.Html
        ? WebUtility.HtmlDecode(Tags().Replace(output, ""))
        : output.Replace("`", "", StringComparison.Ordinal).Replace("\\", "", StringComparison.Ordinal).Replace("**", "", StringComparison.Ordinal);

    [GeneratedRegex("<[^>]+>")]
    private static partial Regex Tags();

    [Theory]
    [MemberData(nameof(Formats))]
    public void Every_diagnostic_section_shows_its_numbers(ReportFormat format)
    {
        var text = Visible(ReportRenderer.Render(SampleSeries.Full(), format), format);

        // Dual sentences, ranging, outside-width lines.
        Assert.Contains("What the active constraints cost", text);
        Assert.Contains("raising the constant side of f(25) == 10000 by 0.1 would raise the objective by about 0.325", text);
        Assert.Contains("Sensitivity ranges", text);
        Assert.Contains("9990.5", text);
        Assert.Contains("10011.25", text);
        Assert.Contains("-0.75", text);
        Assert.Contains("ranging is valid while the basis is unchanged", text);
        Assert.Contains("3 rows have a |residual| beyond the width of the l1 loss", text);
        Assert.Contains("Data lines: 9, 17, 23.", text);

        // Leverage: mean, 2p/n level, the rows, and how many are above it.
        Assert.Contains("Leverage", text);
        Assert.Contains("0.075", text);
        Assert.Contains("0.1936", text);
        Assert.Contains("0.1412", text);
        Assert.Contains("of the rows listed, 1 is above it.", text);

        // Uncertainty: standard error and t value to 4 digits; bootstrap settings and note.
        Assert.Contains("Classical standard errors", text);
        Assert.Contains("0.01235", text);
        Assert.Contains("8E+05", text);
        Assert.Contains("95% percentile intervals from 200 case-resampling replicates (seed 20240611); 198 of them solved.", text);
        Assert.Contains("9876.6", text);
        Assert.Contains("0.02512", text);
        Assert.Contains("2 replicates failed to solve and were left out", text);

        // Provenance: commit, command line and stamp.
        Assert.Contains("0123456789abcdef0123456789abcdef01234567", text);
        Assert.Contains("fitspec solve specs/thermistor.fit.yaml --out out", text);
        Assert.Contains("2024-06-11T08:30:00Z", text);

        // Largest residuals gain the input column.
        Assert.Contains("load_kg", text);
        Assert.Contains("38.46153846", text);
        Assert.Contains("Plots", text);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Absent_diagnostics_leave_no_empty_sections(ReportFormat format)
    {
        var text = Visible(ReportRenderer.Render(SampleResults.Optimal(), format), format);

        foreach (var heading in new[]
        {
            "Plots", "What the active constraints cost", "Sensitivity ranges", "Leverage", "Coefficient uncertainty",
            "beyond the width", "Command", "Run at", "commit",
        })
        {
            Assert.DoesNotContain(heading, text);
        }

        // What stays: the caution, the acceptance verdict with values, the largest residuals.
        Assert.Contains(ReportRenderer.Caution, text);
        Assert.Contains("Overall: FAIL (1 of 2 rules hold).", text);
        Assert.Contains("0.1234567", text);
        Assert.Contains("Largest residuals", text);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Solve_time_is_shown_only_with_a_stamp(ReportFormat format)
    {
        // Wall-clock time differs run to run; without a stamp every file must be byte-identical.
        var plain = Visible(ReportRenderer.Render(SampleResults.Optimal(), format), format);
        Assert.DoesNotContain("0.0125", plain);
        Assert.DoesNotContain("Solve time", plain);
        Assert.Contains("Iterations", plain);

        var stamped = Visible(ReportRenderer.Render(SampleSeries.Full(), format), format);
        Assert.Contains("Solve time", stamped);
        Assert.Contains("0.0125 s", stamped);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Each_uncertainty_part_shows_alone(ReportFormat format)
    {
        var full = SampleSeries.Full();
        var classical = full with { Uncertainty = full.Uncertainty! with { Bootstrap = null } };
        var text = Visible(ReportRenderer.Render(classical, format), format);
        Assert.Contains("Classical standard errors", text);
        Assert.DoesNotContain("Bootstrap", text);

        var bootstrap = full with { Uncertainty = full.Uncertainty! with { Classical = null } };
        text = Visible(ReportRenderer.Render(bootstrap, format), format);
        Assert.Contains("Bootstrap intervals", text);
        Assert.DoesNotContain("Classical standard errors", text);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void The_summary_answers_what_how_well_cost_optimality_and_acceptance(ReportFormat format)
    {
        var text = Visible(ReportRenderer.Render(SampleSeries.Full(), format), format);
        var brief = text[text.IndexOf("In brief", StringComparison.Ordinal)..text.IndexOf("What was fitted", StringComparison.Ordinal)];

        Assert.Contains("resistance by f = a0·1 + a1·t + a2·t^2 under the l1 loss, to data/run7.csv (20 of 25 rows used)", brief);
        Assert.Contains("RMSE 0.0421", brief);
        Assert.Contains("2, of which 1 active at the solution; their cost is read out below", brief);
        Assert.Contains("independent verification passed, duality gap 3.1E-11", brief);
        Assert.Contains("FAIL: 1 of 2 rules do not hold", brief);

        var passing = SampleResults.Optimal() with { Acceptance = [new AcceptanceResult("rmse < 1", 0.04, true, null)] };
        Assert.Contains("PASS: all 1 rules hold", Visible(ReportRenderer.Render(passing, format), format));
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Long_line_lists_are_cut_with_a_count(ReportFormat format)
    {
        var result = SampleResults.Optimal() with { OutsideWidthLines = [.. Enumerable.Range(2, 250)], OutlierLines = [.. Enumerable.Range(2, 101)] };
        var text = Visible(ReportRenderer.Render(result, format), format);

        Assert.Contains("250 rows have a |residual|", text);
        Assert.Contains("100, 101 and 150 more.", text);
        Assert.DoesNotContain("102,", text);
        Assert.Contains("101 rows. Data lines: 2, 3,", text);
        Assert.Contains("and 1 more", text);
    }

    [Fact]
    public void Html_inlines_each_plot_with_an_explicit_size_and_caption()
    {
        var html = ReportRenderer.Render(SampleSeries.Full(), ReportFormat.Html);

        var svgs = Regex.Matches(html, "<svg [^>]*>").Select(m => m.Value).ToList();
        Assert.Equal(3, svgs.Count);
        Assert.All(svgs, s => Assert.Matches("width=\"760\" height=\"430\" viewBox=\"0 0 760 430\"", s));
        Assert.Contains("<figure id=\"plot-fit\">", html);
        Assert.Contains("<figcaption><strong>Residuals against fitted values.</strong>", html);
        var ids = Regex.Matches(html, " id=\"([^\"]+)\"").Select(m => m.Groups[1].Value).ToList();
        Assert.Equal(ids.Count, ids.Distinct().Count());
        Assert.DoesNotContain("<script", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("http", html, StringComparison.OrdinalIgnoreCase);
        // The only url() references are to clip paths inside the page.
        Assert.All(Regex.Matches(html, @"url\(([^)]*)\)").Select(m => m.Groups[1].Value), u => Assert.StartsWith("#fitspec-", u, StringComparison.Ordinal));
    }

    [Fact]
    public void Markdown_links_each_plot_file_by_a_relative_link()
    {
        var md = ReportRenderer.Render(SampleSeries.Full() with { Name = "lc7 (bench)" }, ReportFormat.Md);

        Assert.Contains("![Observations and fit](lc7%20%28bench%29.fit.svg)", md);
        Assert.Contains("![Residuals against fitted values](lc7%20%28bench%29.residuals.svg)", md);
        Assert.Contains("![Distribution of residuals](lc7%20%28bench%29.histogram.svg)", md);
        Assert.DoesNotContain("<svg", md, StringComparison.Ordinal);
        Assert.EndsWith("\n", md, StringComparison.Ordinal);
        Assert.DoesNotContain("\n\n\n", md, StringComparison.Ordinal);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void Hostile_names_in_the_diagnostics_are_escaped(ReportFormat format)
    {
        var attack = SampleResults.Attack;
        var full = SampleSeries.Full(SampleResults.Optimal(attack, attack, attack, attack), SampleSeries.Line(30, response: attack, input: attack));
        var result = full with
        {
            Guides = [new ResidualGuide(attack, 0.01)],
            DualReadings = [new DualReading(attack, 1, $"relaxing `{attack}` by 0.1 lowers {attack}")],
            Ranging = new RangingInfo([new BoundRange(attack, 1, 0, 2, 0, 1)], [new CostRange(attack, 0, 1)], attack),
            Provenance = full.Provenance with { CommandLine = attack, Commit = attack, Stamp = attack },
        };
        var output = ReportRenderer.Render(result, format);

        if (format == ReportFormat.Html)
        {
            Assert.DoesNotContain("<script", output, StringComparison.OrdinalIgnoreCase);
            Assert.Contains("<code>&lt;script&gt;alert(1)&lt;/script&gt;</code>", output);
        }
        else
        {
            // Outside code spans every '<' is backslash-escaped; inside them it is inert.
            var outsideCode = Regex.Replace(output, "`+[^`]*`+", "");
            Assert.DoesNotMatch(new Regex(@"(?<!\\)<script", RegexOptions.IgnoreCase), outsideCode);
            Assert.Contains("\\<script\\>", outsideCode);
            Assert.Contains("`<script>alert(1)</script>`", output);
        }
    }
}
