using System.Reflection;
using GridDrift.Formats;

namespace GridDrift.Results;

/// <summary>What every product records of where it came from (DESIGN.md "Every product").</summary>
public sealed record Provenance(string Command, IReadOnlyList<string> Inputs, IReadOnlyList<string> InputSha256, DateTime CreatedUtc)
{
    public static string Version =>
        typeof(Provenance).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion.Split('+')[0] ?? "0.0.0";

    public static Provenance For(string command, IReadOnlyList<string> inputs) =>
        new(command, inputs, inputs.Select(ChecksumCache.Sha256).ToList(), DateTime.UtcNow);

    /// <summary>Provenance whose checksums are computed only when a product is written (a result kept in memory needs none).</summary>
    public static Provenance Pending(string command, IReadOnlyList<string> inputs) => new(command, inputs, [], DateTime.UtcNow);

    /// <summary>A CF history line: ISO 8601 UTC time, then the command (CF §2.6.2).</summary>
    public string HistoryLine => $"{CreatedUtc:yyyy-MM-ddTHH:mm:ssZ} {Command}";

    public IReadOnlyDictionary<string, string> AsKeyValues(IReadOnlyDictionary<string, string>? extra = null)
    {
        var kv = new Dictionary<string, string>
        {
            ["Conventions"] = "CF-1.12",
            ["source"] = "GridDrift " + Version,
            ["griddrift_version"] = Version,
            ["history"] = HistoryLine,
            ["command"] = Command,
            ["input_files"] = string.Join("\n", Inputs),
            ["input_sha256"] = string.Join("\n", InputSha256),
            ["caution"] = "GridDrift is an analysis tool, not a warning or forecasting service; consult the responsible meteorological services.",
        };
        if (extra is not null) foreach (var (k, v) in extra) kv[k] = v;
        return kv;
    }
}
