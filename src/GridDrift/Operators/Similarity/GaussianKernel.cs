namespace GridDrift.Operators.Similarity;

/// <summary>
/// A normalised 1-D Gaussian, exp(−x²/2σ²) at integer offsets −r … r, with r = ⌊truncate·σ + ½⌋
/// as scipy.ndimage.gaussian_filter1d chooses it: σ = 1.5 and truncate = 3.5 give the 11 taps
/// of Wang et al. (2004). MATLAB's fspecial('gaussian', N, σ) is the outer product of the same
/// kernel with r = (N − 1)/2.
/// </summary>
internal static class GaussianKernel
{
    public static double[] Truncated(double sigma, double truncate = 3.5) => WithRadius(sigma, (int)(truncate * sigma + 0.5));

    public static double[] WithRadius(double sigma, int radius)
    {
        var w = new double[2 * radius + 1];
        double sum = 0;
        for (int i = -radius; i <= radius; i++) sum += w[i + radius] = Math.Exp(-0.5 * i * i / (sigma * sigma));
        for (int i = 0; i < w.Length; i++) w[i] /= sum;
        return w;
    }
}
