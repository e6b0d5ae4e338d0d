namespace GridDrift.Regions;

/// <summary>
/// The regions of one grid, built once: per region the frame positions of the cells it touches
/// and the area of each cell that lies inside it (m²), stored compactly row by row (CSR:
/// region r owns entries RowStart[r] … RowStart[r+1]−1).
/// </summary>
internal sealed class RegionMask
{
    public required string[] Names { get; init; }
    public required int[] RowStart { get; init; }
    public required int[] Cells { get; init; }
    /// <summary>Area of the cell inside the region, m².</summary>
    public required double[] AreaInside { get; init; }
    /// <summary>Fraction of the cell inside the region (AreaInside ÷ cell area).</summary>
    public required double[] Fraction { get; init; }
    public required double[] RegionArea { get; init; }
    public required double EarthRadius { get; init; }

    public int Count => Names.Length;
    public int EntryCount => Cells.Length;

    public ReadOnlySpan<int> CellsOf(int region) => Cells.AsSpan(RowStart[region], RowStart[region + 1] - RowStart[region]);
    public ReadOnlySpan<double> AreasOf(int region) => AreaInside.AsSpan(RowStart[region], RowStart[region + 1] - RowStart[region]);
}
