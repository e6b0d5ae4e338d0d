namespace GridDrift.Workflows.Options;

/// <summary>The names of products, defined once: a recipe's defaults and the tables written beside a step's main product.</summary>
internal static class ProductNames
{
    public const string Stats = "stats.nc";
    public const string Similarity = "similarity.nc";
    public const string Climatology = "climatology.nc";
    public const string Anomalies = "anomalies.nc";
    public const string Events = "events.parquet";
    public const string Attribution = "attribute.parquet";
    public const string Report = "report";

    public const string Counts = "_counts.parquet";
    public const string Trends = "_trends.parquet";
    public const string ChangePoints = "_changepoints.parquet";
    public const string Shapley = "_shapley.parquet";
    public const string Ranks = "_ranks.parquet";
    public const string ImportanceChange = "_change.parquet";
    public const string Profiles = "_profiles.parquet";
    public const string Fields = "_fields.nc";
    public const string Series = "_series.nc";

    /// <summary>The product named <paramref name="suffix"/> beside <paramref name="product"/>: its folder, its name without extension, then the suffix.</summary>
    public static string Beside(string product, string suffix) =>
        Path.Combine(Path.GetDirectoryName(Path.GetFullPath(product))!, Path.GetFileNameWithoutExtension(product) + suffix);
}
