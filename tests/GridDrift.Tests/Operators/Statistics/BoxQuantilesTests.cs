using CsCheck;
using GridDrift.Grids;
using GridDrift.Regions;
using GridDrift.Tests.Support;
using GridDrift.Operators.Statistics;

namespace GridDrift.Tests.Operators.Statistics;

/// <summary>
/// The box path of the region statistics (quantiles read off the frame through the separable
/// plan, never copying a region's cells) gives what the per-region mask pass gives; the mask pass
/// is checked against numpy in StatsInteropTests. Random 3° and 2° global grids, ascending or
/// descending latitudes, 0..360 or -180..180 longitudes, missing cells, values with many ties,
/// and global, bands, tiles and boxes, one crossing the date line.
/// </summary>
public class BoxQuantilesTests
{
    [Fact]
    public void Box_path_equals_the_per_region_pass_for_all_eight_statistics() =>
        Gen.Select(Gen.Int[0, 3], Gen.Double[0, 0.4], Gen.Int[0, 1_000_000], Gen.Bool).Sample((layout, missing, seed, ties) =>
        {
            var grid = GlobalGrids.Of(layout);
            int rows = grid.Rows, columns = grid.Columns;
            var shapes = RegionSpecs.ParseInput(["global", "bands:30", "tiles:45x90", "box:pacific=-20,25,150,-120", "box:patch=10.5,33.3,-40.2,12.7"]);
            var regions = RegionSet.Build(grid, shapes);
            Assert.NotNull(regions.Separable);
            var random = new Random(seed);
            var frame = Enumerable.Range(0, rows * columns).Select(_ => random.NextDouble() < missing ? float.NaN
                : ties ? (float)Math.Round(250 + 30 * random.NextDouble()) : (float)(250 + 30 * random.NextDouble())).ToArray();
            var expected = new double[regions.Count * RegionStatistics.All.Length];
            var actual = new double[expected.Length];
            new RegionReducer(RegionMaskBuilder.Build(grid, shapes), RegionStatistics.All).Reduce(frame, expected);
            new RegionReducer(regions, RegionStatistics.All).Reduce(frame, actual);
            for (int k = 0; k < expected.Length; k++)
            {
                if (double.IsNaN(expected[k]) != double.IsNaN(actual[k])) return false;
                if (!double.IsNaN(expected[k]) && Math.Abs(expected[k] - actual[k]) > 1e-9 * Math.Max(1, Math.Abs(expected[k]))) return false;
            }
            return true;
        }, iter: 40);

    [Fact]
    public void Region_areas_from_the_plan_equal_the_mask_s()
    {
        var grid = RectilinearGrid.Build(Enumerable.Range(0, 60).Select(j => 88.5 - 3 * j).ToArray(), Enumerable.Range(0, 120).Select(i => 1.5 + 3 * i).ToArray());
        var shapes = RegionSpecs.ParseInput(["global", "bands:30", "tiles:45x90", "box:pacific=-20,25,150,-120"]);
        var mask = RegionMaskBuilder.Build(grid, shapes);
        var areas = RegionSet.Build(grid, shapes).Areas;
        for (int r = 0; r < mask.Count; r++) Assert.Equal(mask.RegionArea[r], areas[r], mask.RegionArea[r] * 1e-12);
        // common practice: the whole sphere is 4πR²
        Assert.Equal(4 * Math.PI * grid.EarthRadius * grid.EarthRadius, areas[0], areas[0] * 1e-12);
    }
}
