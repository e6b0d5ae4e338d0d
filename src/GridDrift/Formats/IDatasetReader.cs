namespace GridDrift.Formats;

/// <summary>
/// The one table of operations every on-disk format implements (after netCDF-C's dispatch
/// table): inquire dimensions, variables and attributes, and read a hyperslab into a caller's
/// buffer. Everything above this interface is format-blind.
/// </summary>
internal interface IDatasetReader : IDisposable
{
    string Path { get; }
    /// <summary>"classic", "64-bit offset", "64-bit data" (CDF-5), "netCDF-4", "netCDF-4 classic model".</summary>
    string Format { get; }
    IReadOnlyList<NcDimension> Dimensions { get; }
    IReadOnlyList<NcAttribute> Attributes { get; }
    IReadOnlyList<NcVariable> Variables { get; }

    /// <summary>
    /// Reads the hyperslab [start, start + count) of a numeric or char variable as raw values in
    /// the variable's own type, little-endian, into <paramref name="destination"/>
    /// (exactly ∏count × size-of-type bytes). Safe to call from several threads at once.
    /// </summary>
    void ReadRaw(NcVariable variable, ReadOnlySpan<long> start, ReadOnlySpan<long> count, Span<byte> destination);

    /// <summary>Reads a whole NC_STRING variable (row-major).</summary>
    string[] ReadStrings(NcVariable variable);
}

internal static class DatasetReaderExtensions
{
    public static NcVariable? FindVariable(this IDatasetReader reader, string name)
    {
        foreach (var v in reader.Variables)
            if (v.Name == name) return v;
        return null;
    }

    public static NcVariable RequireVariable(this IDatasetReader reader, string name) =>
        reader.FindVariable(name) ?? throw new BadInputException(reader.Path, name,
            "no such variable (the file has: " + string.Join(", ", reader.Variables.Select(v => v.Name)) + ")");

    /// <summary>Reads a hyperslab of any numeric variable converted to double.</summary>
    public static void ReadDoubles(this IDatasetReader reader, NcVariable variable,
        ReadOnlySpan<long> start, ReadOnlySpan<long> count, Span<double> destination)
    {
        RawValues.RequireNumeric(reader.Path, variable);
        int size = NcTypes.SizeOf(variable.Type);
        byte[] raw = System.Buffers.ArrayPool<byte>.Shared.Rent(destination.Length * size);
        try
        {
            var rawSpan = raw.AsSpan(0, destination.Length * size);
            reader.ReadRaw(variable, start, count, rawSpan);
            RawValues.ToDouble(variable.Type, rawSpan, destination);
        }
        finally
        {
            System.Buffers.ArrayPool<byte>.Shared.Return(raw);
        }
    }

    /// <summary>Reads a whole numeric variable converted to double (for coordinates and small arrays).</summary>
    public static double[] ReadAllDoubles(this IDatasetReader reader, NcVariable variable)
    {
        var shape = variable.Shape;
        var values = new double[checked((int)variable.ElementCount)];
        reader.ReadDoubles(variable, new long[shape.Length], shape, values);
        return values;
    }

    /// <summary>
    /// Reads a char or string variable as text: a char array gives one string per index of its
    /// leading dimensions (the last dimension is the string length, trailing NULs trimmed).
    /// </summary>
    public static string[] ReadText(this IDatasetReader reader, NcVariable variable)
    {
        if (variable.Type == NcType.String) return reader.ReadStrings(variable);
        if (variable.Type != NcType.Char)
            throw new BadInputException(reader.Path, variable.Name, $"is of type {variable.TypeName}, not text");
        var shape = variable.Shape;
        var bytes = new byte[checked((int)variable.ElementCount)];
        reader.ReadRaw(variable, new long[shape.Length], shape, bytes);
        int width = shape.Length == 0 ? 1 : (int)shape[^1];
        if (width == 0) return [];
        int rows = bytes.Length / width;
        var result = new string[rows];
        for (int r = 0; r < rows; r++)
        {
            var row = bytes.AsSpan(r * width, width);
            int end = row.IndexOf((byte)0);
            result[r] = System.Text.Encoding.UTF8.GetString(end < 0 ? row : row[..end]);
        }
        return result;
    }
}
