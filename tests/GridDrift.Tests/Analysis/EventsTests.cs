using System.Text.Json;
using DuckDB.NET.Data;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Analysis;

/// <summary>
/// `griddrift events` end to end on an invented series written by python netCDF4 (NETCDF4,
/// string region labels): a +1.5σ shift injected on 2033-07-01 in two of six regions is found
/// by PELT within ten days in exactly those two, and by Pettitt (p &lt; 0.05); a single spike is an
/// event; the tables read back with DuckDB.
/// </summary>
public class EventsTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void The_injected_shift_is_found_in_the_two_changed_regions_only()
    {
        using var dir = new TempFolder();
        string input = dir.File("series.nc");
        ExternalTools.RunPython("make_region_series.py", input, "2033-07-01");
        var outcome = CliRun.Run("events", input, "--on", "residuals", "--changepoints", "pettitt,pelt-mean", "--out", dir.File("ev.parquet"), "--json", "--quiet");
        Assert.Equal(0, outcome.ExitCode);
        var json = JsonDocument.Parse(outcome.Stdout).RootElement;
        var shift = new DateTime(2033, 7, 1);
        var pelt = json.GetProperty("changepoints").EnumerateArray().Where(c => c.GetProperty("method").GetString() == "pelt-mean").ToList();
        var changed = pelt.Select(c => c.GetProperty("region").GetString()!).Distinct().Order().ToArray();
        Assert.Equal(["east_box", "polar_cap"], changed);
        foreach (var c in pelt)
        {
            var when = DateTime.Parse(c.GetProperty("time").GetString()!, System.Globalization.CultureInfo.InvariantCulture);
            Assert.True(Math.Abs((when - shift).TotalDays) <= 10, $"{c.GetProperty("region")}: change found at {when:yyyy-MM-dd}, injected 2033-07-01");
        }
        var pettitt = json.GetProperty("changepoints").EnumerateArray().Where(c => c.GetProperty("method").GetString() == "pettitt")
            .ToDictionary(c => c.GetProperty("region").GetString()!, c => c.GetProperty("p_value").GetDouble());
        Assert.True(pettitt.GetValueOrDefault("east_box", 1) < 0.05 && pettitt.GetValueOrDefault("polar_cap", 1) < 0.05);
        Assert.All(json.GetProperty("trends").EnumerateArray(), t => Assert.Equal(JsonValueKind.Number, t.GetProperty("sen_slope").ValueKind));

        using var db = new DuckDBConnection("DataSource=:memory:");
        db.Open();
        using var cmd = db.CreateCommand();
        cmd.CommandText = $"SELECT time, consensus FROM read_parquet('{dir.File("ev.parquet")}') WHERE region = 'tropics' AND event GROUP BY time, consensus ORDER BY consensus DESC LIMIT 1";
        using var r = cmd.ExecuteReader();
        Assert.True(r.Read(), "the spike is an event");
        Assert.Equal("2032-03-10T00:00:00", r.GetString(0));
        Assert.True(r.GetInt64(1) >= 4, "most detectors agree on a +8σ spike");
    }

    [Fact]
    public void A_series_file_without_region_labels_is_refused_with_one_line()
    {
        using var dir = new TempFolder();
        string path = SampleFiles.Record(dir.File("grid.nc"), frames: 5);
        var outcome = CliRun.Run("events", path, "--out", dir.File("e.parquet"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.StartsWith($"griddrift: {path}: ", Assert.Single(outcome.StderrLines));
    }
}
