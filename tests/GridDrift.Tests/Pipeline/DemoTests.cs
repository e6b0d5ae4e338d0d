using DuckDB.NET.Data;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Pipeline;

/// <summary>
/// The whole chain: `griddrift demo --size small` writes its invented record (a regime shift on
/// 2033-01-01 in the sectors north_west and south_east: waves 2.5× faster, noise twice as large),
/// runs the recipe it writes, and its products — read back with DuckDB, not through GridDrift —
/// recover the date within 30 days in both sectors at q &lt; 0.05, see more events there after the
/// date, flag no untouched sector at q &lt; 0.05, and rank the two sectors first by the change of
/// their importance; the report opens with its summary and is one self-contained page.
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
        string trends = Path.Combine(products, "events_trends.parquet");
        foreach (var region in Changed)
        {
            var times = Query($"SELECT time FROM read_parquet('{changes}') WHERE region = '{region}' AND method IN ('pettitt', 'pelt-mean') AND q_value < 0.05")
                .Select(r => DateTime.Parse((string)r[0]!, System.Globalization.CultureInfo.InvariantCulture)).ToList();
            Assert.True(times.Count > 0, $"no change at q < 0.05 in {region}");
            double closest = times.Min(t => Math.Abs((t - Shift).TotalDays));
            Assert.True(closest <= 30, $"{region}: nearest change {closest:0} days from 2033-01-01");
            var rate = Query($"SELECT mean_before, mean_after FROM read_parquet('{changes}') WHERE region = '{region}' AND method = 'event-rate' AND q_value < 0.05");
            Assert.True(rate.Count == 1 && (double)rate[0][1]! > (double)rate[0][0]!, $"{region}: more events after the shift");
        }
        // the truth (the scenario's own, DemoScenario): nothing was done to the other six sectors
        var falseAlarms = Query($"SELECT DISTINCT region FROM (SELECT region, q_value FROM read_parquet('{changes}') UNION ALL SELECT region, q_value FROM read_parquet('{trends}')) " +
            "WHERE q_value < 0.05 AND region NOT IN ('global', 'north_west', 'south_east')").Select(r => (string)r[0]!).ToList();
        Assert.True(falseAlarms.Count == 0, $"untouched regions flagged at q < 0.05: {string.Join(", ", falseAlarms)}");
        var leading = Query($"SELECT region FROM read_parquet('{Path.Combine(products, "attribution_change.parquet")}') ORDER BY rank LIMIT 2")
            .Select(r => (string)r[0]!).Order().ToArray();
        Assert.Equal(Changed, leading);
        string report = File.ReadAllText(Path.Combine(products, "report.md"));
        Assert.Contains("not a warning or forecasting service", report);
        Assert.True(report.IndexOf("## Summary", StringComparison.Ordinal) is int summary and >= 0 && summary < report.IndexOf("## Findings", StringComparison.Ordinal), "the summary comes first");
        Assert.Contains("Injected truth", report);
        Assert.Contains("False alarms: no untouched region was flagged.", report);
        // p and q are the last two columns of the findings' tables: never printed as 0
        Assert.DoesNotMatch(new System.Text.RegularExpressions.Regex(@"\| 0 \|( [^|]+ \|)?$", System.Text.RegularExpressions.RegexOptions.Multiline), report);
        string html = File.ReadAllText(Path.Combine(products, "report.html"));
        Assert.DoesNotContain("src=\"figures/", html);
        Assert.True(html.Contains("data:image/png;base64,", StringComparison.Ordinal) || !FontsPresent(), "figures embedded in the page");
        Assert.True(File.Exists(Path.Combine(products, "figures", "importance_heatmap.png")) || !FontsPresent(), "the heatmap figure");
        foreach (var region in new[] { "arctic_east", "antarctic_east" })
            Assert.True(!FontsPresent() || report.Contains($"figures/series_{region}.png", StringComparison.Ordinal), $"{region}'s figure is in the report");

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
