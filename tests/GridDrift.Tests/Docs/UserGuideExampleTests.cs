using System.Text;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Docs;

/// <summary>
/// Every example of docs/user-guide.md runs as written: the page's ```sh blocks, in order, each
/// through bash (which does the quoting, globs and line continuations a user's shell does) in a
/// folder that holds cf-samples/, with the griddrift built beside these tests first on PATH. A
/// fenced block after a <c>&lt;!-- file: NAME --&gt;</c> line is written to NAME first. Only a line
/// marked "# needs a Slurm cluster" is left out, and a line marked "# needs libeccodes0" where
/// ecCodes is missing (except in CI, which installs it). Any example that no longer runs fails the
/// test, naming the block.
/// </summary>
public class UserGuideExampleTests
{
    sealed record Block(int Line, string Fence, string Text, string? FileName);

    static List<Block> Blocks(string markdown)
    {
        var blocks = new List<Block>();
        var lines = markdown.Split('\n');
        string? fileName = null;
        for (int i = 0; i < lines.Length; i++)
        {
            if (lines[i].StartsWith("<!-- file: ", StringComparison.Ordinal)) { fileName = lines[i]["<!-- file: ".Length..].Replace("-->", "").Trim(); continue; }
            if (!lines[i].StartsWith("```", StringComparison.Ordinal) || lines[i].Length == 3) continue;
            int start = i;
            var text = new StringBuilder();
            for (i++; i < lines.Length && !lines[i].StartsWith("```", StringComparison.Ordinal); i++) text.Append(lines[i]).Append('\n');
            blocks.Add(new Block(start + 1, lines[start][3..].Trim(), text.ToString(), fileName));
            fileName = null;
        }
        return blocks;
    }

    [InteropFact(Needs.Fonts)]
    public void Every_example_of_the_user_guide_runs_as_written()
    {
        using var dir = new TempFolder();
        Directory.CreateSymbolicLink(dir.File("cf-samples"), Path.Combine(SharedData.Repository, "cf-samples"));
        var blocks = Blocks(File.ReadAllText(Path.Combine(SharedData.Repository, "docs", "user-guide.md")));
        int run = 0, leftOut = 0;
        foreach (var block in blocks)
        {
            if (block.FileName is { } name) { File.WriteAllText(dir.File(name), block.Text); continue; }
            if (block.Fence != "sh") continue;
            bool withoutEccodes = !GridDrift.Formats.Grib.Eccodes.Available && !ExternalTools.InteropRequired;
            var kept = block.Text.Split('\n').Where(l => !l.Contains("# needs a Slurm cluster", StringComparison.Ordinal)
                && !(withoutEccodes && l.Contains("# needs libeccodes0", StringComparison.Ordinal))).ToList();
            leftOut += block.Text.Split('\n').Count(l => l.Contains("# needs a Slurm cluster", StringComparison.Ordinal));
            string script = dir.File($"block_{block.Line}.sh");
            File.WriteAllText(script, "set -euo pipefail\nexport PATH=\"" + AppContext.BaseDirectory.TrimEnd('/') + ":$PATH\"\n" + string.Join('\n', kept));
            var outcome = ExternalTools.Run("bash", $"\"{script}\"", timeoutSeconds: 300, workingDirectory: dir.Path);
            Assert.True(outcome.ExitCode == 0, $"user-guide.md line {block.Line}: exit {outcome.ExitCode}\n{block.Text}\n{outcome.Stderr}");
            run++;
        }
        Assert.True(run >= 15, $"only {run} example blocks found");
        Assert.True(leftOut <= 2, $"{leftOut} example lines left out");
    }
}
