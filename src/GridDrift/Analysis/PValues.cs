using MathNet.Numerics;

namespace GridDrift.Analysis;

/// <summary>
/// Tail probabilities without cancellation, and how p-values print. 1 − Φ(z) loses every digit
/// beyond z ≈ 8 (it is 1 minus a number within 1e-16 of 1); erfc(z/√2) keeps them down to
/// ~1e-308 (z ≈ 37.5), and beyond that the natural log of the tail comes from its asymptotic series.
/// </summary>
internal static class PValues
{
    /// <summary>The smallest p-value that prints as a number; smaller ones print as "&lt; 1e-300".</summary>
    public const double Floor = 1e-300;

    /// <summary>Two-sided normal p-value, 2(1 − Φ(|z|)) = erfc(|z|/√2).</summary>
    public static double TwoSidedNormal(double z) => double.IsNaN(z) ? double.NaN : SpecialFunctions.Erfc(Math.Abs(z) / Math.Sqrt(2));

    /// <summary>
    /// log10 of the two-sided normal p-value, finite for every finite z: from erfc while it is
    /// representable, else ln erfc(x) ≈ −x² − ln(x√π) + ln(1 − 1/(2x²) + 3/(4x⁴)) (Abramowitz &amp; Stegun 7.1.23).
    /// </summary>
    public static double Log10TwoSidedNormal(double z)
    {
        double x = Math.Abs(z) / Math.Sqrt(2);
        double p = SpecialFunctions.Erfc(x);
        if (p > 1e-290) return Math.Log10(p);
        double ln = -x * x - Math.Log(x * Math.Sqrt(Math.PI)) + Math.Log(1 - 1 / (2 * x * x) + 3 / (4 * x * x * x * x));
        return ln / Math.Log(10);
    }

    /// <summary>A p-value as reports print it: three significant digits, "&lt; 1e-300" below <see cref="Floor"/>, never 0.</summary>
    public static string Format(double p) =>
        double.IsNaN(p) ? "–" : p < Floor ? "< 1e-300" : p >= 0.001 ? p.ToString("0.###", System.Globalization.CultureInfo.InvariantCulture)
            : p.ToString("0.##E+0", System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>A p-value as tables and JSON store it: at least <see cref="Floor"/> (the log10 column keeps the true size).</summary>
    public static double Stored(double p) => double.IsNaN(p) ? p : Math.Max(p, Floor);
}
