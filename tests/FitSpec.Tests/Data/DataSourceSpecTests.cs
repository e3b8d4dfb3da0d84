using FitSpec.Data;
using FitSpec.Spec;
using FitSpec.Tests.Spec;

namespace FitSpec.Tests.Data;

/// <summary>The data section's forms for Parquet and SQLite: the reader and the JSON Schema agree on each.</summary>
public sealed class DataSourceSpecTests
{
    private const string Model = "model: {response: y, terms: {b0: 1}}\n";

    [Theory]
    [InlineData("data: {path: d.parquet}\n")]
    [InlineData("data: {path: sub/D.PARQUET, missing: drop}\n")]
    [InlineData("data:\n  sqlite: lab.db\n  query: |\n    -- the dead-weight steps\n    SELECT x, y FROM t\n")]
    public void Accepted_by_reader_and_schema(string data)
    {
        var yaml = "fitspec: 1\n" + data + Model;
        Assert.Empty(SpecReader.Parse("d.fit.yaml", System.Text.Encoding.UTF8.GetBytes(yaml)).Errors);
        Assert.Empty(SchemaCheck.Errors(yaml));
    }

    [Theory]
    [InlineData("data: {path: d.parq}\n", "data.path")]
    [InlineData("data: {path: d.parquet.gz}\n", "data.path")]
    [InlineData("data: {sqlite: lab.db, query: \"  \"}\n", "data.query")]
    public void Refused_by_reader_and_schema(string data, string field)
    {
        var yaml = "fitspec: 1\n" + data + Model;
        var errors = SpecReader.Parse("d.fit.yaml", System.Text.Encoding.UTF8.GetBytes(yaml)).Errors;
        Assert.Contains(errors, e => e.Field == field);
        Assert.NotEmpty(SchemaCheck.Errors(yaml));
    }

    [Theory]
    [InlineData("SELECT x FROM t", "SELECT")]
    [InlineData("  select x", "SELECT")]
    [InlineData("-- note\n/* block\n comment */ WITH a AS (SELECT 1) SELECT * FROM a", "WITH")]
    [InlineData("values (1)", "VALUES")]
    [InlineData("\n\tDELETE FROM t", "DELETE")]
    [InlineData("-- only a comment", "")]
    [InlineData("/* unclosed", "")]
    [InlineData("(SELECT 1)", "(")]
    public void The_first_keyword_skips_space_and_comments(string query, string keyword)
    {
        Assert.Equal(keyword, SqlQueryText.FirstKeyword(query));
    }

    [Fact]
    public void A_query_is_shown_on_one_line()
    {
        Assert.Equal("SELECT x, y FROM t WHERE x > 0", SqlQueryText.OneLine("SELECT x, y\n  FROM t\r\n\tWHERE x > 0\n"));
    }
}
