using System.Globalization;
using System.Runtime.InteropServices;
using System.Text.Json.Nodes;
using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Interop;

/// <summary>
/// GRIB files written by ecCodes itself (python3-eccodes, from its sample templates: grib_record.py),
/// read by GridDrift through ecCodes and compared with what python3-eccodes reads back: every
/// message's values (bitmap points missing), the grid's latitudes and longitudes, validity times
/// (reference time plus step) and levels, for editions 1 and 2, regular latitude-longitude and
/// regular Gaussian grids, scanning north to south and south to north, messages in shuffled order.
/// </summary>
public class GribInteropTests
{
    [InteropTheory(Needs.PythonEccodes)]
    [InlineData(1, "ll", "ns")]
    [InlineData(1, "gg", "sn")]
    [InlineData(2, "ll", "sn")]
    [InlineData(2, "gg", "ns")]
    public void Every_message_reads_as_python_eccodes_reads_it(int edition, string grid, string scan)
    {
        using var dir = new TempFolder();
        string grib = dir.File("record.grib"), witnessPath = dir.File("witness.json");
        ExternalTools.RunPython("grib_record.py", grib, edition.ToString(CultureInfo.InvariantCulture), grid, scan, witnessPath);
        var witness = JsonNode.Parse(File.ReadAllText(witnessPath))!.AsArray();

        using var reader = DatasetFiles.Open(grib);
        Assert.Equal($"GRIB edition {edition}", reader.Format);
        var lat = reader.ReadAllDoubles(reader.RequireVariable("latitude"));
        var lon = reader.ReadAllDoubles(reader.RequireVariable("longitude"));
        Assert.Equal(witness[0]!["latitudes"]!.AsArray().Select(x => (double)x!), lat);
        Assert.Equal(witness[0]!["longitudes"]!.AsArray().Select(x => (double)x!), lon);
        Assert.Equal(scan == "ns", lat[0] > lat[^1]);

        var validTimes = witness.Select(Valid).Distinct().Order().ToList();
        var times = reader.ReadAllDoubles(reader.RequireVariable("time")).Select(s => DateTime.UnixEpoch.AddSeconds(s)).ToList();
        Assert.Equal(validTimes, times);
        Assert.Equal([850.0, 700, 500], reader.ReadAllDoubles(reader.RequireVariable("isobaricInhPa")));

        var q = reader.RequireVariable("q");
        var tcwv = reader.RequireVariable("tcwv");
        Assert.Equal(["time", "isobaricInhPa", "latitude", "longitude"], q.Dimensions.Select(d => d.Name));
        Assert.Equal("kg kg-1", q.Attributes.Text("units")); // ecCodes says "kg kg**-1"
        Assert.Equal((string?)witness.First(w => (string?)w!["shortName"] == "q")!["cfName"], q.Attributes.Text("standard_name"));
        int rows = lat.Length, columns = lon.Length, missing = 0;
        var frame = new float[rows * columns];
        foreach (var message in witness)
        {
            bool isQ = (string?)message!["shortName"] == "q";
            int t = validTimes.IndexOf(Valid(message)), level = isQ ? new[] { 850, 700, 500 }.ToList().IndexOf((int)message["level"]!) : 0;
            if (isQ) reader.ReadRaw(q, [t, level, 0, 0], [1, 1, rows, columns], MemoryMarshal.AsBytes(frame.AsSpan()));
            else reader.ReadRaw(tcwv, [t, 0, 0], [1, rows, columns], MemoryMarshal.AsBytes(frame.AsSpan()));
            var expected = message["values"]!.AsArray();
            for (int k = 0; k < frame.Length; k++)
            {
                if (expected[k] is null) { Assert.True(float.IsNaN(frame[k]), $"point {k} is missing in the bitmap"); missing++; }
                else Assert.True(frame[k] == (float)(double)expected[k]!, $"{message["shortName"]} at {Valid(message):O}, point {k}: {frame[k]} vs {expected[k]}");
            }
        }
        Assert.Equal(40, missing); // the bitmap's box of 4 × 10 points
    }

    static DateTime Valid(JsonNode? message)
    {
        string date = ((long)message!["validityDate"]!).ToString(CultureInfo.InvariantCulture);
        long time = (long)message["validityTime"]!;
        return new DateTime(int.Parse(date[..4]), int.Parse(date[4..6]), int.Parse(date[6..]), (int)(time / 100), (int)(time % 100), 0, DateTimeKind.Utc);
    }

