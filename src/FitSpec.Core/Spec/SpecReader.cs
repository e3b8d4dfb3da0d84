using System.Text.RegularExpressions;
using FitSpec.Diagnostics;
using FitSpec.Spec.Schema;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>The result of reading a spec: the document when it is valid, and every error found.</summary>
public sealed record SpecReadResult(FitSpecDocument? Document, string Name, IReadOnlyList<Diagnostic> Errors, byte[] Bytes);

/// <summary>Stage 1: spec file → typed, validated <see cref="FitSpecDocument"/>. Reads no data.</summary>
public static partial class SpecReader
{
    /// <summary>Upper bound on spec size; a fit spec is a few kilobytes.</summary>
    public const int MaxSpecBytes = 1 << 20;

    private const int MaxYamlMessage = 200;

    public static SpecReadResult Read(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        var name = DefaultName(path);
        byte[] bytes;
        try
        {
            var info = new FileInfo(path);
            if (info.Exists && info.Length > MaxSpecBytes)
            {
                return new(null, name, [new Diagnostic(path, null, null, null, $"spec file is larger than {MaxSpecBytes} bytes")], []);
            }

            bytes = File.ReadAllBytes(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return new(null, name, [new Diagnostic(path, null, null, null, $"cannot read spec file: {e.Message}")], []);
        }

        return Parse(path, bytes);
    }

    /// <summary>Parses spec bytes as if read from <paramref name="path"/> (used by tests and by Read).</summary>
    public static SpecReadResult Parse(string path, byte[] bytes) => Parse(path, bytes, null);

    /// <param name="onKeyRead">Told of every grammar key a reader asks for (see <see cref="SectionEntries"/>).</param>
    internal static SpecReadResult Parse(string path, byte[] bytes, Action<SectionGrammar, string>? onKeyRead)
    {
        ArgumentNullException.ThrowIfNull(bytes);
        var errors = new List<Diagnostic>();
        var fields = new YamlFields(path, errors, onKeyRead);
        var name = DefaultName(path);
        YamlNode? root;
        try
        {
            root = LoadSingleDocument(path, bytes, errors);
        }
        catch (YamlException e)
        {
            errors.Add(new Diagnostic(path, (int)e.Start.Line, (int)e.Start.Column, null, $"invalid YAML: {CleanYamlMessage(e)}"));
            return new(null, name, errors, bytes);
        }
        catch (System.Text.DecoderFallbackException)
        {
            errors.Add(new Diagnostic(path, 1, 1, null, "the file is not valid UTF-8 text; save it as UTF-8"));
            return new(null, name, errors, bytes);
        }
        catch (Exception e) when (e is InvalidOperationException or ArgumentException)
        {
            // The YAML library reports some malformed input (an unclosed '[' or '{') without a position:
            // point at the last token it could read.
            var at = LastGoodMark(bytes);
            errors.Add(new Diagnostic(path, at.Line, at.Column, null, "invalid YAML near here: check for an unclosed '[' or '{', a stray quote, or a duplicate key"));
            return new(null, name, errors, bytes);
        }

        if (root is null)
        {
            return new(null, name, errors, bytes);
        }

        if (root is not YamlMappingNode top)
        {
            fields.Error(root, null, "a fit spec must be a mapping with keys such as 'fitspec', 'data', 'model'");
            return new(null, name, errors, bytes);
        }

        var doc = ReadTop(fields, top, path, ref name);
        return new(errors.Count == 0 ? doc : null, name, errors, bytes);
    }

    private static (int Line, int Column) LastGoodMark(byte[] bytes)
    {
        var scanner = new Scanner(new StringReader(System.Text.Encoding.UTF8.GetString(bytes)));
        (int, int) last = (1, 1);
        try
        {
            while (scanner.MoveNext())
            {
                last = ((int)scanner.Current!.End.Line, (int)scanner.Current.End.Column);
            }
        }
        catch (Exception e) when (e is YamlException or InvalidOperationException or ArgumentException)
        {
            // The last position read is what we report.
        }

        return last;
    }

    private static YamlNode? LoadSingleDocument(string path, byte[] bytes, List<Diagnostic> errors)
    {
        var text = new System.Text.UTF8Encoding(false, true).GetString(bytes);
        var lines = text.Split('\n');
        for (var i = 0; i < lines.Length; i++)
        {
            var indent = lines[i].Length - lines[i].TrimStart(' ', '\t').Length;
            var tab = lines[i].IndexOf('\t', StringComparison.Ordinal);
            if (tab >= 0 && tab < indent)
            {
                errors.Add(new Diagnostic(path, i + 1, tab + 1, null, "a tab is used for indentation; YAML needs spaces"));
            }
        }

        if (errors.Count > 0 || !YamlLimits.Check(path, text, errors))
        {
            return null;
        }

        var stream = new YamlStream();
        stream.Load(new StringReader(text));
        if (stream.Documents.Count == 0)
        {
            errors.Add(new Diagnostic(path, 1, 1, null, "the spec file is empty; start with 'fitspec: 1'"));
            return null;
        }

        if (stream.Documents.Count > 1)
        {
            var second = stream.Documents[1].RootNode;
            errors.Add(new Diagnostic(path, (int)second.Start.Line, (int)second.Start.Column, null, "one fit per file: found a second YAML document"));
            return null;
        }

        var root = stream.Documents[0].RootNode;
        RejectTags(root, path, errors);
        return errors.Count == 0 ? root : null;
    }

    // Custom tags could ask for types the spec language does not have; refuse them all.
    private static void RejectTags(YamlNode node, string path, List<Diagnostic> errors)
    {
        var stack = new Stack<YamlNode>();
        var seen = new HashSet<YamlNode>(ReferenceEqualityComparer.Instance);
        stack.Push(node);
        while (stack.Count > 0)
        {
            var n = stack.Pop();
            if (!seen.Add(n))
            {
                continue;
            }

            if (!n.Tag.IsEmpty && !n.Tag.IsNonSpecific)
            {
                errors.Add(new Diagnostic(path, (int)n.Start.Line, (int)n.Start.Column, null, $"YAML tags such as '{n.Tag.Value}' are not allowed in a fit spec"));
            }

            // Direct children only: AllNodes walks a whole subtree, and an alias makes subtrees shared.
            IEnumerable<YamlNode> children = n switch
            {
                YamlMappingNode map => map.Children.SelectMany(kv => new[] { kv.Key, kv.Value }),
                YamlSequenceNode seq => seq.Children,
                _ => [],
            };
            foreach (var child in children)
            {
                if (child is YamlMappingNode or YamlSequenceNode)
                {
                    stack.Push(child);
                }
                else if (!child.Tag.IsEmpty && !child.Tag.IsNonSpecific && seen.Add(child))
                {
                    errors.Add(new Diagnostic(path, (int)child.Start.Line, (int)child.Start.Column, null, $"YAML tags such as '{child.Tag.Value}' are not allowed in a fit spec"));
                }
            }
        }
    }

    private static string CleanYamlMessage(YamlException e)
    {
        var m = e.Message;
        // YamlDotNet prefixes its own position, which our FILE:LINE:COL already carries.
        var idx = m.IndexOf("): ", StringComparison.Ordinal);
        m = idx >= 0 && m.StartsWith('(') ? m[(idx + 3)..] : m;

        // Some messages quote a whole node (a repeated key that is a list quotes the list): keep a line's worth.
        return m.Length <= MaxYamlMessage ? m : m[..MaxYamlMessage] + "…";
    }

    private static FitSpecDocument? ReadTop(YamlFields f, YamlMappingNode top, string path, ref string name)
    {
        var e = f.Entries(top, "the spec", SpecGrammar.Root);
        if (!e.TryGetValue("fitspec", out var version))
        {
            f.Error(top, "fitspec", "missing 'fitspec: 1' (the format version) at the top of the spec");
        }
        else if (f.Integer(version.Value, "fitspec") is { } v && !SpecGrammar.Root.RangeOf("fitspec").Contains(v))
        {
            f.Error(version.Value, "fitspec", $"unsupported format version {v}; this tool reads version 1");
        }

        if (e.TryGetValue("name", out var nameNode) && f.Text(nameNode.Value, "name") is { } n)
        {
            if (!ValidName().IsMatch(n.Value))
            {
                f.Error(nameNode.Value, "name", $"name '{n.Value}' may use only a-z, 0-9, '.', '_' and '-'");
            }

            name = n.Value;
        }
        else if (!e.ContainsKey("name") && !ValidName().IsMatch(name))
        {
            f.Error(top, "name", $"the file name gives the fit name '{name}', which is not of the form [a-z0-9._-]+; add a 'name:' key");
        }

        var title = e.TryGetValue("title", out var t) ? f.Text(t.Value, "title")?.Value : null;
        var description = e.TryGetValue("description", out var d) ? f.Text(d.Value, "description")?.Value : null;

        DataSpec? data = null;
        if (!e.TryGetValue("data", out var dataNode))
        {
            f.Error(top, "data", "missing 'data' section (data: {path: file.csv})");
        }
        else
        {
            data = ReadData(f, dataNode.Value);
        }

        ModelSpec? model = null;
        if (!e.TryGetValue("model", out var modelNode))
        {
            f.Error(top, "model", "missing 'model' section (model: {response: y, terms: {...}})");
        }
        else
        {
            model = ReadModel(f, modelNode.Value);
        }

        var loss = e.TryGetValue("loss", out var lossNode)
            ? LossReader.Read(f, lossNode.Value)
            : new LossSpec(LossKind.L2, "l2", null, f.Pos(top));
        var penalties = e.TryGetValue("penalties", out var p) ? PenaltyReader.Read(f, p.Value) : [];
        var constraints = e.TryGetValue("constraints", out var c) ? ConstraintReader.Read(f, c.Value) : [];
        var solve = e.TryGetValue("solve", out var s) ? ReadSolve(f, s.Value) : new SolveSpec(SolveMethod.Auto, null);
        var report = e.TryGetValue("report", out var r) ? ReadReport(f, r.Value) : DefaultReport;

        if (data is null || model is null || loss is null || solve is null || report is null)
        {
            return null;
        }

        return new FitSpecDocument(path, name, title, description, data, model, loss, penalties, constraints, solve, report);
    }

    private static ReportSpec DefaultReport => new([ReportFormat.Html, ReportFormat.Md, ReportFormat.Json], [], null);

    private static DataSpec? ReadData(YamlFields f, YamlNode node)
    {
        if (f.Mapping(node, "data") is not { } map)
        {
            return null;
        }

        var e = f.Entries(map, "data", SpecGrammar.Data);
        SpecText? Get(string key) => e.TryGetValue(key, out var v) ? f.Text(v.Value, $"data.{key}") : null;
        var path = Get("path");
        var sqlite = Get("sqlite");
        var query = Get("query");
        if (path is null && sqlite is null && !e.ContainsKey("path") && !e.ContainsKey("sqlite"))
        {
            f.Error(map, "data.path", "data needs 'path:' (a .csv, .tsv or .parquet file) or 'sqlite:' with 'query:'");
        }

        if (path is not null && sqlite is not null)
        {
            f.Error(sqlite.Pos, "data.sqlite", "give either 'path:' or 'sqlite:', not both");
        }

        if (sqlite is not null && query is null)
        {
            f.Error(sqlite.Pos, "data.query", "'sqlite:' needs a 'query:' (SELECT ...)");
        }

        if (query is not null && sqlite is null)
        {
            f.Error(query.Pos, "data.query", "'query:' is only used with 'sqlite:'");
        }

        if (query is not null && !QueryText().IsMatch(query.Value))
        {
            f.Error(query.Pos, "data.query", "the query is empty; give one SELECT statement");
        }

        if (path is not null)
        {
            if (!DataFile().IsMatch(path.Value))
            {
                f.Error(path.Pos, "data.path", $"data file '{path.Value}' must end in .csv (comma), .tsv (tab) or .parquet");
            }
        }

        var missing = MissingPolicy.Error;
        if (e.TryGetValue("missing", out var m) && f.Text(m.Value, "data.missing") is { } mt
            && !SpecGrammar.MissingPolicies.TryGet(mt.Value, out missing))
        {
            var words = SpecGrammar.MissingPolicies.Primary.Select(w => $"'{w}'").ToList();
            f.Error(mt.Pos, "data.missing", $"data.missing must be {YamlFields.Or(words)}, got '{mt.Value}'");
        }

        return new DataSpec(path, sqlite, query, Get("filter"), Get("weight"), missing, f.Pos(map));
    }

    private static ModelSpec? ReadModel(YamlFields f, YamlNode node)
    {
        if (f.Mapping(node, "model") is not { } map)
        {
            return null;
        }

        var e = f.Entries(map, "model", SpecGrammar.Model);
        SpecText? response = null;
        if (!e.TryGetValue("response", out var r))
        {
            f.Error(map, "model.response", "missing 'response:' (the measured column or an expression)");
        }
        else
        {
            response = f.Text(r.Value, "model.response");
        }

        IReadOnlyList<TermSpec> terms = [];
        if (!e.TryGetValue("terms", out var t))
        {
            f.Error(map, "model.terms", "missing 'terms:' (coefficient name: basis, e.g. b0: 1, b1: x)");
        }
        else
        {
            terms = TermReader.Read(f, t.Value);
        }

        return response is null ? null : new ModelSpec(response, terms, f.Pos(map));
    }

    private static SolveSpec? ReadSolve(YamlFields f, YamlNode node)
    {
        if (f.Mapping(node, "solve") is not { } map)
        {
            return null;
        }

        var e = f.Entries(map, "solve", SpecGrammar.Solve);
        var method = SolveMethod.Auto;
        var methods = SpecGrammar.SolveMethods;
        if (e.TryGetValue("method", out var m) && f.Text(m.Value, "solve.method") is { } mt && !methods.TryGet(mt.Value, out method))
        {
            f.Error(mt.Pos, "solve.method", $"solve.method must be {YamlFields.Or(methods.Primary)}, got '{mt.Value}'{NameSuggester.Hint(mt.Value, methods.Words)}");
            method = SolveMethod.Auto;
        }

        double? limit = null;
        if (e.TryGetValue("time-limit", out var tl) && f.Number(tl.Value, "solve.time-limit") is { } seconds)
        {
            if (!SpecGrammar.Solve.RangeOf("time-limit").Contains(seconds))
            {
                f.Error(tl.Value, "solve.time-limit", $"solve.time-limit must be a positive number of seconds, got {seconds}");
            }

            limit = seconds;
        }

        var form = LpForm.Auto;
        if (e.TryGetValue("formulation", out var fo) && f.Text(fo.Value, "solve.formulation") is { } ft
            && !SpecGrammar.LpForms.TryGet(ft.Value, out form))
        {
            f.Error(ft.Pos, "solve.formulation", $"solve.formulation must be {YamlFields.Or(SpecGrammar.LpForms.Primary)}, got '{ft.Value}'");
            form = LpForm.Auto;
        }

        return new SolveSpec(method, limit, form);
    }

    private static ReportSpec? ReadReport(YamlFields f, YamlNode node)
    {
        if (f.Mapping(node, "report") is not { } map)
        {
            return null;
        }

        var e = f.Entries(map, "report", SpecGrammar.Report);
        var formats = new List<ReportFormat>();
        if (e.TryGetValue("formats", out var fm) && f.TextList(fm.Value, "report.formats") is { } list)
        {
            foreach (var item in list)
            {
                if (SpecGrammar.ReportFormats.TryGet(item.Value, out var fmt))
                {
                    if (!formats.Contains(fmt))
                    {
                        formats.Add(fmt);
                    }
                }
                else
                {
                    f.Error(item.Pos, "report.formats", $"unknown report format '{item.Value}'; use {YamlFields.Or(SpecGrammar.ReportFormats.Primary)}");
                }
            }
        }
        else
        {
            formats.AddRange(DefaultReport.Formats);
        }

        var accept = e.TryGetValue("accept", out var a) ? f.TextList(a.Value, "report.accept") ?? [] : [];
        var templates = e.TryGetValue("templates", out var tp) ? f.Text(tp.Value, "report.templates") : null;
        var uncertainty = e.TryGetValue("uncertainty", out var u) ? UncertaintyReader.Read(f, u.Value) : null;
        return new ReportSpec(formats, accept, templates) { Uncertainty = uncertainty };
    }

    /// <summary>The fit name implied by a spec's file name: without .fit.yaml (or .yaml/.yml).</summary>
    public static string DefaultName(string path)
    {
        var file = Path.GetFileName(path ?? "");
        foreach (var suffix in (string[])[".fit.yaml", ".fit.yml", ".yaml", ".yml"])
        {
            if (file.EndsWith(suffix, StringComparison.OrdinalIgnoreCase))
            {
                return file[..^suffix.Length];
            }
        }

        return file;
    }

    [GeneratedRegex(SpecGrammar.FitNamePattern)]
    private static partial Regex ValidName();

    [GeneratedRegex(SpecGrammar.DataFilePattern)]
    private static partial Regex DataFile();

    [GeneratedRegex(SpecGrammar.QueryPattern)]
    private static partial Regex QueryText();
}
