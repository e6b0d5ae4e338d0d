namespace GridDrift.Similarity;

/// <summary>The pair metrics of `griddrift similarity`.</summary>
public enum SimilarityMetric
{
    Ssim,
    Vif,
    Corr,
    Rmsd,
    MeanAbsChange,
    /// <summary>Area-weighted mean of later − earlier (candidate − reference in a comparison).</summary>
    Bias,
}

public static class SimilarityMetrics
{
    public static string Name(this SimilarityMetric m) => m switch
    {
        SimilarityMetric.Ssim => "ssim",
        SimilarityMetric.Vif => "vif",
        SimilarityMetric.Corr => "corr",
        SimilarityMetric.Rmsd => "rmsd",
        SimilarityMetric.Bias => "bias",
        _ => "mean_abs_change",
    };

    public static SimilarityMetric Parse(string text) => text.Trim().ToLowerInvariant() switch
    {
        "ssim" => SimilarityMetric.Ssim,
        "vif" => SimilarityMetric.Vif,
        "corr" => SimilarityMetric.Corr,
        "rmsd" => SimilarityMetric.Rmsd,
        "mean-abs-change" or "mean_abs_change" => SimilarityMetric.MeanAbsChange,
        "bias" => SimilarityMetric.Bias,
        _ => throw new FormatException($"unknown metric '{text}' (choose from ssim, vif, corr, rmsd, mean-abs-change, bias)"),
    };
}
