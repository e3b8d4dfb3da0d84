using System.Globalization;
using System.Text;

namespace FitSpec.ClusterTests.Support;

/// <summary>
/// Writes a batch of small invented calibration fits (load cells and linearised thermistors, y ≈ a + b·x,
/// eight readings each) into one folder: losses l2, l1 and Huber in turn, and every other fit with a
/// constraint. The readings are drawn from a seeded generator, so every run writes the same files.
/// </summary>
public static class SpecBatch
{
    public const int Size = 200;

    private static readonly string[] Losses = ["l2", "l1", "{kind: huber, width: 0.05}"];

    private static readonly string[] Constraints =
    [
        "  - \"gain >= 0\"",
        "  - {kind: bounds, on: offset, min: -2, max: 2}",
        "  - {kind: increasing, in: x, over: [0, 70]}",
        "  - {kind: value, at: {x: 0}, equals: 0}",
    ];

    /// <summary>Writes the batch into folder and returns the fit names, in name order.</summary>
    public static IReadOnlyList<string> Write(string folder)
    {
        var random = new Random(20261202);
        var names = new List<string>();
        for (var i = 0; i < Size; i++)
        {
            var name = (i % 2 == 0 ? "loadcell-" : "thermistor-") + i.ToString("D3", CultureInfo.InvariantCulture);
            names.Add(name);
            File.WriteAllText(Path.Combine(folder, name + ".csv"), Readings(random, pinnedAtZero: i % 8 == 7));
            File.WriteAllText(Path.Combine(folder, name + ".fit.yaml"), Spec(name, i));
        }

        return names;
    }

    private static string Readings(Random random, bool pinnedAtZero)
    {
        var offset = pinnedAtZero ? 0 : random.NextDouble() * 2 - 1;
        var gain = 0.5 + random.NextDouble() * 2.5;
        var csv = new StringBuilder("x,y\n");
        for (var k = 0; k < 8; k++)
        {
            var x = k * 10.0;
            var noise = (random.NextDouble() - 0.5) * 0.1;
            csv.Append(CultureInfo.InvariantCulture, $"{x:0.0},{offset + gain * x + noise:0.00000}\n");
        }

        return csv.ToString();
    }

    private static string Spec(string name, int i)
    {
        var spec = new StringBuilder();
        spec.Append(CultureInfo.InvariantCulture, $"fitspec: 1\nname: {name}\ntitle: Invented calibration {name}\n");
        spec.Append(CultureInfo.InvariantCulture, $"data:\n  path: {name}.csv\n");
        spec.Append("model:\n  response: y\n  terms:\n    offset: 1\n    gain: x\n");
        spec.Append(CultureInfo.InvariantCulture, $"loss: {Losses[i % Losses.Length]}\n");
        if (i % 2 == 1)
        {
            spec.Append("constraints:\n").Append(Constraints[i / 2 % Constraints.Length]).Append('\n');
        }

        return spec.ToString();
    }
}
