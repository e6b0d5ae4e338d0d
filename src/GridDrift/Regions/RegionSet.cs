using GridDrift.Grids;

namespace GridDrift.Regions;

/// <summary>
/// The regions of one analysis on one grid, built once: their shapes, the fractional cover of
/// every cell (<see cref="RegionMask"/>), the separable row-and-column factors where every region
/// is a latitude-longitude box on a latitude-longitude grid (<see cref="SeparablePlan"/>). Every per-region operator takes one.
/// </summary>
public sealed class RegionSet
{
    RegionSet(Grid grid, IReadOnlyList<RegionShape> shapes, RegionMask mask, SeparablePlan? separable)
    {
        Grid = grid;
        Shapes = shapes;
        Mask = mask;
        Separable = separable;
    }

    /// <summary>Regions from their specifications (global, bands:STEP, tiles:DLATxDLON, box:NAME=S,N,W,E, file:PATH.geojson).</summary>
    public static RegionSet Build(Grid grid, IReadOnlyList<string> specs) => Build(grid, RegionSpecs.ParseInput(specs));

    public static RegionSet Build(Grid grid, IReadOnlyList<RegionShape> shapes) =>
        new(grid, shapes, RegionMaskBuilder.Build(grid, shapes), SeparablePlan.TryBuild(grid, shapes));

    public Grid Grid { get; }
    public IReadOnlyList<RegionShape> Shapes { get; }
    public int Count => Mask.Count;
    public IReadOnlyList<string> Names => Mask.Names;
    /// <summary>Area of each region on the sphere, m².</summary>
    public IReadOnlyList<double> Areas => Mask.RegionArea;

    internal RegionMask Mask { get; }
    internal SeparablePlan? Separable { get; }
}
