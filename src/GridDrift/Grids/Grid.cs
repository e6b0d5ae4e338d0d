namespace GridDrift.Grids;

/// <summary>
/// A horizontal grid: cell centres, exact cell areas on the sphere, and how cells map to the
/// positions of a frame. Rectilinear grids keep their cell edges (in file order: a descending
/// latitude axis stays descending, 0..360 longitudes stay 0..360) so regions can cut cells
/// exactly; curvilinear and geostationary grids keep each cell's four corners.
/// </summary>
public sealed class Grid
{
    public required GridKind Kind { get; init; }
    /// <summary>Cells along the grid's y (latitude) and x (longitude) axes.</summary>
    public required int Rows { get; init; }
    public required int Columns { get; init; }
    public required double EarthRadius { get; init; }
    // per-cell arrays are 330 MB at 3712 × 3712: a rectilinear grid builds them from its axes only when asked
    Lazy<double[]> _centerLat = null!, _centerLon = null!, _cellArea = null!;

    /// <summary>Per cell (row-major over rows, columns): centre latitude and longitude in degrees.</summary>
    public double[] CenterLat { get => _centerLat.Value; init => _centerLat = new(value); }
    public double[] CenterLon { get => _centerLon.Value; init => _centerLon = new(value); }
    /// <summary>Per cell: area in m²; 0 for cells that do not exist (off the Earth's disk).</summary>
    public double[] CellArea { get => _cellArea.Value; init => _cellArea = new(value); }

    /// <summary>The per-cell arrays made on first use (rectilinear grids).</summary>
    internal Func<double[]> CenterLatOnDemand { init => _centerLat = new(value); }
    internal Func<double[]> CenterLonOnDemand { init => _centerLon = new(value); }
    internal Func<double[]> CellAreaOnDemand { init => _cellArea = new(value); }

    /// <summary>Rectilinear grids: the 1-D latitude (per row) and longitude (per column) axes, in file order.</summary>
    public double[]? RowLatitudes { get; init; }
    public double[]? ColumnLongitudes { get; init; }
    /// <summary>Rectilinear grids: the Rows + 1 latitude edges and Columns + 1 longitude edges, in file order.</summary>
    public double[]? LatEdges { get; init; }
    public double[]? LonEdges { get; init; }
    /// <summary>Curvilinear and geostationary grids: four corners per cell (latitude, longitude), in order around the cell.</summary>
    public double[]? CornerLat { get; init; }
    public double[]? CornerLon { get; init; }
    /// <summary>True when the frame stores x before y (dimensions ordered lon, lat).</summary>
    public bool ColumnsFirst { get; init; }

    public int CellCount => Rows * Columns;
    public bool IsRectilinear => LatEdges is not null;

    /// <summary>Position in a frame of the cell at (row, column).</summary>
    public int FrameIndex(int row, int column) => ColumnsFirst ? column * Rows + row : row * Columns + column;

    public double TotalArea => CellArea.Sum();
}
