namespace GridDrift.Operators.Physics;

/// <summary>
/// Moisture quantities from their defining formulas. Saturation vapour pressure over water by
/// Bolton (1980, Mon. Wea. Rev. 108: 1046, eq. 10): e_s = 6.112 exp(17.67 T / (T + 243.5)) hPa with
/// T in °C, within 0.1 % of the Wexler values between −30 °C and 35 °C (Bolton's stated range).
/// Vapour pressure from specific humidity e = q p / (ε + (1 − ε) q) and back
/// q = ε e / (p − (1 − ε) e), ε = R_d / R_v = 0.622 (common practice).
/// </summary>
internal static class Moisture
{
    public const double Epsilon = 0.622;
    public const double StandardGravity = 9.80665; // m s-2, the CGPM's standard acceleration of gravity

    /// <summary>Saturation vapour pressure over liquid water, Pa, for a temperature in K (Bolton 1980).</summary>
    public static double SaturationVapourPressure(double kelvin)
    {
        double c = kelvin - 273.15;
        return 611.2 * Math.Exp(17.67 * c / (c + 243.5));
    }

    /// <summary>Vapour pressure (Pa) of air with specific humidity q (kg kg-1) at pressure p (Pa).</summary>
    public static double VapourPressure(double q, double p) => q * p / (Epsilon + (1 - Epsilon) * q);

    /// <summary>Relative humidity over water, %, from specific humidity (kg kg-1), temperature (K) and pressure (Pa).</summary>
    public static double RelativeHumidity(double q, double kelvin, double p) => 100 * VapourPressure(q, p) / SaturationVapourPressure(kelvin);

    /// <summary>Specific humidity (kg kg-1) from dew point (K) and pressure (Pa): the vapour pressure is saturation at the dew point.</summary>
    public static double SpecificHumidityFromDewPoint(double dewPointKelvin, double p)
    {
        double e = SaturationVapourPressure(dewPointKelvin);
        return Epsilon * e / (p - (1 - Epsilon) * e);
    }

    /// <summary>
    /// Total column water vapour (kg m-2) = (1/g) ∫ q dp, by the trapezoid rule over pressure levels
    /// (Pa, any order), from the lowest pressure level down to the surface pressure: levels below the
    /// surface are excluded, and the layer that the surface cuts ends at the surface with q
    /// interpolated linearly in pressure (held at the deepest level's value if the surface lies below
    /// all levels). Without a surface pressure the column ends at the deepest level. Missing (NaN)
    /// levels are skipped. Exact when q is linear in pressure.
    /// </summary>
    public static double ColumnWaterVapour(ReadOnlySpan<double> pressure, ReadOnlySpan<double> q, double surfacePressure = double.NaN)
    {
        var levels = new List<(double P, double Q)>();
        for (int i = 0; i < pressure.Length; i++) if (!double.IsNaN(q[i]) && !double.IsNaN(pressure[i])) levels.Add((pressure[i], q[i]));
        levels.Sort((a, b) => a.P.CompareTo(b.P));
        if (levels.Count == 0) return double.NaN;
        double bottom = double.IsNaN(surfacePressure) ? levels[^1].P : surfacePressure;
        double sum = 0;
        for (int k = 0; k + 1 < levels.Count; k++)
        {
            var (p0, q0) = levels[k];
            var (p1, q1) = levels[k + 1];
            if (p0 >= bottom) break;
            if (p1 > bottom)
            {
                double qb = q0 + (q1 - q0) * (bottom - p0) / (p1 - p0);
                sum += 0.5 * (q0 + qb) * (bottom - p0);
                return sum / StandardGravity;
            }
            sum += 0.5 * (q0 + q1) * (p1 - p0);
        }
        if (bottom > levels[^1].P) sum += levels[^1].Q * (bottom - levels[^1].P);
        return sum / StandardGravity;
    }
}
