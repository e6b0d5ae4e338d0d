using GridDrift.Tests.Support;

namespace GridDrift.Tests.Pipeline;

/// <summary>Invalid recipes are refused with one line naming the recipe, the key and the line.</summary>
public class RecipeTests
{
    static CliRun.Outcome RunRecipe(TempFolder dir, string text)
    {
        string path = dir.File("recipe.toml");
        File.WriteAllText(path, text);
        return CliRun.Run("run", path);
    }

    /// <summary>Runs a recipe over a 30-day record that must be refused: exit 2 and one line on stderr, which is returned.</summary>
    static string Refused(TempFolder dir, string text)
    {
        SampleFiles.Record(dir.File("in.nc"), frames: 30, stepHours: 24);
        var outcome = RunRecipe(dir, text);
        Assert.Equal(2, outcome.ExitCode);
        return Assert.Single(outcome.StderrLines);
    }

    [Fact]
    public void An_unknown_key_is_named_with_its_line()
    {
        using var dir = new TempFolder();
        var outcome = RunRecipe(dir, "[input]\nfiles = [\"x.nc\"]\nvariable = \"tb\"\n\n[stats]\nstatistcs = [\"mean\"]\n");
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.Contains("recipe.toml", line);
        Assert.Contains("stats.statistcs", line);
        Assert.Contains("line 6", line);
    }

    [Fact]
    public void A_syntax_error_is_named_with_its_line()
    {
        using var dir = new TempFolder();
        var outcome = RunRecipe(dir, "[input]\nfiles = [\"x.nc\"\nvariable = \"tb\"\n");
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.Contains("recipe.toml", line);
        Assert.Matches(@"line [23]", line);
    }

    [Fact]
    public void A_wrong_type_is_named_with_its_line()
    {
        using var dir = new TempFolder();
        string data = SampleFiles.Record(dir.File("in.nc"), frames: 30, stepHours: 24);
        var outcome = RunRecipe(dir, $"[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\n\n[climatology]\nby = 12\n");
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.Contains("climatology.by", line);
        Assert.Contains("line 6", line);
    }

    [Fact]
    public void A_misspelt_metric_is_refused_before_any_step_runs()
    {
        using var dir = new TempFolder();
        string line = Refused(dir, "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"p\"\n\n[stats]\nstat = [\"mean\"]\n\n[similarity]\nmetric = [\"ssmi\"]\nrange = \"0:80\"\n");
        Assert.Contains("similarity.metric", line);
        Assert.Contains("line 10", line);
        Assert.Contains("ssmi", line);
        Assert.False(File.Exists(dir.File("p/stats.nc"))); // the stats step before it never ran
    }

    [Fact]
    public void A_bad_min_segment_is_refused_before_any_step_runs()
    {
        using var dir = new TempFolder();
        string line = Refused(dir, "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"p\"\n\n[stats]\nstat = [\"mean\"]\n\n[events]\nseries = \"stats.nc\"\nmin-segment = 1\n");
        Assert.Contains("events.min-segment", line);
        Assert.Contains("line 11", line);
        Assert.False(File.Exists(dir.File("p/stats.nc")));
    }

    [Fact]
    public void A_key_of_an_earlier_recipe_is_refused_with_its_new_name()
    {
        using var dir = new TempFolder();
        Assert.Contains("now 'stat'", Refused(dir, "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\n\n[stats]\nstatistics = [\"mean\"]\n"));
    }

    [Fact]
    public void A_variable_missing_from_the_files_is_refused_before_any_step_runs()
    {
        using var dir = new TempFolder();
        string line = Refused(dir, "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcvw\"\n\n[stats]\nstat = [\"mean\"]\n");
        Assert.Contains("input.variable", line);
        Assert.Contains("line 3", line);
    }

    [Fact]
    public void The_command_line_and_a_recipe_share_every_default()
    {
        // the same stats run through both doors gives the same quantities (the recipe's default used to be three of them)
        using var dir = new TempFolder();
        SampleFiles.Record(dir.File("in.nc"), frames: 10, stepHours: 24);
        var recipe = RunRecipe(dir, "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"p\"\n\n[stats]\n");
        Assert.True(recipe.ExitCode == 0, recipe.Stderr);
        var cli = CliRun.Run("stats", dir.File("in.nc"), "--var", "tcwv", "--regions", "global", "--out", dir.File("cli.nc"), "--quiet");
        Assert.True(cli.ExitCode == 0, cli.Stderr);
        using var a = GridDrift.Formats.DatasetFiles.Open(dir.File("p/stats.nc"));
        using var b = GridDrift.Formats.DatasetFiles.Open(dir.File("cli.nc"));
        Assert.Equal(b.Variables.Select(v => v.Name), a.Variables.Select(v => v.Name));
    }

    [Fact]
    public void A_product_outside_the_products_folder_is_refused_unless_allowed()
    {
        using var dir = new TempFolder();
        File.WriteAllText(dir.File("victim.txt"), "keep me");
        string line = Refused(dir, "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"p\"\n\n[stats]\nout = \"../victim.txt\"\n");
        Assert.Contains("stats.out", line);
        Assert.Contains("line 7", line);
        Assert.Equal("keep me", File.ReadAllText(dir.File("victim.txt")));

        var allowed = RunRecipe(dir, "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"p\"\nwrite-outside = true\n\n[stats]\nout = \"../outside.nc\"\n");
        Assert.True(allowed.ExitCode == 0, allowed.Stderr);
        Assert.True(File.Exists(dir.File("outside.nc")));
    }
}
