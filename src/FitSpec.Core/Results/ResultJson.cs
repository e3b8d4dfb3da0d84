using System.Text;
using System.Text.Encodings.Web;
using System.Text.Json;
using FitSpec.Verification;

namespace FitSpec.Results;

/// <summary>The machine-readable record, &lt;name&gt;.result.json: fixed key order, non-finite numbers as null.</summary>
public static class ResultJson
{
    public static string Write(FitResult r)
    {
        ArgumentNullException.ThrowIfNull(r);
        using var buffer = new MemoryStream();
        using (var w = new Utf8JsonWriter(buffer, new JsonWriterOptions { Indented = true, Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping }))
        {
            w.WriteStartObject();
            w.WriteNumber("fitspec", 1);
            w.WriteString("name", r.Name);
            w.WriteString("status", r.Status);
            Str(w, "status_detail", r.StatusDetail);
            Str(w, "title", r.Title);
            Str(w, "description", r.Description);
            if (r.Problem is { } p)
            {
                w.WriteStartObject("problem");
                w.WriteString("class", p.Class);
                w.WriteNumber("variables", p.Variables);
                w.WriteNumber("rows", p.Rows);
                w.WriteNumber("nonzeros", p.Nonzeros);
                w.WriteString("solver", p.Solver);
                w.WriteString("method", p.Method);
                w.WriteString("formulation", p.Formulation);
                // Wall-clock time differs run to run: only with --stamp, so that results are otherwise byte-identical.
                if (r.Provenance.Stamp is not null)
                {
                    Num(w, "solve_seconds", Math.Round(p.SolveSeconds, 6));
                }

                w.WriteNumber("iterations", p.Iterations);
                if (p.MipGap is { } gap)
                {
                    Num(w, "mip_gap", gap);
                }

                w.WriteEndObject();
            }

            Num(w, "objective", r.Objective);
            w.WriteStartObject("coefficients");
            foreach (var c in r.Coefficients)
            {
                Num(w, c.Name, c.Value);
            }

            w.WriteEndObject();
            if (r.Data is { } d)
            {
                w.WriteStartObject("data");
                w.WriteString("file", d.File);
                w.WriteString("sha256", d.Sha256);
                w.WriteNumber("rows", d.Rows);
                w.WriteNumber("used", d.Used);
                w.WriteNumber("dropped_missing", d.DroppedMissing);
                w.WriteNumber("dropped_filter", d.DroppedFilter);
                w.WriteEndObject();
            }

            if (r.Metrics is { } m)
            {
                w.WriteStartObject("metrics");
                w.WriteNumber("observations", m.Observations);
                Num(w, "rmse", m.Rmse);
                Num(w, "mae", m.Mae);
                Num(w, "max_abs_residual", m.MaxAbsResidual);
                Num(w, "r2", m.R2);
                Num(w, "residual_sd", m.ResidualSd);
                w.WriteEndObject();
            }

            w.WriteStartArray("constraints");
            foreach (var c in r.Constraints)
            {
                WriteConstraint(w, c);
            }

            w.WriteEndArray();
            WriteNoSolution(w, r);
            w.WriteStartArray("acceptance");
            foreach (var a in r.Acceptance)
            {
                w.WriteStartObject();
                w.WriteString("rule", a.Rule);
                Num(w, "value", a.Value);
                w.WriteBoolean("passed", a.Passed);
                Str(w, "error", a.Error);
                w.WriteEndObject();
            }

            w.WriteEndArray();
            if (r.Verification is { } v)
            {
                WriteVerification(w, v);
            }

            if (r.Statement is { } s)
            {
                w.WriteStartObject("statement");
                w.WriteString("response", s.Response);
                w.WriteString("model", s.Model);
                w.WriteString("loss", s.Loss);
                w.WriteString("loss_formula", s.LossFormula);
                Strings(w, "penalties", s.Penalties);
                Strings(w, "constraints", s.Constraints);
                Str(w, "weight", s.Weight);
                Str(w, "filter", s.Filter);
                w.WriteEndObject();
            }

            w.WriteStartArray("largest_residuals");
            foreach (var lr in r.LargestResiduals)
            {
                w.WriteStartObject();
                w.WriteNumber("row", lr.Row);
                w.WriteNumber("line", lr.Line);
                Num(w, "observed", lr.Observed);
                Num(w, "fitted", lr.Fitted);
                Num(w, "residual", lr.Residual);
                w.WriteEndObject();
            }

            w.WriteEndArray();
            // Data-file lines of the observations a local method treated as outliers (truncated-l2).
            w.WriteStartArray("outliers");
            foreach (var line in r.OutlierLines)
            {
                w.WriteNumberValue(line);
            }

            w.WriteEndArray();
            WriteDiagnostics(w, r);
            WriteUncertainty(w, r.Uncertainty);
            w.WriteStartArray("lowering");
            foreach (var n in r.Lowering)
            {
                w.WriteStartObject();
                w.WriteString("item", n.Item);
                w.WriteString("label", n.Label);
                w.WriteString("how", n.How);
                w.WriteEndObject();
            }

            w.WriteEndArray();
            var pv = r.Provenance;
            w.WriteStartObject("provenance");
            w.WriteString("spec_sha256", pv.SpecSha256);
            Str(w, "data_sha256", pv.DataSha256);
            w.WriteString("tool_version", pv.ToolVersion);
            w.WriteString("solver", pv.Solver);
            w.WriteString("runtime", pv.Runtime);
            w.WriteString("os", pv.OperatingSystem);
            Str(w, "commit", pv.Commit);
            w.WriteString("command_line", pv.CommandLine);
            Str(w, "stamp", pv.Stamp);
            w.WriteEndObject();
            w.WriteStartArray("errors");
            foreach (var e in r.Errors)
            {
                w.WriteStartObject();
                w.WriteString("file", e.File);
                Int(w, "line", e.Line);
                Int(w, "column", e.Column);
                Str(w, "field", e.Field);
                w.WriteString("message", e.Message);
                w.WriteEndObject();
            }

            w.WriteEndArray();
            w.WriteEndObject();
        }

        return Encoding.UTF8.GetString(buffer.ToArray()) + "\n";
    }

