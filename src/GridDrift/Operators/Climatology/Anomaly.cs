namespace GridDrift.Operators.Climatology;

/// <summary>Departures of a field from its climatology.</summary>
internal enum AnomalyKind
{
    /// <summary>x − mean, in the variable's units.</summary>
    Absolute,
    /// <summary>100 (x − mean) / mean, in percent.</summary>
    Relative,
    /// <summary>(x − mean) / standard deviation, dimensionless.</summary>
    Standardized,
}

internal static class Anomaly
{
    /// <summary>A climatological mean this close to zero gives no relative anomaly.</summary>
    public const double RelativeGuard = 1e-12;
    /// <summary>A standard deviation at or below this fraction of |mean| (or 1e-12 absolute) gives no standardized anomaly.</summary>
    public const double StandardizedGuard = 1e-6;

    public static string Name(this AnomalyKind k) => k switch
    {
        AnomalyKind.Absolute => "absolute",
        AnomalyKind.Relative => "relative",
        _ => "standardized",
    };

    public static AnomalyKind? Parse(string text) => text.Trim().ToLowerInvariant() switch
    {
        "absolute" => AnomalyKind.Absolute,
        "relative" => AnomalyKind.Relative,
        "standardized" or "standardised" => AnomalyKind.Standardized,
        _ => null,
    };

    /// <summary>
    /// Writes the anomaly of <paramref name="values"/> against one slot's mean and standard deviation.
    /// Missing values, missing climatology and guarded cells give NaN. Subtraction is in float64.
    /// </summary>
    public static void Compute(AnomalyKind kind, ReadOnlySpan<float> values, ReadOnlySpan<float> mean, ReadOnlySpan<float> std, Span<float> result)
    {
        switch (kind)
        {
            case AnomalyKind.Absolute:
                for (int i = 0; i < values.Length; i++) result[i] = (float)((double)values[i] - mean[i]);
                break;
            case AnomalyKind.Relative:
                for (int i = 0; i < values.Length; i++)
                {
                    double m = mean[i];
                    result[i] = Math.Abs(m) > RelativeGuard ? (float)(100 * (values[i] - m) / m) : float.NaN;
                }
                break;
            default:
                for (int i = 0; i < values.Length; i++)
                {
                    double m = mean[i], s = std[i];
                    result[i] = s > Math.Max(1e-12, StandardizedGuard * Math.Abs(m)) ? (float)((values[i] - m) / s) : float.NaN;
                }
                break;
        }
    }
}
