using System.Globalization;
using System.Text;
using GridDrift.Pipeline;

namespace GridDrift.Demo;

/// <summary>
/// `griddrift demo`: writes the invented record, its truth and a recipe for the whole chain
/// into one folder, then runs the recipe. The user can edit the recipe and rerun it with
/// `griddrift run`.
/// </summary>
internal static class DemoRun
{
    /// <summary>Where the demo writes its own recipe when recipe.toml holds the user's edits.</summary>
    public const string DemoRecipeName = "recipe.demo.toml";

    public static (string Recipe, IReadOnlyList<StepOutcome> Steps) Run(string folder, string size, Action<string>? log = null)
    {
        var scenario = DemoScenario.For(size);
        Directory.CreateDirectory(folder);
        string record = Path.Combine(folder, "record");
        bool have = Directory.Exists(record) && Directory.GetFiles(record, "tb_invented_*.nc").Length == scenario.Years
            && File.Exists(Path.Combine(folder, "truth.json")) && File.ReadAllText(Path.Combine(folder, "truth.json")) == scenario.TruthJson();
        if (!have)
        {
            log?.Invoke($"writing the invented record: {scenario.Frames} frames of {scenario.Rows} × {scenario.Columns}, {scenario.FirstYear}–{scenario.FirstYear + scenario.Years - 1}, every {scenario.StepHours:0} h");
            var clock = System.Diagnostics.Stopwatch.StartNew();
            scenario.Write(record);
            File.WriteAllText(Path.Combine(folder, "truth.json"), scenario.TruthJson());
            log?.Invoke($"record written in {clock.Elapsed.TotalSeconds:0.0} s");
        }
        string recipe = Path.Combine(folder, "recipe.toml");
        string fresh = Recipe(scenario);
        if (File.Exists(recipe) && File.ReadAllText(recipe) != fresh)
        {
            // the README invites edits to recipe.toml: a rerun of the demo must never destroy them
            string beside = Path.Combine(folder, DemoRecipeName);
            GridDrift.Outputs.AtomicFile.WriteAllText(beside, fresh);
            log?.Invoke($"{recipe} differs from the demo's and is kept as it is; the demo's own recipe is written to {beside} and run now");
            recipe = beside;
        }
        else GridDrift.Outputs.AtomicFile.WriteAllText(recipe, fresh);
        return (recipe, RecipeRunner.Run(recipe, log, "griddrift run"));
    }

    static string Recipe(DemoScenario s)
    {
        int minSegment = (int)Math.Round(24 / s.StepHours * 60); // sixty days of steps
        string List(IEnumerable<string> items) => "[" + string.Join(", ", items.Select(i => $"\"{i}\"")) + "]";
        var sb = new StringBuilder();
        sb.AppendLine("# GridDrift demo recipe, on an INVENTED record (not real data).");
        sb.AppendLine($"# The record carries a regime shift on {s.ShiftDate.ToIsoString()[..10]} in {string.Join(" and ", DemoScenario.ChangedRegions)}.");
        sb.AppendLine("# Edit this file and rerun it with:  griddrift run recipe.toml   (up-to-date steps are skipped)");
        sb.AppendLine();
        sb.AppendLine("[input]");
        sb.AppendLine("files = [\"record/tb_invented_*.nc\"]");
        sb.AppendLine($"variable = \"{DemoScenario.Variable}\"");
        sb.AppendLine($"regions = {List(s.RegionSpecs())}");
        sb.AppendLine("out = \"products\"");
        sb.AppendLine();
        sb.AppendLine("[stats]\nstat = [\"mean\", \"std\", \"valid\"]\nout = \"stats.nc\"\ntable = \"stats.parquet\"\n");
        sb.AppendLine("[similarity]\nmetric = [\"ssim\", \"corr\", \"rmsd\"]\nrange = \"180:320\"\nout = \"similarity.nc\"\ntable = \"similarity.parquet\"\n");
        sb.AppendLine("[climatology]\nby = \"month\"\nout = \"climatology.nc\"\n");
        sb.AppendLine("[anomalies]\nkind = \"absolute\"\nout = \"anomalies.nc\"\ntable = \"anomalies.parquet\"\n");
        sb.AppendLine($"[events]\nseries = \"similarity.nc\"\nquantity = \"ssim\"\nchangepoints = [\"pettitt\", \"pelt-mean\", \"event-rate\"]\nmin-segment = {minSegment.ToString(CultureInfo.InvariantCulture)}\nout = \"events.parquet\"\nplot = \"figures\"\n");
        sb.AppendLine("[attribute]\nseries = \"similarity.nc\"\ntarget = \"global\"\nquantity = \"ssim\"\nout = \"attribution.parquet\"\nplot = \"figures\"\n");
        sb.AppendLine("[report]\ntitle = \"GridDrift demo: an invented regime shift\"\nout = \"report\"\ntruth = \"truth.json\"");
        return sb.ToString();
    }
}
