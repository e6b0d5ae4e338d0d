namespace GridDrift.Analysis;

/// <summary>The names of detectors and change-point methods, as options, recipes and tables spell them.</summary>
internal static class MethodNames
{
    public static Detector ParseDetector(string text) => text.Trim() switch
    {
        "robust-z" => Detector.RobustZ,
        "hampel" => Detector.Hampel,
        "iqr" => Detector.Iqr,
        "seasonal-residual" => Detector.SeasonalResidual,
        "gesd" => Detector.Gesd,
        var other => throw new FormatException($"unknown detector '{other}' (choose robust-z, hampel, iqr, seasonal-residual or gesd)"),
    };

    /// <summary>Change-point methods by name; `pelt` stands for both PELT costs.</summary>
    public static ChangeMethod[] ParseChangeMethods(string text) => text.Trim() switch
    {
        "pettitt" => [ChangeMethod.Pettitt],
        "pelt" => [ChangeMethod.PeltMean, ChangeMethod.PeltMeanVariance],
        "pelt-mean" => [ChangeMethod.PeltMean],
        "pelt-mean-variance" => [ChangeMethod.PeltMeanVariance],
        "event-rate" => [ChangeMethod.EventRate],
        var other => throw new FormatException($"unknown change-point method '{other}' (choose pettitt, pelt, pelt-mean, pelt-mean-variance or event-rate)"),
    };

    public static string Name(Detector d) => d switch
    {
        Detector.RobustZ => "robust-z",
        Detector.Hampel => "hampel",
        Detector.Iqr => "iqr",
        Detector.SeasonalResidual => "seasonal-residual",
        _ => "gesd",
    };

    public static string Name(ChangeMethod m) => m switch
    {
        ChangeMethod.Pettitt => "pettitt",
        ChangeMethod.PeltMean => "pelt-mean",
        ChangeMethod.PeltMeanVariance => "pelt-mean-variance",
        _ => "event-rate",
    };
}
