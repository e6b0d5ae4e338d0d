using System.Globalization;

namespace GridDrift.Pipeline;

/// <summary>Shard I of N of a sharded run (`--shard I/N`, counted from 1): which slice of the record it owns and where it writes.</summary>
internal readonly record struct ShardSpec(int Index, int Count)
{
    public static ShardSpec Parse(string text)
    {
        var parts = text.Split('/');
        if (parts.Length == 2 && int.TryParse(parts[0], NumberStyles.None, CultureInfo.InvariantCulture, out int i)
            && int.TryParse(parts[1], NumberStyles.None, CultureInfo.InvariantCulture, out int n) && n >= 1 && i >= 1 && i <= n)
            return new ShardSpec(i, n);
        throw new FormatException($"--shard '{text}' should be I/N with 1 <= I <= N, e.g. 2/4");
    }

    /// <summary>OUT/shards/shard-II-of-NN (at least two digits): the shard's own products, checkpoints and manifest.</summary>
    public string Folder(string outDir) => Path.Combine(outDir, "shards", $"shard-{Index.ToString("D2", CultureInfo.InvariantCulture)}-of-{Count.ToString("D2", CultureInfo.InvariantCulture)}");

    /// <summary>A shard's checkpoints hold for that shard only.</summary>
    public string Fingerprint(string stepFingerprint) => $"{stepFingerprint}:shard {this}";

    public override string ToString() => $"{Index}/{Count}";
}
