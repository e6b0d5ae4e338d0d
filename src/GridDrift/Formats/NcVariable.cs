namespace GridDrift.Formats;

/// <summary>
/// A variable as a file declares it: raw type, dimensions and attributes, nothing decoded.
/// Variables in nested netCDF-4 groups carry their path in <see cref="Name"/> ("group/var").
/// </summary>
internal sealed class NcVariable
{
    public string Name { get; }
    public NcType Type { get; }
    public IReadOnlyList<NcDimension> Dimensions { get; }
    public IReadOnlyList<NcAttribute> Attributes { get; }
    /// <summary>For <see cref="NcType.Unsupported"/>: "compound", "variable-length", "opaque" or "enum".</summary>
    public string? UnsupportedKind { get; }

    public NcVariable(string name, NcType type, IReadOnlyList<NcDimension> dimensions,
        IReadOnlyList<NcAttribute> attributes, string? unsupportedKind = null)
    {
        Name = name;
        Type = type;
        Dimensions = dimensions;
        Attributes = attributes;
        UnsupportedKind = unsupportedKind;
    }

    public int Rank => Dimensions.Count;

    public long[] Shape
    {
        get
        {
            var shape = new long[Dimensions.Count];
            for (int i = 0; i < shape.Length; i++) shape[i] = Dimensions[i].Length;
            return shape;
        }
    }

    public long ElementCount
    {
        get
        {
            long n = 1;
            foreach (var d in Dimensions) n = checked(n * d.Length);
            return n;
        }
    }

    public bool IsRecordVariable => Dimensions.Count > 0 && Dimensions[0].IsUnlimited;

    public string TypeName => Type == NcType.Unsupported ? UnsupportedKind ?? "unsupported" : NcTypes.CdlName(Type);

    public override string ToString() =>
        $"{TypeName} {Name}({string.Join(", ", Dimensions.Select(d => d.Name))})";
}
