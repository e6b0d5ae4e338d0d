using System.Globalization;
using System.Text.Json;
using DuckDB.NET.Data;
using GridDrift.Operators.Climatology;
using GridDrift.Formats;
using GridDrift.Pipeline;
using GridDrift.Tests.Support;
using GridDrift.Workflows;

namespace GridDrift.Tests.Operators.Climatology;

/// <summary>
/// Anomalies against an independent numpy computation (Interop/scripts/anomalies_reference.py,
/// which reads the input and our climatology with python netCDF4), their region means read
/// back from Parquet by DuckDB against numpy's exact-area weighting, the identity that the
/// anomalies of the base period average to zero in every slot (common practice: a mean's
/// departures sum to zero), and refusal of a climatology that does not fit the record.
/// </summary>
public class AnomaliesTests
{
    static readonly string Radius = GridDrift.Grids.Sphere.MeanEarthRadius.ToString("R", CultureInfo.InvariantCulture);

    [InteropTheory(Needs.PythonNetcdf)]
    [InlineData("standard", "month", "absolute")]
    [InlineData("standard", "month", "relative")]
    [InlineData("noleap", "day-of-year", "standardized")]
    public void Anomaly_fields_and_region_means_equal_numpy(string calendar, string by, string kind)
    {
        using var dir = new TempFolder();
        string input = dir.File("record.nc"), clim = dir.File("clim.nc"), anom = dir.File("anom.nc"), table = dir.File("anom.parquet");
        ExternalTools.RunPython("make_climatology_fixture.py", input, calendar, "NETCDF3_64BIT_OFFSET", "24", "3");
        ClimatologyStep.Run(new ClimatologyOptions([input], "tcwv", ClimatologyKinds.Parse(by)!.Value, clim));
        var summary = AnomaliesStep.Run(new AnomaliesOptions([input], "tcwv", clim, Anomaly.Parse(kind)!.Value, anom, ["global", "bands:30"], table));
        var json = JsonDocument.Parse(ExternalTools.RunPython("anomalies_reference.py", input, "tcwv", clim, kind, by == "month" ? "month" : "noleap-day", anom, Radius)).RootElement;
        var expected = json.GetProperty("expected").EnumerateArray().ToArray();
        var ours = json.GetProperty("ours").EnumerateArray().ToArray();
        Assert.Equal(expected.Length, ours.Length);
        for (int i = 0; i < expected.Length; i++)
        {
            Assert.True((expected[i].ValueKind == JsonValueKind.Null) == (ours[i].ValueKind == JsonValueKind.Null), $"{kind} anomaly [{i}] missing in one only");
            if (expected[i].ValueKind == JsonValueKind.Null) continue;
            double e = expected[i].GetDouble(), o = ours[i].GetDouble();
            Assert.True(Math.Abs(e - o) <= 2e-6 * Math.Abs(e) + 2e-5, $"{kind} anomaly [{i}]: numpy {e:R}, ours {o:R}");
        }

        var global = json.GetProperty("global").EnumerateArray().Select(e => e.ValueKind == JsonValueKind.Null ? double.NaN : e.GetDouble()).ToArray();
        using var db = new DuckDBConnection("DataSource=:memory:");
        db.Open();
        using var cmd = db.CreateCommand();
        cmd.CommandText = $"SELECT value, quantity, variable FROM read_parquet('{table}') WHERE region = 'global' ORDER BY time_value";
        using var r = cmd.ExecuteReader();
        int t = 0;
        while (r.Read())
        {
            Assert.Equal(kind == "absolute" ? "anomaly" : kind + "_anomaly", r.GetString(1));
            Assert.Equal("tcwv", r.GetString(2));
            double e = global[t];
            double o = r.IsDBNull(0) ? double.NaN : r.GetDouble(0);
            Assert.True(Math.Abs(e - o) <= 1e-5 * Math.Abs(e) + 1e-5, $"global mean {kind} anomaly at frame {t}: numpy {e:R}, ours {o:R}");
            t++;
        }
        Assert.Equal(summary.Frames, t);
        Assert.True(File.Exists(summary.Series), "the series NetCDF beside the table");
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void Anomalies_of_the_base_period_average_to_zero_in_every_slot()
    {
        using var dir = new TempFolder();
        string input = dir.File("record.nc"), clim = dir.File("clim.nc"), anom = dir.File("anom.nc");
        ExternalTools.RunPython("make_climatology_fixture.py", input, "360_day", "NETCDF4", "24", "3");
        ClimatologyStep.Run(new ClimatologyOptions([input], "tcwv", ClimatologyKind.DayOfYear, clim, Base: "2030/2031"));
        AnomaliesStep.Run(new AnomaliesOptions([input], "tcwv", clim, AnomalyKind.Absolute, anom));
        using var reader = DatasetFiles.Open(anom);
        var values = reader.ReadAllDoubles(reader.RequireVariable("tcwv"));
        var times = GridDrift.Conventions.Time.TimeAxis.Read(reader, reader.RequireVariable("time")).Times;
        const int cells = 35;
        var sum = new double[360 * cells];
        var count = new int[360 * cells];
        for (int f = 0; f < times.Length; f++)
        {
            if (times[f].Year > 2031) continue; // the base period 2030-2031 only
            int slot = (times[f].Month - 1) * 30 + times[f].Day - 1;
            for (int c = 0; c < cells; c++)
            {
                double v = values[f * cells + c];
                if (v > 1e30) continue; // _FillValue
                sum[slot * cells + c] += v;
                count[slot * cells + c]++;
            }
        }
        for (int i = 0; i < sum.Length; i++)
            if (count[i] > 0) Assert.True(Math.Abs(sum[i] / count[i]) < 1e-5, $"slot {i / cells}, cell {i % cells}: base-period anomalies average {sum[i] / count[i]:E2}");
        Assert.True(count.Count(c => c > 0) > 300 * cells, "most slots and cells have base-period data");
    }

    [Fact]
    public void A_climatology_of_another_grid_is_refused_with_one_line()
    {
        using var dir = new TempFolder();
        string small = SampleFiles.Record(dir.File("small.nc"), frames: 30, stepHours: 24, nlat: 3, nlon: 4);
        string large = SampleFiles.Record(dir.File("large.nc"), frames: 30, stepHours: 24, nlat: 4, nlon: 4);
        string clim = dir.File("clim.nc");
        Assert.Equal(0, CliRun.Run("climatology", small, "--var", "tcwv", "--by", "month", "--out", clim, "--quiet").ExitCode);
        var outcome = CliRun.Run("anomalies", large, "--var", "tcwv", "--climatology", clim, "--out", dir.File("a.nc"));
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.StartsWith($"griddrift: {clim}: ", line);
        Assert.Contains("tcwv", line);
        Assert.Contains("cells", line);
        Assert.False(File.Exists(dir.File("a.nc")), "nothing is written when the input is refused");
        Assert.Empty(Directory.GetFiles(dir.Path, ".*part"));
    }

    [Fact]
    public void Hour_by_month_is_refused_for_daily_data()
    {
        using var dir = new TempFolder();
        string daily = SampleFiles.Record(dir.File("daily.nc"), frames: 40, stepHours: 24);
        var outcome = CliRun.Run("climatology", daily, "--var", "tcwv", "--by", "hour-by-month", "--out", dir.File("c.nc"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("sub-daily", Assert.Single(outcome.StderrLines));
    }
}
