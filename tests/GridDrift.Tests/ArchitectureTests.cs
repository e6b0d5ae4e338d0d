using System.Text.RegularExpressions;

namespace GridDrift.Tests;

/// <summary>
/// docs/architecture.md against the code: the folders of src/GridDrift depend only on folders
/// before them in the page's data direction, and frames are read only by the engine in Frames/.
/// </summary>
public class ArchitectureTests
{
    static string Repository()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "GridDrift.sln"))) return dir.FullName;
        throw new InvalidOperationException("the tests run outside the repository");
    }

    static IEnumerable<(string Folder, string File, string Text)> Sources()
    {
        string src = Path.Combine(Repository(), "src", "GridDrift");
        foreach (var file in Directory.EnumerateFiles(src, "*.cs", SearchOption.AllDirectories))
        {
            var parts = Path.GetRelativePath(src, file).Split(Path.DirectorySeparatorChar);
            if (parts.Length < 2 || parts[0] is "bin" or "obj") continue;
            yield return (parts[0], file, File.ReadAllText(file));
        }
    }

    [Fact]
    public void Every_folder_depends_only_on_folders_before_it_in_the_documented_direction()
    {
        string page = File.ReadAllText(Path.Combine(Repository(), "docs", "architecture.md"));
        string direction = page.Split('\n').First(l => l.StartsWith("files ─►", StringComparison.Ordinal));
        var order = direction.Split("─►").Skip(1).Select(s => s.Trim()).ToList();
        Assert.Contains("Frames", order);
        var faults = new List<string>();
        foreach (var (folder, file, text) in Sources())
        {
            int mine = order.IndexOf(folder);
            if (mine < 0) { faults.Add($"{folder} is not in the page's data direction"); continue; }
            foreach (Match m in Regex.Matches(text, @"\bGridDrift\.(\w+)"))
            {
                int theirs = order.IndexOf(m.Groups[1].Value);
                if (theirs > mine) faults.Add($"{Path.GetFileName(file)} in {folder} names {m.Groups[1].Value}");
            }
        }
        Assert.Empty(faults.Distinct());
    }

    [Fact]
    public void Only_the_engine_reads_frames()
    {
        var readers = Sources().Where(s => s.Folder != "Frames" && s.Text.Contains(".ReadFrame(", StringComparison.Ordinal)).Select(s => Path.GetFileName(s.File));
        Assert.Empty(readers);
    }
}
