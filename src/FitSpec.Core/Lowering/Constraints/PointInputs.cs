using FitSpec.Spec;

namespace FitSpec.Lowering.Constraints;

/// <summary>Checks that a point given in at: names every model input it must, and nothing else.</summary>
internal static class PointInputs
{
    public static Dictionary<string, double>? Complete(
        LoweringContext context, ConstraintSpec c, IReadOnlyList<KeyValuePair<string, double>> at, string? variable, double variableValue)
    {
        var inputs = context.Design.Inputs;
        var point = new Dictionary<string, double>(StringComparer.Ordinal);
        var ok = true;
        foreach (var (name, value) in at)
        {
            if (name == variable)
            {
                context.Error(c.Pos, "constraints.at", $"'{name}' is the input the constraint runs over; leave it out of 'at:'");
                ok = false;
            }
            else if (!inputs.Contains(name))
            {
                var hint = Diagnostics.NameSuggester.Hint(name, inputs);
                context.Error(c.Pos, "constraints.at", $"'{name}' in 'at:' is not an input of the model{hint}; inputs are: {string.Join(", ", inputs)}");
                ok = false;
            }
            else
            {
                point[name] = value;
            }
        }

        if (variable is not null)
        {
            point[variable] = variableValue;
        }

        var missing = inputs.Where(i => !point.ContainsKey(i)).ToList();
        if (missing.Count > 0)
        {
            context.Error(c.Pos, "constraints.at", $"'at:' must give a value for every other input of the model; missing: {string.Join(", ", missing)}");
            ok = false;
        }

        return ok ? point : null;
    }
}
