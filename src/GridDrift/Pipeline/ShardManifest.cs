using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using GridDrift.Frames;

namespace GridDrift.Pipeline;

/// <summary>
/// OUT/shards/shard-II-of-NN/shard.json: which recipe, which shard of how many, which frames and
/// times of the record it owns, and on which host it ran. griddrift gather reads it to check that
/// every shard of one run is there exactly once, and lists it in the gathered products.
/// </summary>
internal sealed record ShardManifest(string Recipe, ShardSpec Shard, FrameSlice Slice, int RecordFrames, string FirstTime, string LastTime, string Host, string Folder)
{
    public const string FileName = "shard.json";

    /// <summary>The climatology a shard leaves: the mergeable state, not the finished fields.</summary>
    public static string PartialName(string climatology) =>
        Path.Combine(Path.GetDirectoryName(climatology)!, Path.GetFileNameWithoutExtension(climatology) + ".partial.nc");

    /// <summary>Works out the shard's slice of the record and records it before any step runs.</summary>
    internal static FrameSlice Begin(Recipe recipe, ShardSpec shard, IReadOnlyList<string> inputs, string variable, string folder)
    {
        using var source = FrameSource.Open(inputs, variable, RecipeRunner.SelectionOf(recipe));
        var slice = FrameSlice.OfShard(shard.Index, shard.Count, source.FrameCount);
        if (slice.Count == 0)
            throw new BadInputException(recipe.Path, "input.files", $"the record has {source.FrameCount} frames, too few for {shard.Count} shards");
        var manifest = new ShardManifest(recipe.Path, shard, slice, source.FrameCount,
            source.Times[slice.First].ToIsoString(), source.Times[slice.End - 1].ToIsoString(), Environment.MachineName, folder);
        manifest.Save();
        return slice;
    }

    void Save()
    {
        var json = new JsonObject
        {
            ["recipe"] = Recipe,
            ["shard"] = Shard.Index,
            ["shards"] = Shard.Count,
            ["first_frame"] = Slice.First,
            ["frames"] = Slice.Count,
            ["record_frames"] = RecordFrames,
            ["first_time"] = FirstTime,
            ["last_time"] = LastTime,
            ["host"] = Host,
        };
        GridDrift.Outputs.AtomicFile.WriteAllText(Path.Combine(Folder, FileName), json.ToJsonString(new JsonSerializerOptions { WriteIndented = true }));
    }

    public static ShardManifest Load(string folder)
    {
        string path = Path.Combine(folder, FileName);
        if (!File.Exists(path)) throw new BadInputException(folder, null, $"is not a shard folder (no {FileName}; griddrift run RECIPE --shard I/N makes one)");
        try
        {
            var j = JsonNode.Parse(File.ReadAllText(path))!.AsObject();
            return new ShardManifest((string)j["recipe"]!, new ShardSpec((int)j["shard"]!, (int)j["shards"]!), new FrameSlice((int)j["first_frame"]!, (int)j["frames"]!),
                (int)j["record_frames"]!, (string)j["first_time"]!, (string)j["last_time"]!, (string?)j["host"] ?? "", Path.GetFullPath(folder));
        }
        catch (Exception e) when (e is JsonException or NullReferenceException or InvalidOperationException or FormatException)
        {
            throw new BadInputException(path, null, "is not a readable shard manifest: " + e.Message);
        }
    }

    /// <summary>One line for the gathered products' provenance.</summary>
    public string Describe() =>
        $"shard {Shard}: frames {Slice.First.ToString(CultureInfo.InvariantCulture)}..{(Slice.End - 1).ToString(CultureInfo.InvariantCulture)} of {RecordFrames.ToString(CultureInfo.InvariantCulture)} ({FirstTime} to {LastTime}) on {Host}, {Folder}";
}
