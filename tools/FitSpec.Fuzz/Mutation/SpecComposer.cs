using System.Globalization;
using System.Text;
using CsCheck;
using FitSpec.Fuzz.Harness;

namespace FitSpec.Fuzz.Mutation;

/// <summary>
/// Whole specs assembled from the language's own parts over a demo data file: every term kind, loss, penalty
/// and constraint, with parameters drawn from ordinary values and from the edges (zero, negative, huge,
/// just outside a range). Most of these read, so they reach the design, lowering, solving and verification
/// stages that byte mutations of a seed rarely get past the reader to.
/// </summary>
public sealed class SpecComposer
{
    // Ordinary values mostly, edge values sometimes: a spec has a dozen parameters, and one bad one refuses it.
    private static readonly Gen<string> Real = Gen.Frequency(
        (6, Gen.OneOf("0.5", "1", "2", "3", "10", "0.25", "1e-3", "100", "0.1")),
        (1, Gen.OneOf("0", "-1", "-0.5", "1e308", "1e-308", "1e-9", "1e6", "4.9e-324")));

    private static readonly Gen<string> Count = Gen.Frequency(
        (6, Gen.OneOf("2", "3", "4", "6", "10")),
        (1, Gen.OneOf("0", "1", "30", "50", "1000", "100000", "-1", "2147483647")));

    private readonly IReadOnlyList<DataFile> _files;

    public SpecComposer(IReadOnlyList<NamedBytes> data)
    {
        ArgumentNullException.ThrowIfNull(data);
        _files = data.Select(d => new DataFile(d.Name, Header(d.Bytes, d.Name.EndsWith(".tsv", StringComparison.Ordinal)))).Where(f => f.Columns.Length >= 2).ToList();
        Specs = Gen.Int[0, _files.Count - 1].SelectMany(f => Compose(_files[f]));
    }

    public Gen<string> Specs { get; }

    private static string[] Header(byte[] bytes, bool tsv)
    {
        var text = Encoding.UTF8.GetString(bytes);
        var end = text.IndexOf('\n', StringComparison.Ordinal);
        return (end < 0 ? text : text[..end]).Trim().Split(tsv ? '\t' : ',');
    }

