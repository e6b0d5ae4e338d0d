using GridDrift.Operators.Climatology;
using GridDrift.Formats;
using GridDrift.Formats.Classic;

namespace GridDrift.Products;

/// <summary>
/// The mergeable state of a climatology over part of a record, as one shard of a sharded run
/// leaves it: count, mean and M2 (the sum of squared deviations) per slot and cell in float64,
/// in a CDF-5 file with dimensions (slot, cell). Unlike the finished climatology it loses
/// nothing, so partial states merge (Chan, Golub &amp; LeVeque 1983) into the state of the whole.
/// </summary>
internal static class PartialClimatologyFile
{
    public const string Marker = "griddrift_partial_climatology";

    public static void Write(string path, MomentState state, IReadOnlyDictionary<string, string> attributes)
    {
        using var w = ClassicWriter.Create(path, ClassicVariant.Cdf5);
        var slot = w.AddDimension("slot", state.Slots);
        var cell = w.AddDimension("cell", state.Cells);
        w.AddAttribute(NcAttribute.Text(Marker, "count, mean and M2 per slot and cell; merge with griddrift gather"));
        foreach (var (k, v) in attributes) w.AddAttribute(NcAttribute.Global(k, v));
        var count = w.AddVariable("count", NcType.Double, [slot, cell], [NcAttribute.Text("long_name", "number of valid samples")]);
        var mean = w.AddVariable("mean", NcType.Double, [slot, cell], [NcAttribute.Text("long_name", "running mean")]);
        var m2 = w.AddVariable("m2", NcType.Double, [slot, cell], [NcAttribute.Text("long_name", "sum of squared deviations from the mean")]);
        w.EndDefinitions();
        w.Write<double>(count, state.Count);
        w.Write<double>(mean, state.Mean);
        w.Write<double>(m2, state.M2);
        w.Commit();
    }

    /// <summary>Adds the state in <paramref name="path"/> into <paramref name="into"/>; refuses a state of another shape or kind.</summary>
    public static IReadOnlyDictionary<string, string> MergeInto(string path, MomentState into, string kind)
    {
        using var reader = DatasetFiles.Open(path);
        if (reader.Attributes.Text(Marker) is null)
            throw new BadInputException(path, null, "is not a partial climatology state (written by griddrift run --shard)");
        if (reader.Attributes.Text("climatology_kind") is { } k && k != kind)
            throw new BadInputException(path, null, $"holds a {k} state; the climatology asked for is {kind}");
        var count = reader.RequireVariable("count");
        if (count.Rank != 2 || count.Dimensions[0].Length != into.Slots || count.Dimensions[1].Length != into.Cells)
            throw new BadInputException(path, "count", $"is {string.Join(" x ", count.Shape)}; the record needs {into.Slots} slots x {into.Cells} cells");
        using var part = new MomentState(into.Slots, into.Cells);
        long[] start = [0, 0], shape = [into.Slots, into.Cells];
        reader.ReadDoubles(count, start, shape, part.Count);
        reader.ReadDoubles(reader.RequireVariable("mean"), start, shape, part.Mean);
        reader.ReadDoubles(reader.RequireVariable("m2"), start, shape, part.M2);
        into.Merge(part);
        return reader.Attributes.ToDictionary(a => a.Name, a => a.AsTextOrNumber(), StringComparer.Ordinal);
    }
}
