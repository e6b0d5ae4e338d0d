using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// Text from a file never reaches the terminal raw: an attribute holding an escape sequence
/// (ECMA-48's CSI, ESC '['), a bell, a carriage return and a line feed is printed by describe,
/// and named in an error line, with those characters escaped — one line stays one line.
/// </summary>
public class ControlCharacterTests
{
    const string Hostile = "K\u001b[31m\u0007\r\nforged line";

    static string File(TempFolder dir)
    {
        string path = dir.File("in.nc");
        using var w = ClassicWriter.Create(path, ClassicVariant.Cdf2);
        var x = w.AddDimension("x", 3);
        var v = w.AddVariable("tb", NcType.Float, [x], [NcAttribute.Text("units", Hostile), NcAttribute.Text("long_name", Hostile)]);
        w.EndDefinitions();
        w.Write<float>(v, [1f, 2f, 3f]);
        w.Commit();
        return path;
    }

    [Fact]
    public void Describe_escapes_control_characters_of_attributes()
    {
        using var dir = new TempFolder();
        var outcome = CliRun.Run("describe", File(dir), "--attributes");
        Assert.Equal(0, outcome.ExitCode);
        Assert.DoesNotContain(outcome.Stdout, c => char.IsControl(c) && c is not '\n' and not '\r');
        Assert.DoesNotContain(outcome.Stdout.Split('\n'), line => line.StartsWith("forged line", StringComparison.Ordinal));
        Assert.Contains("\\x1b[31m\\x07\\r\\nforged line", outcome.Stdout);
    }

    [Fact]
    public void An_error_line_escapes_control_characters_of_a_name()
    {
        using var dir = new TempFolder();
        var outcome = CliRun.Run("stats", File(dir), "--var", "no\u001b]0;title\u0007such", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.DoesNotContain(line, char.IsControl);
        Assert.Contains("\\x1b]0;title\\x07", line);
    }
}
