namespace GridDrift;

/// <summary>
/// A CF scalar coordinate variable (CF §5.7) a product carries to say which slice of its input it
/// describes, e.g. <c>plev = 30000 Pa</c> for series made at 300 hPa: written as a variable without
/// dimensions and named in every data variable's <c>coordinates</c> attribute.
/// </summary>
public sealed record ScalarCoordinate(string Name, double Value, string? Units = null, string? StandardName = null, string? LongName = null,
    string? Axis = null, string? Positive = null);
