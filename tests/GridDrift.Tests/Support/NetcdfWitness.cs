using System.Text.Json;

namespace GridDrift.Tests.Support;

/// <summary>
/// python netCDF4's reading of many files at once (scripts/mutant_digests.py): per file, an error
/// mark or per variable its shape, sum and non-finite count. netCDF-C itself can die on a corrupt
/// file (seen: "stack smashing detected", "munmap_chunk(): invalid pointer"); the file it died on
/// counts as refused by it, and the reading goes on from the next file.
/// </summary>
public static class NetcdfWitness
{
    public static Dictionary<string, JsonElement> Digests(string listFile, IReadOnlyList<string> paths)
    {
        File.WriteAllLines(listFile, paths);
        var digests = new Dictionary<string, JsonElement>();
        string script = Path.Combine(AppContext.BaseDirectory, "scripts", "mutant_digests.py");
        while (digests.Count < paths.Count)
        {
            int skip = digests.Count;
            var run = ExternalTools.Run(ExternalTools.Python, $"\"{script}\" \"{listFile}\" {skip}", timeoutSeconds: 600);
            foreach (var line in run.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries))
            {
                var e = JsonDocument.Parse(line).RootElement;
                digests[e.GetProperty("file").GetString()!] = e;
            }
            if (run.ExitCode != 0 && digests.Count < paths.Count)
                digests[paths[digests.Count]] = JsonDocument.Parse($"{{\"file\": {JsonSerializer.Serialize(paths[digests.Count])}, \"error\": true, \"crashed\": true}}").RootElement;
        }
        return digests;
    }

    public static bool Refuses(JsonElement digest) => digest.TryGetProperty("error", out _);
}
