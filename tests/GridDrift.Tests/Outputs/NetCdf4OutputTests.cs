using System.Text.Json;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Outputs;

/// <summary>
/// `--format nc4 --deflate N --shuffle`: products written through netCDF-C (libnetcdf19) read
/// back by netCDF-C's ncdump and by python netCDF4, with the values of the same command's
/// classic (CDF-2) product, the record dimension unlimited, one chunk per frame and the asked-for
/// filters; GridDrift's own reader (PureHDF) opens them too.
/// </summary>
public class NetCdf4OutputTests
{
    [InteropFact(Needs.PythonNetcdf | Needs.Ncdump)]
    public void Climatology_and_anomalies_in_nc4_equal_their_classic_products()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 120, nlat: 6, nlon: 8, stepHours: 24, missing: (t, c) => (t + c) % 11 == 0);
        foreach (var (format, suffix) in new[] { ("cdf2", ""), ("nc4", "4") })
        {
            var extra = format == "nc4" ? new[] { "--format", "netcdf-4", "--deflate", "5", "--shuffle" } : ["--format", "64-bit-offset"];
            var clim = CliRun.Run(["climatology", input, "--var", "tcwv", "--by", "month", "--out", dir.File($"clim{suffix}.nc"), "--quiet", .. extra]);
            Assert.True(clim.ExitCode == 0, clim.Stderr);
            var anomalies = CliRun.Run(["anomalies", input, "--var", "tcwv", "--climatology", dir.File("clim.nc"), "--out", dir.File($"anom{suffix}.nc"), "--quiet", .. extra]);
            Assert.True(anomalies.ExitCode == 0, anomalies.Stderr);
        }
        Assert.Empty(Directory.EnumerateFiles(dir.Path, "*.part"));

        var header = ExternalTools.Run("ncdump", $"-hs {dir.File("anom4.nc")}");
        Assert.Equal(0, header.ExitCode);
        Assert.Contains("time = UNLIMITED ; // (120 currently)", header.Stdout);
        Assert.Contains("tcwv:_ChunkSizes = 1, 6, 8 ;", header.Stdout);
        Assert.Contains("tcwv:_DeflateLevel = 5 ;", header.Stdout);
        Assert.Contains("tcwv:_Shuffle = \"true\" ;", header.Stdout);
        Assert.Contains(":_Format = \"netCDF-4\" ;", header.Stdout);

        foreach (var (a, b, variables) in new[] { ("clim.nc", "clim4.nc", new[] { "tcwv", "tcwv_std", "tcwv_count", "climatology_bounds", "time" }), ("anom.nc", "anom4.nc", new[] { "tcwv", "time", "lat", "lon" }) })
        {
            var json = JsonDocument.Parse(ExternalTools.RunPython("compare_variables.py", [dir.File(a), dir.File(b), .. variables])).RootElement;
            Assert.Equal("NETCDF4", json.GetProperty("_format_b").GetString());
            Assert.Equal("time", Assert.Single(json.GetProperty("_unlimited_b").EnumerateArray()).GetString());
            foreach (var v in variables)
            {
                var r = json.GetProperty(v);
                Assert.True(r.GetProperty("identical").GetBoolean(), $"{b}:{v} differs from the classic product");
                Assert.True(r.GetProperty("attributes_equal").GetBoolean(), $"{b}:{v} attributes differ");
            }
            var field = json.GetProperty(variables[0]);
            Assert.Equal(5, field.GetProperty("filters_b").GetProperty("complevel").GetInt32());
            Assert.True(field.GetProperty("filters_b").GetProperty("shuffle").GetBoolean());
            Assert.Equal(1, field.GetProperty("chunking_b")[0].GetInt32());
        }
        var described = CliRun.Run("describe", dir.File("anom4.nc"));
        Assert.True(described.ExitCode == 0, described.Stderr);
        Assert.Contains("netCDF-4", described.Stdout);
    }

    [Fact]
    public void Without_the_netcdf_library_nc4_is_refused_naming_the_package()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 10, stepHours: 24);
        var info = new System.Diagnostics.ProcessStartInfo("dotnet") { UseShellExecute = false, RedirectStandardError = true, RedirectStandardOutput = true };
        foreach (var a in new[] { Path.Combine(AppContext.BaseDirectory, "griddrift.dll"), "climatology", input, "--var", "tcwv", "--by", "month", "--out", dir.File("c.nc"), "--format", "netcdf-4" })
            info.ArgumentList.Add(a);
        info.Environment["GRIDDRIFT_LIBNETCDF"] = dir.File("no-such-libnetcdf.so");
        using var p = System.Diagnostics.Process.Start(info)!;
        string stderr = p.StandardError.ReadToEnd();
        p.WaitForExit();
        Assert.Equal(2, p.ExitCode);
        Assert.Contains("apt-get install libnetcdf19", stderr);
        Assert.Single(stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries));
        Assert.Empty(Directory.EnumerateFiles(dir.Path, "*c.nc*", SearchOption.AllDirectories));
    }

    [Fact]
    public void A_deflate_level_out_of_range_is_a_usage_error()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 10, stepHours: 24);
        var outcome = CliRun.Run("climatology", input, "--var", "tcwv", "--by", "month", "--out", dir.File("c.nc"), "--format", "netcdf-4", "--deflate", "12");
        Assert.Equal(1, outcome.ExitCode); // a usage error, as DESIGN.md numbers them
        Assert.Contains("--deflate 12", outcome.Stderr);
        Assert.False(File.Exists(dir.File("c.nc")));
    }
}