    [InteropFact(Needs.PythonEccodes | Needs.PythonNetcdf)]
    public void Stats_similarity_climatology_and_a_level_of_GRIB_equal_those_of_the_same_record_as_NetCDF()
    {
        // the NetCDF copy is written by netCDF4-python from the values python3-eccodes reads
        using var dir = new TempFolder();
        string grib = dir.File("record.grib2"), copy = dir.File("record.nc");
        ExternalTools.RunPython("grib_record.py", grib, "2", "ll", "ns", dir.File("witness.json"), copy);
        foreach (var (input, tag) in new[] { (grib, "grib"), (copy, "nc") })
        {
            Ok(CliRun.Run("stats", input, "--var", "tcwv", "--regions", "global", "bands:30", "--out", dir.File($"stats_{tag}.nc")));
            Ok(CliRun.Run("stats", input, "--var", "q", "--level", "700", "--regions", "global", "--out", dir.File($"q_{tag}.nc")));
            Ok(CliRun.Run("similarity", input, "--var", "tcwv", "--regions", "global", "--metric", "ssim,vif,corr", "--range", "0:80", "--out", dir.File($"sim_{tag}.nc")));
            Ok(CliRun.Run("climatology", input, "--var", "tcwv", "--by", "month", "--out", dir.File($"clim_{tag}.nc")));
        }
        foreach (var product in new[] { "stats", "q", "sim", "clim" })
            ProductComparison.AssertSameValues(dir.File($"{product}_nc.nc"), dir.File($"{product}_grib.nc"));
        var described = CliRun.Run("describe", grib);
        Assert.Contains("GRIB edition 2", described.Stdout);
    }

    [InteropFact(Needs.PythonEccodes)]
    public void A_record_split_into_one_file_per_day_given_in_any_order_gives_the_products_of_the_whole_file()
    {
        // the days are split by python3-eccodes (grib_split.py), which copies each message unchanged
        using var dir = new TempFolder();
        string grib = dir.File("record.grib2");
        ExternalTools.RunPython("grib_record.py", grib, "2", "ll", "sn", dir.File("witness.json"));
        var days = ExternalTools.RunPython("grib_split.py", grib, dir.File("day")).Trim().Split(' ');
        Assert.Equal(2, days.Length);
        Ok(CliRun.Run("stats", grib, "--var", "q", "--level", "500", "--regions", "global", "bands:30", "--out", dir.File("whole.nc")));
        Ok(CliRun.Run(["stats", days[1], days[0], "--var", "q", "--level", "500", "--regions", "global", "bands:30", "--out", dir.File("days.nc")]));
        ProductComparison.AssertSameValues(dir.File("whole.nc"), dir.File("days.nc"));
    }

