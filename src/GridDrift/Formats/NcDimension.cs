namespace GridDrift.Formats;

/// <summary>A named axis length. An unlimited dimension grows as records are appended.</summary>
internal sealed class NcDimension(string name, long length, bool isUnlimited)
{
    public string Name { get; } = name;
    /// <summary>For an unlimited netCDF-4 dimension, the longest extent of any variable along it.</summary>
    public long Length { get; internal set; } = length;
    public bool IsUnlimited { get; } = isUnlimited;

    public override string ToString() => IsUnlimited ? $"{Name} = UNLIMITED ({Length})" : $"{Name} = {Length}";
}
