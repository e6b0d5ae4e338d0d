using System.Text.Json.Nodes;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// Hostile Zarr stores (edits of the invented sample store) are bad input like a corrupt NetCDF
/// file: exit code 2 and one line naming the store, never an internal fault (DESIGN.md).
/// </summary>
public class HostileStoreTests
{
    static string Copy(TempFolder dir)
    {
        string source = Path.Combine(SharedData.Repository, "cf-samples", "tcwv_synthetic_2031.zarr"), store = dir.File("hostile.zarr");
        foreach (var file in Directory.EnumerateFiles(source, "*", SearchOption.AllDirectories))
        {
            string target = Path.Combine(store, Path.GetRelativePath(source, file));
            Directory.CreateDirectory(Path.GetDirectoryName(target)!);
            File.Copy(file, target);
        }
        File.Delete(Path.Combine(store, ".zmetadata")); // the edits below must be read, not the consolidated copy
        return store;
    }

    static void EditArray(string store, Action<JsonObject> edit)
    {
        string path = Path.Combine(store, "tcwv", ".zarray");
        var meta = JsonNode.Parse(File.ReadAllText(path))!.AsObject();
        edit(meta);
        File.WriteAllText(path, meta.ToJsonString());
    }

    public static TheoryData<string> Faults() => ["huge chunks", "chunks of another rank", "unknown compressor", "cut chunk", "not JSON"];

    [Theory]
    [MemberData(nameof(Faults))]
    public void A_hostile_store_is_refused_with_one_line(string fault)
    {
        using var dir = new TempFolder();
        string store = Copy(dir);
        switch (fault)
        {
            case "huge chunks": EditArray(store, m => m["chunks"] = new JsonArray(100000, 100000, 100000)); break;
            case "chunks of another rank": EditArray(store, m => m["chunks"] = new JsonArray(8, 36)); break;
            case "unknown compressor": EditArray(store, m => m["compressor"] = new JsonObject { ["id"] = "mystery" }); break;
            case "cut chunk":
                string chunk = Path.Combine(store, "tcwv", "0.0.0");
                File.WriteAllBytes(chunk, File.ReadAllBytes(chunk)[..100]);
                break;
            case "not JSON": File.WriteAllText(Path.Combine(store, "tcwv", ".zarray"), "{ shape: "); break;
        }
        var outcome = CliRun.Run("stats", store, "--var", "tcwv", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.True(outcome.ExitCode == 2, $"{fault}: exit {outcome.ExitCode}: {outcome.Stderr}");
        var line = Assert.Single(outcome.StderrLines);
        Assert.StartsWith($"griddrift: {store}", line);
        Assert.DoesNotContain("   at ", outcome.Stderr);
    }
}
