using CsCheck;
using GridDrift.Operators.Similarity;

namespace GridDrift.Tests.Operators.Similarity;

/// <summary>
/// The shifted-register row filter against the definition of a 1-D correlation,
/// target[i] = Σ_k w_k · padded[i + k], summed in float64 (scipy.ndimage.correlate1d's form).
/// </summary>
public class ShiftedAlongTests
{
    [Fact]
    public void The_shifted_row_filter_equals_the_plain_correlation_for_every_radius_it_takes()
    {
        if (!System.Runtime.Intrinsics.X86.Avx512F.IsSupported)
        {
            Assert.False(ShiftedAlong.Handles(8)); // without AVX-512 the plain loops run instead, checked by the similarity tests
            return;
        }
        Gen.Select(Gen.Int[0, 4].Select(k => new[] { 1, 2, 4, 5, 8 }[k]), Gen.Int[1, 90], Gen.Int[0, 1_000_000]).Sample((radius, cells, seed) =>
        {
            var rng = new Random(seed);
            var kernel = Enumerable.Range(0, 2 * radius + 1).Select(k => (float)Math.Exp(-0.5 * (k - radius) * (k - radius) / (radius * radius))).ToArray();
            for (int k = 0; k < radius; k++) kernel[2 * radius - k] = kernel[k]; // symmetric, as the filters' Gaussians are
            var padded = Enumerable.Range(0, cells + 2 * radius + 16).Select(_ => (float)(rng.NextDouble() * 100 - 50)).ToArray();
            var target = new float[cells];
            int done = ShiftedAlong.Run(kernel, padded, target);
            if (done != cells / 16 * 16) return false;
            for (int i = 0; i < done; i++)
            {
                double expected = 0;
                for (int k = 0; k < kernel.Length; k++) expected += (double)kernel[k] * padded[i + k];
                if (Math.Abs(target[i] - expected) > 1e-4) return false;
            }
            return true;
        });
    }
}
