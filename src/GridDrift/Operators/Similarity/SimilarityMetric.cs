using GridDrift.Results;

namespace GridDrift.Operators.Similarity;

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

    /// <summary>The series quantity a metric becomes: its variable name, long name, units and CF cell_methods.</summary>
    public static SeriesQuantity Quantity(this SimilarityMetric m, string variable, string units) => m switch
    {
        SimilarityMetric.Ssim => new("ssim", $"area-weighted mean structural similarity of {variable} between the paired frames", "1", "area: mean"),
        SimilarityMetric.Vif => new("vif", $"visual information fidelity of {variable} (later frame against earlier), region sums of the frame's VIF terms", "1", ""),
        SimilarityMetric.Corr => new("corr", $"area-weighted Pearson correlation of {variable} between the paired frames", "1", ""),
        SimilarityMetric.Rmsd => new("rmsd", $"area-weighted root-mean-square difference of {variable} between the paired frames", units, ""),
        SimilarityMetric.Bias => new("bias", $"area-weighted mean difference of {variable}, later (candidate) minus earlier (reference)", units, "area: mean"),
        _ => new("mean_abs_change", $"area-weighted mean absolute change of {variable} between the paired frames", units, "area: mean"),
    };
}
