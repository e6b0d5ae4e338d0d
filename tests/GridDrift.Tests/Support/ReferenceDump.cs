using System.Text.Json;

namespace GridDrift.Tests.Support;

/// <summary>What python netCDF4 (netCDF-C underneath) reports of a file: the witness for reader tests.</summary>
public sealed class ReferenceDump
{
    public required JsonElement Root { get; init; }

    public static ReferenceDump Of(string path, bool decoded = false, long maxElements = 200_000) =>
        new() { Root = JsonDocument.Parse(ExternalTools.RunPython("dump_netcdf.py", path, decoded ? "decoded" : "raw", maxElements.ToString())).RootElement };

    public string Format => Root.GetProperty("format").GetString()!;

    public IEnumerable<(string Name, long Size, bool Unlimited)> Dimensions =>
        Root.GetProperty("dimensions").EnumerateObject().Select(p =>
            (p.Name, p.Value.GetProperty("size").GetInt64(), p.Value.GetProperty("unlimited").GetBoolean()));

    public IEnumerable<JsonProperty> Variables => Root.GetProperty("variables").EnumerateObject();

    public JsonElement Variable(string name) => Root.GetProperty("variables").GetProperty(name);

    /// <summary>numpy's dtype names to NetCDF's CDL type names.</summary>
    public static string CdlKind(string numpyKind) => numpyKind switch
    {
        "int8" => "byte",
        "uint8" => "ubyte",
        "int16" => "short",
        "uint16" => "ushort",
        "int32" => "int",
        "uint32" => "uint",
        "int64" => "int64",
        "uint64" => "uint64",
        "float32" => "float",
        "float64" => "double",
        "bytes8" => "char",
        _ => numpyKind,
    };

    public static double[] Numbers(JsonElement values) =>
        values.EnumerateArray().Select(v => v.ValueKind switch
        {
            JsonValueKind.Null => double.NaN,
            JsonValueKind.String => v.GetString() == "inf" ? double.PositiveInfinity : double.NegativeInfinity,
            _ => v.GetDouble(),
        }).ToArray();
}
