using System.Text.Json;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// `--json` on every command that writes products (docs/schemas.md, "Command summaries"): one
/// JSON object on stdout with command, products, counts, warnings and seconds; every product it
/// lists exists, and the frame counts agree with the time dimension netCDF-C's ncdump reads in
/// the products.
/// </summary>
public class JsonSummaryTests
{
    static JsonElement Summary(CliRun.Outcome outcome, string command)
    {
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        var json = JsonDocument.Parse(outcome.Stdout).RootElement;
        Assert.Equal(command, json.GetProperty("command").GetString());
        foreach (var key in new[] { "products", "counts", "warnings", "seconds" }) Assert.True(json.TryGetProperty(key, out _), $"{command}: no '{key}'");
        var products = json.GetProperty("products").EnumerateArray().Select(p => p.GetString()!).ToList();
        Assert.NotEmpty(products);
        Assert.All(products, p => Assert.True(File.Exists(p) || Directory.Exists(p), $"{command}: product {p} does not exist"));
        return json;
    }

    /// <summary>The UNLIMITED time dimension's current length as ncdump -h prints it.</summary>
    static int TimeLength(string path)
    {
        var header = ExternalTools.Run("ncdump", $"-h \"{path}\"").Stdout;
        var m = System.Text.RegularExpressions.Regex.Match(header, @"time = (?:UNLIMITED ; // \((\d+) currently\)|(\d+) ;)");
        Assert.True(m.Success, header);
        return int.Parse(m.Groups[1].Success ? m.Groups[1].Value : m.Groups[2].Value, System.Globalization.CultureInfo.InvariantCulture);
    }

    [InteropFact(Needs.Ncdump)]
    public void Every_command_that_writes_products_summarises_them_as_JSON()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 120, stepHours: 24, nlat: 6, nlon: 8);

        var stats = Summary(CliRun.Run("stats", input, "--var", "tcwv", "--regions", "global", "bands:60", "--out", dir.File("s.nc"), "--table", dir.File("s.parquet"), "--json", "--quiet"), "stats");
        Assert.Equal(TimeLength(dir.File("s.nc")), stats.GetProperty("counts").GetProperty("frames").GetInt32());
        Assert.Equal(4, stats.GetProperty("counts").GetProperty("regions").GetInt32());

        var similarity = Summary(CliRun.Run("similarity", input, "--var", "tcwv", "--regions", "global", "--range", "0:100", "--out", dir.File("sim.nc"), "--json", "--quiet"), "similarity");
        Assert.Equal(TimeLength(dir.File("sim.nc")), similarity.GetProperty("counts").GetProperty("pairs").GetInt32());

        Summary(CliRun.Run("climatology", input, "--var", "tcwv", "--by", "month", "--out", dir.File("clim.nc"), "--json", "--quiet"), "climatology");
        var anomalies = Summary(CliRun.Run("anomalies", input, "--var", "tcwv", "--climatology", dir.File("clim.nc"), "--out", dir.File("anom.nc"), "--json", "--quiet"), "anomalies");
        Assert.Equal(TimeLength(dir.File("anom.nc")), anomalies.GetProperty("counts").GetProperty("frames").GetInt32());
        Summary(CliRun.Run("regions", "--grid", input, "--regions", "bands:60", "--out", dir.File("mask.nc"), "--json", "--quiet"), "regions");
        var events = Summary(CliRun.Run("events", dir.File("s.nc"), "--quantity", "mean", "--out", dir.File("ev.parquet"), "--json", "--quiet"), "events");
        Assert.True(events.TryGetProperty("changepoints", out _), "the analysis's own keys stay");

        File.WriteAllText(dir.File("recipe.toml"), "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"products\"\n\n[stats]\n\n[climatology]\n");
        var run = Summary(CliRun.Run("run", dir.File("recipe.toml"), "--json", "--quiet"), "run");
        Assert.Equal(["stats", "climatology"], run.GetProperty("steps").EnumerateArray().Select(s => s.GetProperty("step").GetString()));
        var rerun = Summary(CliRun.Run("run", dir.File("recipe.toml"), "--json", "--quiet"), "run");
        Assert.Equal(2, rerun.GetProperty("counts").GetProperty("steps_up_to_date").GetInt32());
    }
}
