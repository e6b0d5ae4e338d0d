using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Results;
using GridDrift.Outputs.Series;

namespace GridDrift.Pipeline;

/// <summary>
/// Joins series NetCDF pieces of consecutive time slices (the products of the shards of one
/// sharded run) into the series product of the whole record: each piece's steps are written
/// again, in order, through the same writers a one-machine run uses, so the values, the
/// metadata and the Parquet table come out as that run's. Pieces must agree in regions,
/// quantities and time axis, and follow one another in time.
/// </summary>
internal static class SeriesPieces
{
    static readonly HashSet<string> ProvenanceKeys = ["Conventions", "source", "griddrift_version", "history", "command", "input_files", "input_sha256", "caution"];

    public sealed record Joined(int Steps, IReadOnlyList<string> InputFiles, IReadOnlyList<string> InputSha256);

    /// <param name="inputs">the inputs of the whole product, in order: each piece names the checksums of the files it read</param>
    public static Joined Join(IReadOnlyList<string> pieces, string netCdf, string? table, string sourceVariable, string command,
        IReadOnlyList<string> inputs, IReadOnlyDictionary<string, string> extraAttributes, ClassicVariant? format = null)
    {
        if (pieces.Count == 0) throw new BadInputException(null, null, "no series pieces to join");
        using var first = DatasetFiles.Open(pieces[0]);
        var shape = Shape.Of(first);
        var attributes = first.Attributes.Where(a => !ProvenanceKeys.Contains(a.Name))
            .ToDictionary(a => a.Name, a => a.AsTextOrNumber(), StringComparer.Ordinal);
        var skipped = new List<string>();
        var known = new Dictionary<string, string>();
        foreach (var piece in pieces)
        {
            using var r = DatasetFiles.Open(piece);
            if (r.Attributes.Text("skipped_pairs") is { } s && s != "none") skipped.Add(s);
            var files = (r.Attributes.Text("input_files") ?? "").Split('\n', StringSplitOptions.RemoveEmptyEntries);
            var checksums = (r.Attributes.Text("input_sha256") ?? "").Split('\n', StringSplitOptions.RemoveEmptyEntries);
            for (int i = 0; i < Math.Min(files.Length, checksums.Length); i++) known[files[i]] = checksums[i];
        }
        if (attributes.ContainsKey("skipped_pairs")) attributes["skipped_pairs"] = skipped.Count == 0 ? "none" : string.Join("; ", skipped);
        foreach (var (k, v) in extraAttributes) attributes[k] = v;
        var sums = inputs.Select(f => known.TryGetValue(f, out var sum) ? sum : ChecksumCache.Sha256(f)).ToList();
        var provenance = new Provenance(command, inputs, sums, DateTime.UtcNow);
        List<ScalarCoordinate> scalars;
        using (var piece0 = DatasetFiles.Open(pieces[0])) scalars = GridDrift.Products.ProductScalars.Of(piece0, piece0.RequireVariable(shape.Quantities[0].Name));
        var layout = new SeriesLayout(sourceVariable, shape.Regions, shape.Areas, shape.Quantities, shape.TimeUnits, shape.Calendar, provenance, attributes, shape.HasBounds, scalars);

        int nq = shape.Quantities.Count, nr = shape.Regions.Length, steps = 0;
        var values = new double[nq * nr];
        var valid = new double[nr];
        CfTime? last = null;
        using var products = new SeriesProducts(netCdf, table, layout, format);
        foreach (var piece in pieces)
        {
            using var r = DatasetFiles.Open(piece);
            var here = Shape.Of(r);
            if (!here.Regions.SequenceEqual(shape.Regions) || !here.Quantities.SequenceEqual(shape.Quantities) || here.TimeUnits.Text != shape.TimeUnits.Text || here.HasBounds != shape.HasBounds)
                throw new BadInputException(piece, null, $"differs from {pieces[0]} in its regions, quantities or time axis: these are not pieces of one series");
            var time = TimeAxis.Read(r, r.RequireVariable("time"));
            var columns = here.Quantities.Select(q => r.ReadAllDoubles(r.RequireVariable(q.Name))).ToArray();
            var fractions = r.ReadAllDoubles(r.RequireVariable("valid_fraction"));
            var bounds = here.HasBounds ? r.ReadAllDoubles(r.RequireVariable("time_bnds")) : null;
            for (int t = 0; t < time.Times.Length; t++)
            {
                if (last is { } l && time.Times[t] <= l)
                    throw new BadInputException(piece, "time", $"step {time.Times[t].ToIsoString()} does not follow {l.ToIsoString()} of the piece before: give the pieces in shard order, each once");
                last = time.Times[t];
                for (int reg = 0; reg < nr; reg++)
                {
                    for (int q = 0; q < nq; q++) values[reg * nq + q] = columns[q][t * nr + reg];
                    valid[reg] = fractions[t * nr + reg];
                }
                products.Write(time.Times[t], values, valid, bounds is null ? null : time.Units.Decode(bounds[2 * t]));
                steps++;
            }
        }
        products.Complete();
        return new Joined(steps, inputs, sums);
    }

    sealed record Shape(string[] Regions, double[] Areas, IReadOnlyList<SeriesQuantity> Quantities, TimeUnits TimeUnits, string Calendar, bool HasBounds)
    {
        public static Shape Of(IDatasetReader r)
        {
            var time = r.RequireVariable("time");
            string calendar = time.Attributes.Text("calendar") ?? "standard";
            var units = TimeUnits.Parse(time.Attributes.Text("units") ?? throw new BadInputException(r.Path, "time", "has no units"),
                CfCalendars.Parse(calendar) ?? throw new BadInputException(r.Path, "time", $"calendar '{calendar}' is not a CF calendar"));
            var quantities = r.Variables
                .Where(v => v.Rank == 2 && v.Dimensions[0] == time.Dimensions[0] && v.Type == NcType.Double && v.Name is not ("valid_fraction" or "time_bnds"))
                .Select(v => new SeriesQuantity(v.Name, v.Attributes.Text("long_name") ?? "", v.Attributes.Text("units") ?? "", v.Attributes.Text("cell_methods") ?? ""))
                .ToList();
            return new Shape(r.ReadText(r.RequireVariable("region_name")), r.ReadAllDoubles(r.RequireVariable("region_area")), quantities, units, calendar,
                r.FindVariable("time_bnds") is not null);
        }
    }
}
