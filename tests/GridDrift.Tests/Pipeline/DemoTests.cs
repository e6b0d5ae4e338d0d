using DuckDB.NET.Data;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Pipeline;

/// <summary>
/// The whole chain: `griddrift demo --size small` writes its invented record (a regime shift on
/// 2033-01-01 in the sectors north_west and south_east: waves 2.5× faster, noise twice as large),
/// runs the recipe it writes, and its products — read back with DuckDB, not through GridDrift —
/// recover the date within 30 days in both sectors and rank the two sectors first.
/// </summary>
public class DemoTests
{
    static readonly DateTime Shift = new(2033, 1, 1);
    static readonly string[] Changed = ["north_west", "south_east"];

    [Fact]
    public void The_small_demo_recovers_the_injected_shift_and_its_regions()
    {
        using var dir = new TempFolder();
        var outcome = CliRun.Run("demo", "--size", "small", "--out", dir.Path, "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        string products = Path.Combine(dir.Path, "products");
        using var db = DuckDb.Open();
        List<object?[]> Query(string sql) => DuckDb.Query(db, sql);
        string changes = Path.Combine(products, "events_changepoints.parquet");
        foreach (var region in Changed)
        {
            var times = Query($"SELECT time FROM read_parquet('{changes}') WHERE region = '{region}' AND method = 'pelt-mean'")
                .Select(r => DateTime.Parse((string)r[0]!, System.Globalization.CultureInfo.InvariantCulture)).ToList();
            Assert.True(times.Count > 0, $"no PELT change in {region}");
            double closest = times.Min(t => Math.Abs((t - Shift).TotalDays));
            Assert.True(closest <= 30, $"{region}: nearest change {closest:0} days from 2033-01-01");
        }
        var leading = Query($"SELECT region FROM read_parquet('{Path.Combine(products, "attribution.parquet")}') WHERE measure = 'permutation' AND scope = 'record' ORDER BY rank LIMIT 2")
            .Select(r => (string)r[0]!).Order().ToArray();
        Assert.Equal(Changed, leading);
        string report = File.ReadAllText(Path.Combine(products, "report.md"));
        Assert.Contains("not a warning or forecasting service", report);
        Assert.Contains("Injected truth", report);
        Assert.True(File.Exists(Path.Combine(products, "report.html")));
        Assert.True(File.Exists(Path.Combine(products, "figures", "importance_heatmap.png")) || !FontsPresent(), "the heatmap figure");

        // rerun: every step is up to date and skipped
        var again = CliRun.Run("run", Path.Combine(dir.Path, "recipe.toml"));
        Assert.Equal(0, again.ExitCode);
        Assert.All(again.StderrLines.Where(l => l.StartsWith("griddrift run: ", StringComparison.Ordinal)), l => Assert.Contains("up to date", l));
    }

    /// <summary>
    /// The README invites edits to the demo's recipe: rerunning the demo keeps an edited recipe.toml
    /// byte for byte, writes its own recipe beside it (the same text the first run wrote), runs
    /// that one, and says so in one line.
    /// </summary>
    [Fact]
    public void Rerunning_the_demo_keeps_an_edited_recipe()
    {
        using var dir = new TempFolder();
        Assert.Equal(0, CliRun.Run("demo", "--size", "small", "--out", dir.Path, "--quiet").ExitCode);
        string recipe = Path.Combine(dir.Path, "recipe.toml");
        string original = File.ReadAllText(recipe);
        File.AppendAllText(recipe, "# my edit\n");
        string edited = File.ReadAllText(recipe);
        var again = CliRun.Run("demo", "--size", "small", "--out", dir.Path);
        Assert.True(again.ExitCode == 0, again.Stderr);
        Assert.Equal(edited, File.ReadAllText(recipe));
        Assert.Equal(original, File.ReadAllText(Path.Combine(dir.Path, "recipe.demo.toml")));
        Assert.Single(again.StderrLines, l => l.Contains("differs from the demo's and is kept", StringComparison.Ordinal));
    }

    static bool FontsPresent() => InteropFactAttribute.Missing(Needs.Fonts) is null;
}
