using System.Globalization;
using GridDrift.Operators.Similarity;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Operators.Similarity;

/// <summary>
/// SSIM maps against scikit-image's structural_similarity (Debian python3-skimage 0.19; Wang et
/// al. 2004 with the Gaussian window, population covariances, fixed data range). VIF is checked
/// in VifFieldTests.
/// </summary>
public class SimilarityReferenceTests
{
    static (float[] A, float[] B) Fields(int rows, int columns, int seed, double noise) =>
        FieldPairs.Make(rows, columns, seed, (j, i) => 250 + 15 * Math.Sin(i / 6.0) * Math.Cos(j / 9.0) + 5 * Math.Sin((i + j) / 3.0),
            (j, i) => 3 * Math.Sin(i / 4.0 + 1), 2, noise);

    [InteropTheory(Needs.PythonScipy)]
    [InlineData(40, 64, 1.0)]
    [InlineData(73, 51, 6.0)]
    public void The_SSIM_map_equals_scikit_image_cell_by_cell(int rows, int columns, double noise)
    {
        var (a, b) = Fields(rows, columns, rows * columns, noise);
        using var dir = new TempFolder();
        string out_ = dir.File("map.bin");
        ExternalTools.RunPython("ssim_reference.py", FieldPairs.Bin(dir, "a.bin", a.Select(v => (double)v)), FieldPairs.Bin(dir, "b.bin", b.Select(v => (double)v)),
            rows.ToString(), columns.ToString(), "140", out_);
        var expected = File.ReadAllBytes(out_).Chunk(8).Select(c => BitConverter.ToDouble(c)).ToArray();
        var map = new float[rows * columns];
        new Ssim(rows, columns, periodicX: false, 180, 320).Map(a, b, map);
        for (int i = 0; i < map.Length; i++) Assert.True(Math.Abs(map[i] - expected[i]) <= 1e-5, $"cell {i}: {map[i]} vs {expected[i]}");
    }

    [InteropTheory(Needs.PythonScipy)]
    [InlineData(40, 64, false, 0.02)]
    [InlineData(57, 83, true, 0.1)]
    public void With_missing_cells_the_SSIM_map_equals_normalised_convolution_cell_by_cell(int rows, int columns, bool periodic, double missing)
    {
        // witness: ssim_masked_reference.py, a float64 numpy/scipy re-implementation of the
        // documented form (normalised convolution, Knutsson & Westin 1993), wrapping in x where periodic
        var (a, b) = Fields(rows, columns, rows + columns, 2.0);
        var rng = new Random(rows);
        for (int k = 0; k < a.Length; k++)
        {
            if (rng.NextDouble() < missing) a[k] = float.NaN;
            if (rng.NextDouble() < missing) b[k] = float.NaN;
        }
        for (int i = 0; i < columns; i++) a[3 * columns + i] = float.NaN; // a whole missing row: some windows fall below half weight
        using var dir = new TempFolder();
        string out_ = dir.File("map.bin");
        ExternalTools.RunPython("ssim_masked_reference.py", FieldPairs.Bin(dir, "a.bin", a.Select(v => (double)v)), FieldPairs.Bin(dir, "b.bin", b.Select(v => (double)v)),
            rows.ToString(), columns.ToString(), "140", periodic ? "wrap" : "reflect", out_);
        var expected = File.ReadAllBytes(out_).Chunk(8).Select(c => BitConverter.ToDouble(c)).ToArray();
        var map = new float[rows * columns];
        new Ssim(rows, columns, periodic, 180, 320).Map(a, b, map);
        Assert.Contains(expected, double.IsNaN);
        for (int i = 0; i < map.Length; i++)
        {
            Assert.True(double.IsNaN(expected[i]) == float.IsNaN(map[i]), $"cell {i}: missing in one map only ({map[i]} vs {expected[i]})");
            if (!double.IsNaN(expected[i])) Assert.True(Math.Abs(map[i] - expected[i]) <= 1e-5, $"cell {i}: {map[i]} vs {expected[i]}");
        }
    }

    [Fact]
    public void Identical_frames_have_an_SSIM_of_exactly_one()
    {
        // Wang et al. 2004 eq. 13: SSIM(x, x) = 1
        var (a, _) = Fields(48, 60, 3, 1);
        a[100] = float.NaN;
        var map = new float[a.Length];
        new Ssim(48, 60, periodicX: true, 180, 320).Map(a, a, map);
        Assert.All(map.Where(v => !float.IsNaN(v)), v => Assert.Equal(1f, v));
    }
}
