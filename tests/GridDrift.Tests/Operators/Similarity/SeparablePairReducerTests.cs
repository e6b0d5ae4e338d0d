using CsCheck;
using GridDrift.Grids;
using GridDrift.Regions;
using GridDrift.Tests.Support;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;

namespace GridDrift.Tests.Operators.Similarity;

/// <summary>
/// The box fast path of the pair statistics gives what the per-region pass gives (the latter is
/// checked against numpy in SimilarityReferenceTests): random 3° and 2° global grids, ascending
/// or descending latitudes, 0..360 or -180..180 longitudes, missing cells, and global, bands,
/// tiles and boxes, one crossing the date line.
/// </summary>
public class SeparablePairReducerTests
{
    [Fact]
    public void Box_fast_path_equals_the_per_region_pass() =>
        Gen.Select(Gen.Int[0, 3], Gen.Double[0, 0.4], Gen.Int[0, 1_000_000]).Sample((layout, missing, seed) =>
        {
            var grid = GlobalGrids.Of(layout);
            int rows = grid.Rows, columns = grid.Columns;
            var shapes = RegionSpecs.ParseInput(["global", "bands:30", "tiles:45x90", "box:pacific=-20,25,150,-120", "box:patch=10.5,33.3,-40.2,12.7"]);
            var mask = RegionMaskBuilder.Build(grid, shapes);
            var plan = SeparablePlan.TryBuild(grid, shapes)!;
            var random = new Random(seed);
            float[] Frame() => Enumerable.Range(0, rows * columns).Select(_ => random.NextDouble() < missing ? float.NaN : (float)(250 + 30 * random.NextDouble())).ToArray();
            var a = Frame();
            var b = Frame();
            var expected = new double[mask.Count * PairReducer.Stride];
            var actual = new double[expected.Length];
            PairReducer.Reduce(mask, a, b, expected);
            new SeparablePairReducer(plan).Reduce(a, b, mask.RegionArea, actual);
            for (int k = 0; k < expected.Length; k++)
            {
                if (double.IsNaN(expected[k]) != double.IsNaN(actual[k])) return false;
                if (!double.IsNaN(expected[k]) && Math.Abs(expected[k] - actual[k]) > 1e-9 * Math.Max(1, Math.Abs(expected[k]))) return false;
            }
            return true;
        }, iter: 40);
}