    [InteropFact(Needs.PythonEccodes)]
    public void A_reduced_Gaussian_grid_is_refused_with_one_line_saying_so()
    {
        using var dir = new TempFolder();
        string grib = dir.File("reduced.grib2");
        var r = ExternalTools.Run(ExternalTools.Python, $"-c \"import eccodes; h = eccodes.codes_grib_new_from_samples('reduced_gg_pl_32_grib2'); eccodes.codes_write(h, open(r'{grib}', 'wb'))\"");
        Assert.True(r.ExitCode == 0, r.Stderr);
        var outcome = CliRun.Run("stats", grib, "--var", "t", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Single(outcome.StderrLines);
        Assert.Contains("reduced Gaussian", outcome.Stderr);
        Assert.Contains("reduced.grib2", outcome.Stderr);
    }

    /// <summary>
    /// Variables are named by ecCodes' cfVarName; GridDrift asks for it only where the short name
    /// is not a CF name (CF §2.3: a letter first), as 2 m temperature's "2t". The witness is
    /// python3-eccodes' own cfVarName, units and cfName for each message.
    /// </summary>
    [InteropFact(Needs.PythonEccodes)]
    public void Variables_are_named_units_and_standard_names_given_as_python_eccodes_gives_them()
    {
        using var dir = new TempFolder();
        string grib = dir.File("names.grib2");
        string code = "import eccodes, json, sys\n" +
                      "out = open(sys.argv[1], 'wb'); seen = []\n" +
                      "for short in ('2t', '10u', 'tcwv', 'msl'):\n" +
                      "    h = eccodes.codes_grib_new_from_samples('regular_ll_sfc_grib2')\n" +
                      "    eccodes.codes_set(h, 'shortName', short)\n" +
                      "    eccodes.codes_write(h, out)\n" +
                      "    seen.append({k: eccodes.codes_get(h, k) for k in ('shortName', 'cfVarName', 'units', 'cfName')})\n" +
                      "print(json.dumps(seen))\n";
        File.WriteAllText(dir.File("names.py"), code);
        var r = ExternalTools.Run(ExternalTools.Python, $"\"{dir.File("names.py")}\" \"{grib}\"");
        Assert.True(r.ExitCode == 0, r.Stderr);
        var witness = JsonNode.Parse(r.Stdout)!.AsArray();

        using var reader = DatasetFiles.Open(grib);
        foreach (var message in witness)
        {
            string cfVarName = (string)message!["cfVarName"]!;
            var v = reader.RequireVariable(cfVarName);
            Assert.Equal((string)message["shortName"]!, v.Attributes.Text("parameter_short_name"));
            Assert.Equal(((string)message["units"]!).Replace("**", ""), v.Attributes.Text("units"));
            // a water content in kg m-2 takes the mass-content name rather than the liquid-water-equivalent thickness ecCodes gives
            string cfName = (string)message["cfName"]!, units = (string)message["units"]!;
            string? expected = cfName is "unknown" or "~" ? null
                : units == "kg m**-2" && cfName.StartsWith("lwe_thickness_of_", StringComparison.Ordinal) ? cfName["lwe_thickness_of_".Length..] : cfName;
            Assert.Equal(expected, v.Attributes.Text("standard_name"));
        }
        Assert.Contains(witness, m => (string)m!["shortName"]! != (string)m["cfVarName"]!); // the rule is exercised
    }

    /// <summary>
    /// GRIB 1 messages over 8 MB (a 0.1° global grid at 16 bits is 13 MB) do not fit the 3-byte
    /// length; ecCodes writes ECMWF's large-message coding and GridDrift has ecCodes find their
    /// ends. Witness: the second message's values as python3-eccodes reads them.
    /// </summary>
    [InteropFact(Needs.PythonEccodes)]
    public void GRIB_1_messages_over_8_MB_are_read_as_python_eccodes_reads_them()
    {
        using var dir = new TempFolder();
        string grib = dir.File("large.grib1"), values = dir.File("second.f64");
        string code = "import eccodes, numpy as np, sys\n" +
                      "out = open(sys.argv[1], 'wb')\n" +
                      "for k in range(2):\n" +
                      "    h = eccodes.codes_grib_new_from_samples('regular_ll_sfc_grib1')\n" +
                      "    eccodes.codes_set(h, 'shortName', 'tcwv')\n" +
                      "    for key, v in (('Ni', 3600), ('Nj', 1801)): eccodes.codes_set_long(h, key, v)\n" +
                      "    for key, v in (('iDirectionIncrementInDegrees', 0.1), ('jDirectionIncrementInDegrees', 0.1), ('latitudeOfFirstGridPointInDegrees', 90.0),\n" +
                      "                   ('latitudeOfLastGridPointInDegrees', -90.0), ('longitudeOfFirstGridPointInDegrees', 0.0), ('longitudeOfLastGridPointInDegrees', 359.9)): eccodes.codes_set(h, key, v)\n" +
                      "    eccodes.codes_set_long(h, 'bitsPerValue', 16)\n" +
                      "    eccodes.codes_set(h, 'dataTime', 600 * k)\n" +
                      "    eccodes.codes_set_values(h, 30 + 10 * np.sin(np.arange(3600 * 1801) / 5000.0 + k))\n" +
                      "    eccodes.codes_write(h, out)\n" +
                      "out.close()\n" +
                      "f = open(sys.argv[1], 'rb'); eccodes.codes_release(eccodes.codes_grib_new_from_file(f))\n" +
                      "h = eccodes.codes_grib_new_from_file(f); eccodes.codes_get_values(h).tofile(sys.argv[2])\n";
        File.WriteAllText(dir.File("large.py"), code);
        var r = ExternalTools.Run(ExternalTools.Python, $"\"{dir.File("large.py")}\" \"{grib}\" \"{values}\"", timeoutSeconds: 300);
        Assert.True(r.ExitCode == 0, r.Stderr);
        var head = new byte[8];
        using (var f = File.OpenRead(grib)) f.ReadExactly(head);
        Assert.True((head[4] & 0x80) != 0, "the first message uses the large-message coding"); // else the test does not exercise it

        using var reader = DatasetFiles.Open(grib);
        var tcwv = reader.RequireVariable("tcwv");
        Assert.Equal([2L, 1801, 3600], tcwv.Shape);
        var frame = new float[1801 * 3600];
        reader.ReadRaw(tcwv, [1, 0, 0], [1, 1801, 3600], MemoryMarshal.AsBytes(frame.AsSpan()));
        var expected = MemoryMarshal.Cast<byte, double>(File.ReadAllBytes(values));
        Assert.Equal(frame.Length, expected.Length);
        for (int k = 0; k < frame.Length; k++)
            if (frame[k] != (float)expected[k]) Assert.Fail($"point {k}: {frame[k]} against {expected[k]}");
    }

    static void Ok(CliRun.Outcome outcome) => Assert.True(outcome.ExitCode == 0, outcome.Stderr);
}
