using FitSpec.Pipeline;

namespace FitSpec.Tests.Pipeline;

public sealed class AcceptanceTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-accept");

    public AcceptanceTests() => _temp.Write("d.csv", "x,y\n0,1\n1,3\n2,5\n3,7.5\n");

    private Results.FitResult Run(string rules)
    {
        var spec = Path.Combine(_temp.Path, "a.fit.yaml");
        File.WriteAllText(spec, $"fitspec: 1\ndata: {{path: d.csv}}\nmodel:\n  response: y\n  terms: {{b0: 1, b1: x}}\nreport:\n  accept:\n{rules}");
        return FitRunner.Run(spec);
    }

    [Fact]
    public void Rules_pass_and_fail_with_their_left_hand_value()
    {
        var r = Run("    - \"b1 >= 2\"\n    - \"max_abs_residual <= 0.01\"\n");
        Assert.Equal("optimal", r.Status);
        Assert.True(r.Acceptance[0].Passed);
        Assert.Equal(r.Coefficients[1].Value, r.Acceptance[0].Value);
        Assert.False(r.Acceptance[1].Passed);
        Assert.Equal(1, r.ExitCode);
    }

    [Fact]
    public void An_unknown_name_is_a_located_spec_error()
    {
        var r = Run("    - \"rmsee < 1\"\n");
        Assert.Equal("error", r.Status);
        Assert.Equal(2, r.ExitCode);
        var e = Assert.Single(r.Errors);
        Assert.Equal(8, e.Line);
        Assert.Contains("did you mean 'rmse'", e.Message, StringComparison.Ordinal);
    }

    public void Dispose() => _temp.Dispose();
}
