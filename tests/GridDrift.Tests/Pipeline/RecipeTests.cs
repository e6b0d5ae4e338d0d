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
}
