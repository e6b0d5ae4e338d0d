using System.Globalization;
using GridDrift.Operators.Similarity;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Operators.Similarity;

/// <summary>
/// SSIM maps against scikit-image's structural_similarity (Debian python3-skimage 0.19; Wang et
/// al. 2004 with the Gaussian window, population covariances, fixed data range) and VIF against
/// a numpy/scipy re-implementation of the authors' published algorithm kept beside this test.
/// </summary>
public class SimilarityReferenceTests
{
    static (float[] A, float[] B) Fields(int rows, int columns, int seed, double noise)
    {
        var rng = new Random(seed);
        var a = new float[rows * columns];
        var b = new float[rows * columns];
        for (int j = 0; j < rows; j++)
            for (int i = 0; i < columns; i++)
            {
                double smooth = 250 + 15 * Math.Sin(i / 6.0) * Math.Cos(j / 9.0) + 5 * Math.Sin((i + j) / 3.0);
                a[j * columns + i] = (float)(smooth + 2 * (rng.NextDouble() - 0.5));
                b[j * columns + i] = (float)(smooth + 3 * Math.Sin(i / 4.0 + 1) + noise * (rng.NextDouble() - 0.5));
            }
        return (a, b);
    }

    static string Bin(TempFolder dir, string name, IEnumerable<double> values)
    {
        string path = dir.File(name);
        File.WriteAllBytes(path, values.SelectMany(BitConverter.GetBytes).ToArray());
        return path;
    }

    [InteropTheory(Needs.PythonScipy)]
    [InlineData(40, 64, 1.0)]
    [InlineData(73, 51, 6.0)]
    public void The_SSIM_map_equals_scikit_image_cell_by_cell(int rows, int columns, double noise)
    {
        var (a, b) = Fields(rows, columns, rows * columns, noise);
        using var dir = new TempFolder();
        string out_ = dir.File("map.bin");
        ExternalTools.RunPython("ssim_reference.py", Bin(dir, "a.bin", a.Select(v => (double)v)), Bin(dir, "b.bin", b.Select(v => (double)v)),
            rows.ToString(), columns.ToString(), "140", out_);
        var expected = File.ReadAllBytes(out_).Chunk(8).Select(c => BitConverter.ToDouble(c)).ToArray();
        var map = new float[rows * columns];
        new Ssim(rows, columns, periodicX: false, 180, 320).Map(a, b, map);
        for (int i = 0; i < map.Length; i++) Assert.True(Math.Abs(map[i] - expected[i]) <= 1e-5, $"cell {i}: {map[i]} vs {expected[i]}");
    }

    [Fact]
    public void Identical_frames_have_an_SSIM_of_exactly_one_and_a_VIF_of_one()
    {
        // Wang et al. 2004 eq. 13: SSIM(x, x) = 1. Sheikh & Bovik 2006: VIF(x, x) = 1 (numerator and denominator agree).
        var (a, _) = Fields(48, 60, 3, 1);
        a[100] = float.NaN;
        var map = new float[a.Length];
        new Ssim(48, 60, periodicX: true, 180, 320).Map(a, a, map);
        Assert.All(map.Where(v => !float.IsNaN(v)), v => Assert.Equal(1f, v));
        var scaled = a.Select(v => float.IsNaN(v) ? 127.0 : 255 * (v - 180.0) / 140).ToArray();
        Assert.Equal(1, new Vif().Compute(scaled, scaled, 48, 60), 9);
    }

    [InteropFact(Needs.PythonScipy)]
    public void VIF_equals_the_re_implementation_of_the_published_algorithm()
    {
        var (a, b) = Fields(64, 80, 11, 4);
        var ra = a.Select(v => 255 * (v - 180.0) / 140).ToArray();
        var rb = b.Select(v => 255 * (v - 180.0) / 140).ToArray();
        using var dir = new TempFolder();
        double expected = double.Parse(ExternalTools.RunPython("vif_reference.py", Bin(dir, "a.bin", ra), Bin(dir, "b.bin", rb), "64", "80").Trim(), CultureInfo.InvariantCulture);
        Assert.Equal(expected, new Vif().Compute(ra, rb, 64, 80), 9);
    }

    [Fact]
    public void VIF_decreases_as_noise_grows()
    {
        // Sheikh & Bovik 2006 §IV: VIF falls monotonically with additive noise.
        var rng = new Random(5);
        var clean = Fields(64, 64, 2, 0).A.Select(v => 255 * (v - 180.0) / 140).ToArray();
        double previous = 1.0 + 1e-12;
        foreach (double sigma in new[] { 1.0, 3.0, 10.0, 30.0 })
        {
            var noisy = clean.Select(v => v + sigma * Gaussian(rng)).ToArray();
            double vif = new Vif().Compute(clean, noisy, 64, 64);
            Assert.True(vif < previous, $"VIF {vif} at noise {sigma} did not fall below {previous}");
            previous = vif;
        }
    }

    static double Gaussian(Random rng) => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
}
