using System.Globalization;
using System.Numerics;
using FitSpec.Diagnostics;
using Parquet;
using Parquet.Schema;

namespace FitSpec.Data;

/// <summary>
/// Reads the requested columns of a Parquet file into double arrays, row group by row group. Numeric
/// columns of any width (integers, floats, decimals, nullable or not) become doubles; a null or a value
/// that is not finite is "missing" (flagged with <c>drop</c>, otherwise an error naming the row and the
/// column). Rows are numbered from 1 across all row groups; that number stands where a CSV has its line.
/// </summary>
internal static class ParquetColumnReader
{
    private const int MaxErrors = 20;

    public static RawColumns Read(string path, string errorPath, Func<IReadOnlyList<string>, IReadOnlyList<string>> selectColumns, bool dropMissing, int maxRows)
    {
        using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16);
        var reader = Decode(errorPath, () => ParquetReader.CreateAsync(stream, null, leaveStreamOpen: true).GetAwaiter().GetResult());
        try
        {
            return Read(reader, errorPath, selectColumns, dropMissing, maxRows);
        }
        finally
        {
            reader.DisposeAsync().AsTask().GetAwaiter().GetResult();
        }
    }

    private static RawColumns Read(ParquetReader reader, string errorPath, Func<IReadOnlyList<string>, IReadOnlyList<string>> selectColumns, bool dropMissing, int maxRows)
    {
        var (fields, groups) = Decode(errorPath, () => (reader.Schema.Fields, reader.RowGroups));
        var header = fields.Select(f => f.Name).ToArray();
        var names = selectColumns(header).Distinct(StringComparer.Ordinal).ToArray();
        var columns = names.Select(name => NumericField(fields, header, name, errorPath)).ToArray();

        var counts = groups.Select(g => g.RowCount).ToArray();
        if (counts.Any(c => c < 0))
        {
            throw Unreadable(errorPath, "a row group has a negative row count");
        }

        var total = counts.Sum();
        if (total > maxRows)
        {
            throw new FitSpecException(new Diagnostic(errorPath, null, null, null, $"more than {maxRows} data rows ({total}); this is the limit for one fit"));
        }

        var rows = (int)total;
        var buffers = names.Select(_ => new double[rows]).ToArray();
        var missing = new bool[rows];
        var errors = new List<Diagnostic>();
        var offset = 0;
        for (var g = 0; g < groups.Count; g++)
        {
            var group = groups[g];
            var count = (int)counts[g];
            for (var k = 0; k < columns.Length; k++)
            {
                var values = buffers[k].AsMemory(offset, count);
                var field = columns[k];
                Decode(errorPath, () => ReadInto(group, field, values));
                var span = values.Span;
                for (var i = 0; i < count; i++)
                {
                    if (double.IsFinite(span[i]))
                    {
                        continue;
                    }

                    missing[offset + i] = true;
                    if (!dropMissing && errors.Count < MaxErrors)
                    {
                        var row = offset + i + 1;
                        errors.Add(new Diagnostic(errorPath, row, null, names[k], Describe(row, span[i])));
                    }
                }
            }

            offset += count;
        }

        if (errors.Count > 0)
        {
            throw new FitSpecException([.. errors.OrderBy(e => e.Line)]);
        }

        var byName = new Dictionary<string, double[]>(StringComparer.Ordinal);
        for (var k = 0; k < names.Length; k++)
        {
            byName[names[k]] = buffers[k];
        }

        var lines = Enumerable.Range(1, rows).ToArray();
        return new RawColumns(header, byName, lines, missing, missing.Count(m => m));
    }

    // Nulls are read as NaN: "missing", like an empty CSV cell.
    private static int ReadInto(ParquetRowGroupReader group, DataField field, Memory<double> target) => field.ClrType switch
    {
        var t when t == typeof(double) => Read<double>(group, field, target),
        var t when t == typeof(float) => Read<float>(group, field, target),
        var t when t == typeof(Half) => Read<Half>(group, field, target),
        var t when t == typeof(decimal) => Read<decimal>(group, field, target),
        var t when t == typeof(long) => Read<long>(group, field, target),
        var t when t == typeof(ulong) => Read<ulong>(group, field, target),
        var t when t == typeof(int) => Read<int>(group, field, target),
        var t when t == typeof(uint) => Read<uint>(group, field, target),
        var t when t == typeof(short) => Read<short>(group, field, target),
        var t when t == typeof(ushort) => Read<ushort>(group, field, target),
        var t when t == typeof(sbyte) => Read<sbyte>(group, field, target),
        var t when t == typeof(byte) => Read<byte>(group, field, target),
        _ => throw new InvalidOperationException($"no reader for column type {field.ClrType}"),
    };

    private static int Read<T>(ParquetRowGroupReader group, DataField field, Memory<double> target)
        where T : struct, INumberBase<T>
    {
        var values = new T?[target.Length];
        group.ReadAsync<T>(field, values.AsMemory(), null, CancellationToken.None).AsTask().GetAwaiter().GetResult();
        var span = target.Span;
        for (var i = 0; i < values.Length; i++)
        {
            span[i] = values[i] is { } v ? double.CreateSaturating(v) : double.NaN;
        }

        return values.Length;
    }

    private static readonly HashSet<Type> NumericTypes =
    [
        typeof(double), typeof(float), typeof(Half), typeof(decimal),
        typeof(long), typeof(ulong), typeof(int), typeof(uint), typeof(short), typeof(ushort), typeof(sbyte), typeof(byte),
    ];

    private static DataField NumericField(IReadOnlyList<Field> fields, string[] header, string name, string errorPath)
    {
        var matches = fields.Where(f => string.Equals(f.Name, name, StringComparison.Ordinal)).ToList();
        if (matches.Count == 0)
        {
            var hint = NameSuggester.Hint(name, header);
            throw new FitSpecException(new Diagnostic(errorPath, null, null, name, $"no column '{name}' in the Parquet file{hint}; columns are: {string.Join(", ", header)}"));
        }

        if (matches.Count > 1)
        {
            throw new FitSpecException(new Diagnostic(errorPath, null, null, name, $"column '{name}' appears more than once in the Parquet schema; give each column its own name"));
        }

        if (matches[0] is not DataField { IsArray: false } field)
        {
            throw new FitSpecException(new Diagnostic(errorPath, null, null, name, $"column '{name}' is a {Kind(matches[0])}, not a column of numbers; only flat numeric columns can be used"));
        }

        if (!NumericTypes.Contains(field.ClrType))
        {
            throw new FitSpecException(new Diagnostic(errorPath, null, null, name, $"column '{name}' holds {TypeName(field.ClrType)} values, not numbers; only integer, floating-point and decimal columns can be used"));
        }

        return field;
    }

    private static string Kind(Field field) => field switch
    {
        ListField => "list",
        MapField => "map",
        StructField => "struct",
        DataField { IsArray: true } => "repeated (list) field",
        _ => field.SchemaType.ToString().ToLowerInvariant(),
    };

    private static string TypeName(Type type) => type switch
    {
        _ when type == typeof(string) || type == typeof(ReadOnlyMemory<char>) => "text (string)",
        _ when type == typeof(bool) => "boolean",
        _ when type == typeof(DateTime) || type == typeof(DateTimeOffset) => "timestamp",
        _ when type == typeof(DateOnly) => "date",
        _ when type == typeof(TimeSpan) || type == typeof(TimeOnly) => "time",
        _ when type == typeof(byte[]) || type == typeof(ReadOnlyMemory<byte>) => "binary",
        _ when type == typeof(Guid) => "UUID",
        _ => type.Name,
    };

    private static string Describe(int row, double value) => double.IsNaN(value)
        ? $"row {row}: missing value (null or NaN); fill it in or set 'data.missing: drop'"
        : $"row {row}: value {value.ToString(CultureInfo.InvariantCulture)} is not a finite number; fix it or set 'data.missing: drop'";

    // A damaged file can make the decoder fail in many ways (its own exception, an index or a length out of
    // range, an allocation too large): each is reported as an unreadable file, never as a crash.
    private static T Decode<T>(string errorPath, Func<T> read)
    {
        try
        {
            return read();
        }
        catch (Exception e) when (e is not (FitSpecException or OperationCanceledException))
        {
            throw Unreadable(errorPath, e.Message.ReplaceLineEndings(" "));
        }
    }

    private static FitSpecException Unreadable(string errorPath, string why) =>
        new(new Diagnostic(errorPath, null, null, null, $"cannot read the Parquet file ({why}); is it a complete, undamaged Parquet file?"));
}
