using GridDrift.Formats;

namespace GridDrift.Products;

/// <summary>The CF scalar coordinates a product's variable names in its coordinates attribute (e.g. the level it was made at).</summary>
internal static class ProductScalars
{
    public static List<ScalarCoordinate> Of(IDatasetReader reader, NcVariable data) =>
        (data.Attributes.Text("coordinates") ?? "").Split(' ', StringSplitOptions.RemoveEmptyEntries)
            .Select(reader.FindVariable).OfType<NcVariable>().Where(v => v.Rank == 0 && NcTypes.IsNumeric(v.Type))
            .Select(v => new ScalarCoordinate(v.Name, reader.ReadAllDoubles(v)[0], v.Attributes.Text("units"), v.Attributes.Text("standard_name"),
                v.Attributes.Text("long_name"), v.Attributes.Text("axis"), v.Attributes.Text("positive"))).ToList();
}
