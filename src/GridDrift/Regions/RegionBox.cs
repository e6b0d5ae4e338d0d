using GridDrift.Grids;

namespace GridDrift.Regions;

/// <summary>
/// The bounding index box of each region's cells (rows and columns of the grid), on which VIF is
/// computed: VIF's reference algorithm filters planar images with 'valid' windows, so it needs
/// a rectangle of cells, not the region's exact area. A region across the longitude seam of the
/// grid's columns gets a box spanning every column between its cells.
/// </summary>
internal sealed record RegionBox(int FirstRow, int Rows, int FirstColumn, int Columns)
{
    public static RegionBox[] Of(Grid grid, RegionMask mask)
    {
        var boxes = new RegionBox[mask.Count];
        for (int r = 0; r < mask.Count; r++)
        {
            int r0 = int.MaxValue, r1 = -1, c0 = int.MaxValue, c1 = -1;
            foreach (int cell in mask.CellsOf(r))
            {
                int row = grid.ColumnsFirst ? cell % grid.Rows : cell / grid.Columns;
                int column = grid.ColumnsFirst ? cell / grid.Rows : cell % grid.Columns;
                r0 = Math.Min(r0, row); r1 = Math.Max(r1, row);
                c0 = Math.Min(c0, column); c1 = Math.Max(c1, column);
            }
            boxes[r] = r1 < 0 ? new RegionBox(0, 0, 0, 0) : new RegionBox(r0, r1 - r0 + 1, c0, c1 - c0 + 1);
        }
        return boxes;
    }
}
