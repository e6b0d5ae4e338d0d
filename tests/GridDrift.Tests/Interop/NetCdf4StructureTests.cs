using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Interop;

/// <summary>
/// netCDF-4 structure read through PureHDF, checked against python netCDF4 on a file that python
/// netCDF4 itself writes in the test run (script beside this test): nested groups, dimensions
/// from dimension scales (one without a coordinate variable), an unlimited dimension, deflate
/// and shuffle, NC_STRING data and attributes; compound, enum and vlen variables are listed with
/// their kind and refused clearly, while the rest of the file reads.
/// </summary>
public class NetCdf4StructureTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void Nested_groups_strings_and_user_types_read_like_python_netCDF4()
    {
        using var dir = new TempFolder();
        string path = dir.File("groups.nc");
        ExternalTools.RunPython("make_netcdf4_groups.py", path);
        var reference = ReferenceDump.Of(path);
        using var reader = DatasetFiles.Open(path);
        Assert.Equal("netCDF-4", reader.Format);

        var dims = reader.Dimensions.ToDictionary(d => d.Name);
        foreach (var (name, size, unlimited) in reference.Dimensions)
        {
            Assert.Equal(size, dims[name].Length);
            Assert.Equal(unlimited, dims[name].IsUnlimited);
        }
        Assert.Equal(reference.Variables.Select(v => v.Name).Order(), reader.Variables.Select(v => v.Name).Order());

        foreach (var (name, expected) in reference.Variables.Select(p => (p.Name, p.Value)))
        {
            var v = reader.RequireVariable(name);
            Assert.Equal(ReferenceDump.CdlKind(expected.GetProperty("kind").GetString()!), v.TypeName);
            if (!expected.TryGetProperty("values", out var values)) continue;
            if (v.Type == NcType.String) Assert.Equal(values.EnumerateArray().Select(e => e.GetString()), reader.ReadStrings(v));
            else Assert.Equal(ReferenceDump.Numbers(values), reader.ReadAllDoubles(v));
        }
        Assert.Equal(["satellite channel 6.2 um", "reanalysis"], (string[])reader.Attributes.Find("sources")!.Values);
        Assert.Equal(["observations/lat", "observations/lon"], reader.RequireVariable("observations/tb").Dimensions.Skip(1).Select(d => d.Name));
    }

    [InteropTheory(Needs.PythonNetcdf)]
    [InlineData("pairs", "compound")]
    [InlineData("sky", "enum")]
    [InlineData("ragged", "variable-length")]
    public void User_defined_types_are_listed_and_refused_with_their_kind(string variable, string kind)
    {
        using var dir = new TempFolder();
        string path = dir.File("groups.nc");
        ExternalTools.RunPython("make_netcdf4_groups.py", path);
        using var reader = DatasetFiles.Open(path);
        var v = reader.RequireVariable(variable);
        Assert.Equal(NcType.Unsupported, v.Type);
        Assert.Equal(kind, v.UnsupportedKind);
        var e = Assert.Throws<BadInputException>(() => reader.ReadAllDoubles(v));
        Assert.Contains(kind, e.Message);
        Assert.Contains(variable, e.Message);
        var cli = CliRun.Run("describe", path);
        Assert.Equal(0, cli.ExitCode);
        Assert.Contains($"({kind})", cli.Stdout);
    }
}
