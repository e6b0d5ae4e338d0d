using GridDrift.Conventions.Coordinates;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Grids;
using GridDrift.Outputs;
using GridDrift.Outputs.Masks;
using GridDrift.Outputs.Plots;
using GridDrift.Regions;
using GridDrift.Results;

namespace GridDrift.Workflows;

internal sealed record RegionsOptions(string GridFile, IReadOnlyList<string> Regions, string Output, string? Png = null, string? Variable = null,
    double EarthRadius = Sphere.MeanEarthRadius, ClassicVariant? Format = null, string Command = "griddrift regions");

/// <summary>`griddrift regions`: build the masks of regions on a file's grid once, write them and draw them.</summary>
internal static class RegionsStep
{
    public static (Grid Grid, RegionMask Mask) Run(RegionsOptions o)
    {
        Grid grid;
        using (var reader = DatasetFiles.Open(o.GridFile))
        {
            var variable = o.Variable is not null ? reader.RequireVariable(o.Variable)
                : reader.Variables.FirstOrDefault(v => v.Rank >= 2 && NcTypes.IsNumeric(v.Type) && v.Attributes.Text("bounds") is null
                                                       && !IsCoordinate(reader, v) && HasGrid(reader, v))
                  ?? throw new BadInputException(o.GridFile, null, "no gridded variable to take the grid from (name one with --var)");
            grid = GridReader.Read(reader, VariableAxes.Discover(reader, variable), o.EarthRadius);
        }
        var shapes = RegionSpecs.ParseInput(o.Regions);
        var mask = RegionMaskBuilder.Build(grid, shapes);
        MaskNetCdfWriter.Write(o.Output, grid, mask, o.Regions, Provenance.For(o.Command, [o.GridFile]), o.Format);
        if (o.Png is not null)
            RegionMapPlot.Save(o.Png, grid, shapes, mask, $"GridDrift regions on {Path.GetFileName(o.GridFile)} ({grid.Rows} × {grid.Columns} cells)");
        return (grid, mask);
    }

    static bool IsCoordinate(IDatasetReader reader, NcVariable v) =>
        reader.Variables.Any(o => (o.Attributes.Text("coordinates") ?? "").Split(' ').Contains(v.Name));

    static bool HasGrid(IDatasetReader reader, NcVariable v)
    {
        var axes = VariableAxes.Discover(reader, v);
        return (axes.Latitude is not null && axes.Longitude is not null) || (axes.ProjectionX is not null && axes.GridMapping is not null);
    }
}
