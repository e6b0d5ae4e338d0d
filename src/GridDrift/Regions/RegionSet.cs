using GridDrift.Grids;

namespace GridDrift.Regions;

/// <summary>
/// The regions of one analysis on one grid, built once: their shapes, the separable row-and-column
/// factors where every region is a latitude-longitude box on a latitude-longitude grid
/// (<see cref="SeparablePlan"/>), and the fractional cover of every cell (<see cref="RegionMask"/>),
/// built when an operator needs it (always, without a plan). Every per-region operator takes one.
/// </summary>
public sealed class RegionSet
{
    readonly Lazy<RegionMask> _mask;
    readonly double[]? _boxAreas;

    RegionSet(Grid grid, IReadOnlyList<RegionShape> shapes, SeparablePlan? separable)
    {
        Grid = grid;
        Shapes = shapes;
        Separable = separable;
        // a mask holds every cell of every region (20 bytes an entry: 550 MB for 163 regions of a
        // 3712 × 3712 grid); where the separable plan serves, it is built only if asked for
        _mask = new Lazy<RegionMask>(() => RegionMaskBuilder.Build(grid, shapes));
        _boxAreas = separable?.BoxAreas();
        Names = shapes.Select(s => s.Name).ToArray();
    }

    /// <summary>Regions from their specifications (global, bands:STEP, tiles:DLATxDLON, box:NAME=S,N,W,E, file:PATH.geojson).</summary>
    public static RegionSet Build(Grid grid, IReadOnlyList<string> specs) => Build(grid, RegionSpecs.ParseInput(specs));

    public static RegionSet Build(Grid grid, IReadOnlyList<RegionShape> shapes)
    {
        var set = new RegionSet(grid, shapes, SeparablePlan.TryBuild(grid, shapes));
        // the mask's builder checks the shapes against the grid: without a plan it is needed anyway
        if (set.Separable is null) _ = set.Mask;
        return set;
    }

    public Grid Grid { get; }
    public IReadOnlyList<RegionShape> Shapes { get; }
    public int Count => Names.Count;
    public IReadOnlyList<string> Names { get; }
    /// <summary>Area of each region on the sphere, m².</summary>
    public IReadOnlyList<double> Areas => _boxAreas ?? Mask.RegionArea;

    /// <summary>Every region's cells and their areas inside it (built on first use).</summary>
    internal RegionMask Mask => _mask.Value;
    internal SeparablePlan? Separable { get; }
}