    private static void WriteDiagnostics(Utf8JsonWriter w, FitResult r)
    {
        w.WriteStartObject("diagnostics");
        w.WriteStartArray("outside_width_lines");
        foreach (var line in r.OutsideWidthLines)
        {
            w.WriteNumberValue(line);
        }

        w.WriteEndArray();
        if (r.Leverage is { } lev)
        {
            w.WriteStartObject("leverage");
            Num(w, "mean", lev.Mean);
            Num(w, "threshold", lev.Threshold);
            w.WriteStartArray("highest");
            foreach (var h in lev.Highest)
            {
                w.WriteStartObject();
                w.WriteNumber("row", h.Row);
                w.WriteNumber("line", h.Line);
                Num(w, "value", h.Value);
                w.WriteEndObject();
            }

            w.WriteEndArray();
            w.WriteEndObject();
        }
        else
        {
            w.WriteNull("leverage");
        }

        w.WriteStartArray("dual_readings");
        foreach (var d in r.DualReadings)
        {
            w.WriteStartObject();
            w.WriteString("label", d.Label);
            Num(w, "dual", d.Dual);
            w.WriteString("sentence", d.Sentence);
            w.WriteEndObject();
        }

        w.WriteEndArray();
        if (r.Ranging is { } rg)
        {
            w.WriteStartObject("ranging");
            Str(w, "note", rg.Note);
            w.WriteStartArray("constraints");
            foreach (var b in rg.Constraints)
            {
                w.WriteStartObject();
                w.WriteString("label", b.Label);
                Num(w, "value", b.Value);
                Num(w, "low", b.Low);
                Num(w, "high", b.High);
                Num(w, "objective_at_low", b.ObjectiveAtLow);
                Num(w, "objective_at_high", b.ObjectiveAtHigh);
                w.WriteEndObject();
            }

            w.WriteEndArray();
            w.WriteStartArray("coefficient_costs");
            foreach (var c in rg.Coefficients)
            {
                w.WriteStartObject();
                w.WriteString("name", c.Name);
                Num(w, "low", c.Low);
                Num(w, "high", c.High);
                w.WriteEndObject();
            }

            w.WriteEndArray();
            w.WriteEndObject();
        }
        else
        {
            w.WriteNull("ranging");
        }

        w.WriteEndObject();
    }

