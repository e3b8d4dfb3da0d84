using FitSpec.Reporting;
using FitSpec.Results;

namespace FitSpec.Tests.Reporting;

/// <summary>
/// Number formatting and escaping helpers. The long literals are formatting inputs made up for these tests, not
/// check values from any source.
/// </summary>
public sealed class ReportFunctionsTests
{
    [Fact]
    public void Numbers_are_invariant_and_show_absence_as_a_dash()
    {
        Assert.Equal("—", ReportFunctions.Number(null));
        Assert.Equal("—", ReportFunctions.Number(double.NaN));
        Assert.Equal("∞", ReportFunctions.Number(double.PositiveInfinity));
        Assert.Equal("-∞", ReportFunctions.Number(double.NegativeInfinity));
        Assert.Equal("0", ReportFunctions.Number(-0.0));
        Assert.Equal("0.1", ReportFunctions.Number(0.1));
        Assert.Equal("1E-05", ReportFunctions.Number(1e-5));
        Assert.Equal("0.3333333333", ReportFunctions.Number(1.0 / 3));
        Assert.Equal("1.23456789E+12", ReportFunctions.Number(1234567890123.0));
        Assert.Equal("42", ReportFunctions.Number(42));
        Assert.Equal("9000000000", ReportFunctions.Number(9_000_000_000L));
        Assert.Equal("0.333333333333333", ReportFunctions.FullNumber(1.0 / 3));
        Assert.Equal("—", ReportFunctions.FullNumber(null));
    }

    [Fact]
    public void Brief_numbers_and_percentages_keep_four_digits()
    {
        Assert.Equal("0.01235", ReportFunctions.BriefNumber(0.012345678));
        Assert.Equal("8E+05", ReportFunctions.BriefNumber(800012.3456));
        Assert.Equal("—", ReportFunctions.BriefNumber(double.NaN));
        Assert.Equal("95%", ReportFunctions.Percent(0.95));
        Assert.Equal("99.73%", ReportFunctions.Percent(0.9973));
        Assert.Equal("—", ReportFunctions.Percent(null));
    }

    [Fact]
    public void Prose_turns_backticked_parts_into_code_and_escapes_the_rest()
    {
        Assert.Equal("relaxing <code>b1 &gt;= 0</code> by 0.1 &amp; more", ReportFunctions.HtmlProse("relaxing `b1 >= 0` by 0.1 & more"));
        Assert.Equal("an unpaired ` stays", ReportFunctions.HtmlProse("an unpaired ` stays"));
        Assert.Equal("relaxing `b1 >= 0` by \\*0.1\\*", ReportFunctions.MarkdownProse("relaxing `b1 >= 0` by *0.1*"));
        Assert.Equal("\\<b\\> `<b>`", ReportFunctions.MarkdownProse("<b> `<b>`"));
    }

    [Fact]
    public void Link_targets_are_percent_encoded_per_segment()
    {
        Assert.Equal("lc7-calibration.fit.svg", ReportFunctions.LinkTarget("lc7-calibration.fit.svg"));
        Assert.Equal("a%20b%28c%29.qq.svg", ReportFunctions.LinkTarget("a b(c).qq.svg"));
        Assert.Equal("sub/x%5D.svg", ReportFunctions.LinkTarget("sub/x].svg"));
    }

    [Fact]
    public void Flags_read_as_words()
    {
        Assert.Equal("yes", ReportFunctions.YesNo(true));
        Assert.Equal("no", ReportFunctions.YesNo(false));
        Assert.Equal("—", ReportFunctions.YesNo(null));
        Assert.Equal("PASS", ReportFunctions.PassFail(true));
        Assert.Equal("FAIL", ReportFunctions.PassFail(false));
    }

    [Fact]
    public void Html_escapes_markup_and_quotes()
    {
        Assert.Equal("&lt;b a=&quot;1&quot; c=&#39;2&#39;&gt;&amp;", ReportFunctions.Html("<b a=\"1\" c='2'>&"));
        Assert.Equal("°C — µ", ReportFunctions.Html("°C — µ"));
        Assert.Equal("—", ReportFunctions.Html(null));
    }

    [Fact]
    public void Markdown_text_cannot_open_markup_or_break_a_table()
    {
        Assert.Equal("a\\|b \\*c\\* \\<d\\> \\[e\\]", ReportFunctions.Markdown("a|b *c* <d> [e]"));
        Assert.Equal("one two", ReportFunctions.Markdown("one\r\ntwo"));
        Assert.Equal("\\# not a heading\nplain\n\\- not a list", ReportFunctions.MarkdownBlock("# not a heading\r\nplain\n- not a list"));
        Assert.Equal("folded text", ReportFunctions.MarkdownBlock("folded text\n\n"));
    }

    [Fact]
    public void Markdown_code_spans_survive_backticks_and_pipes()
    {
        Assert.Equal("`x^2`", ReportFunctions.MarkdownCode("x^2"));
        Assert.Equal("``a`b``", ReportFunctions.MarkdownCode("a`b"));
        Assert.Equal("`` `a` ``", ReportFunctions.MarkdownCode("`a`"));
        Assert.Equal("`|e|`", ReportFunctions.MarkdownCode("|e|"));
        Assert.Equal("`\\|e\\|`", ReportFunctions.MarkdownCodeCell("|e|"));
        Assert.Equal("—", ReportFunctions.MarkdownCode(""));
    }

    [Fact]
    public void Error_locations_leave_out_unknown_parts()
    {
        Assert.Equal("s.yaml:3:9", ReportFunctions.Location(new ErrorEntry("s.yaml", 3, 9, null, "m")));
        Assert.Equal("s.yaml:3", ReportFunctions.Location(new ErrorEntry("s.yaml", 3, null, null, "m")));
        Assert.Equal("s.yaml", ReportFunctions.Location(new ErrorEntry("s.yaml", null, 9, null, "m")));
    }
}
