using System.Text.RegularExpressions;
using System.Xml.Linq;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// docs/install.md's two commands, run as written except that the tool goes into a temporary
/// tool path instead of the user's (--global → --tool-path) and the package folder is temporary:
/// the installed griddrift reports the version Directory.Build.props declares, describes a
/// sample file, and its bash completion script completes through it (bash runs the script).
/// </summary>
public class InstallTests
{
    static string[] InstallCommands()
    {
        string page = File.ReadAllText(Path.Combine(SharedData.Repository, "docs", "install.md"));
        var block = Regex.Match(page, "```sh\n(.*?)```", RegexOptions.Singleline).Groups[1].Value;
        return block.Split('\n', StringSplitOptions.RemoveEmptyEntries);
    }

    [Fact]
    public void The_documented_commands_install_a_griddrift_that_runs()
    {
        using var dir = new TempFolder();
        var commands = InstallCommands();
        Assert.Equal(2, commands.Length);
        Assert.StartsWith("dotnet pack ", commands[0]);
        Assert.StartsWith("dotnet tool install --global ", commands[1]);
        string tools = dir.File("tools");
        foreach (var line in commands)
        {
            string arguments = line["dotnet ".Length..]
                .Replace(" nupkg", " " + dir.File("nupkg"))
                .Replace("--global", $"--tool-path {tools}");
            var run = ExternalTools.Run("dotnet", arguments, timeoutSeconds: 600, workingDirectory: SharedData.Repository);
            Assert.True(run.ExitCode == 0, $"{line}: {run.Stdout} {run.Stderr}");
        }
        string griddrift = Path.Combine(tools, "griddrift");
        string declared = XDocument.Load(Path.Combine(SharedData.Repository, "Directory.Build.props")).Descendants("Version").Single().Value;
        var version = ExternalTools.Run(griddrift, "--version");
        Assert.Equal(0, version.ExitCode);
        Assert.StartsWith(declared, version.Stdout.Trim());

        var describe = ExternalTools.Run(griddrift, $"describe \"{SharedData.Sample("tcwv_synthetic_2031.nc")}\"");
        Assert.True(describe.ExitCode == 0, describe.Stderr);
        Assert.Contains("tcwv", describe.Stdout);

        // bash itself runs the completion script, with the installed griddrift first on PATH
        File.WriteAllText(dir.File("complete.sh"), ExternalTools.Run(griddrift, "completion bash").Stdout +
            "COMP_LINE='griddrift sta'; COMP_POINT=${#COMP_LINE}; _griddrift_complete; printf '%s\\n' \"${COMPREPLY[@]}\"\n" +
            "COMP_LINE='griddrift demo --size '; COMP_POINT=${#COMP_LINE}; _griddrift_complete; printf '%s\\n' \"${COMPREPLY[@]}\"\n");
        var completed = ExternalTools.Run("bash", $"-c \"PATH='{tools}':$PATH; source '{dir.File("complete.sh")}'\"");
        Assert.True(completed.ExitCode == 0, completed.Stderr);
        Assert.Equal(["stats", "default", "small"], completed.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries));
    }
}

/// <summary>A skipped test teaches: every outside need names what is missing and the one command that provides it.</summary>
public class SkipMessageTests
{
    [Fact]
    public void Every_need_names_the_command_that_provides_it()
    {
        var needs = Enum.GetValues<Needs>().Where(n => n != Needs.None).ToList();
        Assert.Equal(needs.Order(), InteropFactAttribute.Remedies.Keys.Order());
        Assert.All(InteropFactAttribute.Remedies.Values, r =>
            Assert.True(r.Contains("apt-get install ", StringComparison.Ordinal) || r.Contains("export GRIDDRIFT_SHARED=", StringComparison.Ordinal)
                || r.Contains("npm ci --prefix ", StringComparison.Ordinal), r));
    }
}