    private static void WriteUncertainty(Utf8JsonWriter w, UncertaintyInfo? u)
    {
        if (u is null)
        {
            w.WriteNull("uncertainty");
            return;
        }

        w.WriteStartObject("uncertainty");
        if (u.Classical is { } se)
        {
            w.WriteStartArray("standard_errors");
            foreach (var e in se)
            {
                w.WriteStartObject();
                w.WriteString("name", e.Name);
                Num(w, "value", e.Value);
                Num(w, "std_error", e.StdError);
                Num(w, "t_value", e.TValue);
                w.WriteEndObject();
            }

            w.WriteEndArray();
        }
        else
        {
            w.WriteNull("standard_errors");
        }

        if (u.Bootstrap is { } b)
        {
            w.WriteStartObject("bootstrap");
            w.WriteNumber("replicates", b.Replicates);
            w.WriteNumber("seed", b.Seed);
            w.WriteNumber("succeeded", b.Succeeded);
            Num(w, "level", b.Level);
            Str(w, "note", b.Note);
            w.WriteStartArray("intervals");
            foreach (var i in b.Intervals)
            {
                w.WriteStartObject();
                w.WriteString("name", i.Name);
                Num(w, "value", i.Value);
                Num(w, "low", i.Low);
                Num(w, "high", i.High);
                Num(w, "std_dev", i.StdDev);
                w.WriteEndObject();
            }

            w.WriteEndArray();
            w.WriteEndObject();
        }
        else
        {
            w.WriteNull("bootstrap");
        }

        w.WriteEndObject();
    }

    // Only for fits without a solution: the conflicting constraints, or the direction of unlimited decrease.
    private static void WriteNoSolution(Utf8JsonWriter w, FitResult r)
    {
        if (r.Conflict is { } c)
        {
            w.WriteStartObject("conflict");
            Strings(w, "constraints", c.Labels);
            w.WriteBoolean("irreducible", c.Irreducible);
            Str(w, "note", c.Note);
            w.WriteEndObject();
        }

        if (r.FreeDirection is { } d)
        {
            w.WriteStartObject("free_direction");
            foreach (var component in d.Components)
            {
                Num(w, component.Name, component.Value);
            }

            w.WriteEndObject();
        }
    }

    private static void WriteConstraint(Utf8JsonWriter w, ConstraintCheck c)
    {
        w.WriteStartObject();
        w.WriteString("label", c.Label);
        w.WriteString("kind", c.Kind);
        w.WriteBoolean("active", c.Active);
        Num(w, "dual", c.Dual);
        Num(w, "violation", c.Violation);
        Num(w, "slack", c.Slack);
        Str(w, "grid", c.Grid);
        Int(w, "fine_grid_points", c.FineGridPoints);
        Num(w, "fine_grid_worst_violation", c.FineGridWorst);
        w.WriteEndObject();
    }

    private static void WriteVerification(Utf8JsonWriter w, Verification.Verification v)
    {
        w.WriteStartObject("verification");
        Num(w, "objective_recomputed", v.ObjectiveRecomputed);
        Num(w, "objective_program", v.SolverObjective);
        Num(w, "objective_relative_difference", v.ObjectiveRelativeDifference);
        Num(w, "max_constraint_violation", v.MaxConstraintViolation);
        Num(w, "dual_objective", v.DualObjective);
        Num(w, "duality_gap", v.DualityGap);
        Num(w, "dual_residual", v.DualResidual);
        Num(w, "optimality_residual", v.Stationarity);
        w.WriteString("optimality_residual_kind", v.StationarityKind);
        w.WriteBoolean("passed", v.Passed);
        Strings(w, "failures", v.Failures);
        w.WriteEndObject();
    }

    private static void Strings(Utf8JsonWriter w, string name, IReadOnlyList<string> items)
    {
        w.WriteStartArray(name);
        foreach (var s in items)
        {
            w.WriteStringValue(s);
        }

        w.WriteEndArray();
    }

    private static void Str(Utf8JsonWriter w, string name, string? value)
    {
        if (value is null)
        {
            w.WriteNull(name);
        }
        else
        {
            w.WriteString(name, value);
        }
    }

    private static void Int(Utf8JsonWriter w, string name, int? value)
    {
        if (value is { } v)
        {
            w.WriteNumber(name, v);
        }
        else
        {
            w.WriteNull(name);
        }
    }

    private static void Num(Utf8JsonWriter w, string name, double? value)
    {
        if (value is { } v && double.IsFinite(v))
        {
            w.WriteNumber(name, v);
        }
        else
        {
            w.WriteNull(name);
        }
    }
}