    private static Gen<string> Compose(DataFile file)
    {
        var columns = file.Columns;
        var column = Gen.OneOf(columns);
        var real = Real;
        var count = Count;
        var data = Gen.Select(Gen.Bool, Gen.Int[0, 3], column, real, (drop, extra, c, r) =>
        {
            var text = new StringBuilder($"data:\n  path: data/{file.Name}\n");
            if (drop)
            {
                text.Append("  missing: drop\n");
            }

            text.Append(extra switch
            {
                1 => $"  filter: \"{c} > {r}\"\n",
                2 => $"  weight: \"abs({c}) + {r}\"\n",
                3 => $"  weight: {c}\n",
                _ => "",
            });
            return text.ToString();
        });

        var term = Gen.OneOf(
            column.Select(c => $"{c}"),
            column.Select(c => $"\"{c}^2\""),
            column.Select(c => $"\"log(abs({c}) + 1)\""),
            column.Select(c => $"\"exp({c} / 100)\""),
            column.Select(c => $"\"1 / {c}\""),
            Gen.Select(column, count, (c, d) => $"{{polynomial: {c}, degree: {d}}}"),
            Gen.Select(column, count, Gen.OneOf("0", "1", "2", "3", "5", "9"), (c, k, d) => $"{{spline: {c}, knots: {k}, degree: {d}}}"),
            Gen.Select(column, Gen.OneOf(1, 10, 100, 1000), Gen.Int[2, 8], (c, step, n) => $"{{spline: {c}, at: [{string.Join(", ", Enumerable.Range(0, n).Select(k => (k * step).ToString(CultureInfo.InvariantCulture)))}]}}"),
            Gen.OneOf(columns.Select(c => $"{{columns: \"{c[..1]}*\"}}").Append("{columns: \"*\"}").ToArray()));
        var terms = Gen.Select(Gen.Bool, term.Array[1, 4], (constant, list) =>
        {
            var text = new StringBuilder("  terms:\n");
            if (constant)
            {
                text.Append("    b0: 1\n");
            }

            for (var i = 0; i < list.Length; i++)
            {
                text.Append(CultureInfo.InvariantCulture, $"    t{i + 1}: {list[i]}\n");
            }

            return text.ToString();
        });
        var model = Gen.Select(column, terms, (response, t) => $"model:\n  response: {response}\n{t}");

        var loss = Gen.OneOf(
            Gen.Frequency((12, Gen.OneOf("l2", "l1", "linf", "minimax", "none")), (1, Gen.OneOf("huber", "quantile"))).Select(k => $"loss: {k}\n"),
            Gen.Select(Gen.OneOf("quantile/tau", "huber/width", "deadzone/width", "log-barrier/limit", "lp/p", "truncated-l2/cap"), Gen.Frequency((3, Gen.OneOf("0.5", "0.25", "0.9")), (2, real)), (kp, v) =>
            {
                var parts = kp.Split('/');
                return $"loss: {{kind: {parts[0]}, {parts[1]}: {v}}}\n";
            }));

        var penalty = Gen.OneOf(
            real.Select(w => $"  - {{kind: l1, weight: {w}}}\n"),
            Gen.Select(real, Gen.OneOf("[t*]", "[b0]", "[\"*\"]", "[nothing]", "[]"), (w, on) => $"  - {{kind: l2, weight: {w}, on: {on}}}\n"),
            Gen.Select(count, real, Gen.OneOf("", ", norm: l1"), (o, w, n) => $"  - {{kind: smoothness, order: {o}, weight: {w}, on: [t*]{n}}}\n"),
            count.Select(m => $"  - {{kind: count, max: {m}}}\n"));
        var penalties = penalty.Array[0, 2].Select(list => list.Length == 0 ? "" : "penalties:\n" + string.Concat(list));

        var constraint = Gen.OneOf(
            Gen.Select(Gen.OneOf("t1", "b0", "t1 + t2", "2*t1 - b0", "t11", "t1/0"), Gen.OneOf(">=", "<=", "=="), real, (l, op, r) => $"  - \"{l} {op} {r}\"\n"),
            Gen.Select(real, real, (a, b) => $"  - {{kind: bounds, min: -{a.TrimStart('-')}, max: {b}}}\n"),
            Gen.Select(Gen.OneOf("increasing", "decreasing", "convex", "concave"), column, real, real, count, (k, c, a, b, g) => $"  - {{kind: {k}, in: {c}, over: [-{a.TrimStart('-')}, {b}], grid: {g}}}\n"),
            Gen.Select(column, real, real, (c, a, v) => $"  - {{kind: value, at: {{{c}: {a}}}, equals: {v}}}\n"),
            real.Select(m => $"  - {{kind: residuals, max-abs: {m}}}\n"));
        var constraints = constraint.Array[0, 3].Select(list => list.Length == 0 ? "" : "constraints:\n" + string.Concat(list));

        var solve = Gen.Select(Gen.Frequency((6, Gen.Const("auto")), (1, Gen.OneOf("qr", "simplex", "ipm"))), Gen.Frequency((4, Gen.Const("auto")), (1, Gen.OneOf("primal", "dual"))), (m, f) => $"solve:\n  method: {m}\n  formulation: {f}\n  time-limit: 5\n");
        var report = Gen.Frequency(
            (6, Gen.Const("")),
            (1, Gen.Select(Gen.Frequency((6, Gen.OneOf("10", "20")), (1, Gen.OneOf("2", "0"))), Gen.Frequency((4, Gen.OneOf("0.9", "0.95")), (1, Gen.OneOf("1", "0"))), (n, level) => $"report:\n  uncertainty: {{bootstrap: {n}, seed: 7, level: {level}}}\n")),
            (1, Gen.Const("report:\n  accept:\n    - \"r2 >= 0.5\"\n    - \"t1 <= 1e9\"\n")));

        return Gen.Select(data, model, loss, penalties, constraints, solve, report, (d, m, l, p, c, s, r) =>
            $"fitspec: 1\nname: composed\n{d}{m}{l}{p}{c}{s}{r}");
    }

    private sealed record DataFile(string Name, string[] Columns);
}

