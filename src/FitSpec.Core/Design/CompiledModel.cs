using FitSpec.Diagnostics;
using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Design;

/// <summary>One model term with its expressions parsed (columns terms are expanded later, against the header).</summary>
public sealed record CompiledTerm(TermSpec Spec, ParsedExpression? Expression);

/// <summary>
/// Every expression of a spec parsed once: filter, weight, response, terms. Built before any data is read,
/// so that a bad expression is reported with its spec line and column.
/// </summary>
public sealed record CompiledModel(
    ParsedExpression? Filter,
    ParsedExpression? Weight,
    ParsedExpression Response,
    IReadOnlyList<CompiledTerm> Terms)
{
    /// <summary>The data columns to read, given the file's header (globs of columns terms expand here).</summary>
    public IReadOnlyList<string> ColumnsToRead(IReadOnlyList<string> header)
    {
        var names = new List<string>();
        void Add(ParsedExpression? e)
        {
            if (e is not null)
            {
                names.AddRange(e.Columns);
            }
        }

        Add(Filter);
        Add(Weight);
        Add(Response);
        foreach (var t in Terms)
        {
            Add(t.Expression);
            if (t.Spec is ColumnsTerm ct)
            {
                names.AddRange(Glob.Filter(header, ct.Glob.Value));
            }
        }

        return names.Distinct(StringComparer.Ordinal).ToList();
    }
}

/// <summary>Parses all expressions of a spec, collecting located errors.</summary>
public static class ModelCompiler
{
    public static CompiledModel Compile(FitSpecDocument spec)
    {
        ArgumentNullException.ThrowIfNull(spec);
        var errors = new List<Diagnostic>();
        var filter = spec.Data.Filter is { } f ? Parse(f, ExpressionContext.Filter, "data.filter", errors) : null;
        var weight = spec.Data.Weight is { } w ? Parse(w, ExpressionContext.Value, "data.weight", errors) : null;
        var response = Parse(spec.Model.Response, ExpressionContext.Value, "model.response", errors);
        var terms = new List<CompiledTerm>();
        foreach (var term in spec.Model.Terms)
        {
            var parsed = term switch
            {
                ExpressionTerm e => Parse(e.Expression, ExpressionContext.Value, $"model.terms.{term.Key}", errors),
                PolynomialTerm p => Parse(p.Input, ExpressionContext.Value, $"model.terms.{term.Key}", errors),
                SplineTerm s => Parse(s.Input, ExpressionContext.Value, $"model.terms.{term.Key}", errors),
                _ => null,
            };
            terms.Add(new CompiledTerm(term, parsed));
        }

        if (errors.Count > 0)
        {
            throw new FitSpecException(errors);
        }

        return new CompiledModel(filter, weight, response, terms);
    }

    internal static ParsedExpression Parse(SpecText text, ExpressionContext context, string field, List<Diagnostic> errors)
    {
        var parsed = ExpressionParser.Parse(text.Value, context);
        foreach (var e in parsed.Errors)
        {
            var at = text.At(e.Offset);
            errors.Add(new Diagnostic(at.File, at.Line, at.Column, field, $"in '{text.Value}': {e.Message}"));
        }

        if (parsed.Errors.Count == 0 && parsed.Root is null)
        {
            errors.Add(new Diagnostic(text.Pos.File, text.Pos.Line, text.Pos.Column, field, "empty expression"));
        }

        return parsed;
    }
}

/// <summary>Shell-style globs over names: '*' any run, '?' one character.</summary>
public static class Glob
{
    public static bool IsMatch(string name, string pattern)
    {
        ArgumentNullException.ThrowIfNull(name);
        ArgumentNullException.ThrowIfNull(pattern);
        int n = 0, p = 0, star = -1, mark = 0;
        while (n < name.Length)
        {
            if (p < pattern.Length && (pattern[p] == '?' || pattern[p] == name[n]))
            {
                n++;
                p++;
            }
            else if (p < pattern.Length && pattern[p] == '*')
            {
                star = p++;
                mark = n;
            }
            else if (star >= 0)
            {
                p = star + 1;
                n = ++mark;
            }
            else
            {
                return false;
            }
        }

        while (p < pattern.Length && pattern[p] == '*')
        {
            p++;
        }

        return p == pattern.Length;
    }

    public static IEnumerable<string> Filter(IEnumerable<string> names, string pattern) => names.Where(n => IsMatch(n, pattern));
}
