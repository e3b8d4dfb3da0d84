using System.CommandLine;
using FitSpec.Results;
using FitSpec.Spec.Schema;

namespace FitSpec.Cli;

/// <summary>`fitspec schema`: the JSON Schema of the spec language, for editors that check YAML against one.</summary>
internal static class SchemaCommand
{
    public static Command Build()
    {
        var outFile = new Option<string?>("--out") { Description = "Write the schema to this file (replaced whole, never half-written) instead of stdout" };
        var command = new Command("schema", "Print the JSON Schema (draft 2020-12) of the spec language, generated from the parser's grammar") { outFile };
        command.SetAction(parse =>
        {
            var schema = SchemaGenerator.Generate();
            if (parse.GetValue(outFile) is not { Length: > 0 } target)
            {
                Console.Out.Write(schema);
                return 0;
            }

            try
            {
                Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(target))!);
                AtomicFile.Write(target, schema);
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                Console.Error.WriteLine($"{target}: error: cannot write the schema: {e.Message}");
                return 2;
            }

            return 0;
        });
        return command;
    }
}
