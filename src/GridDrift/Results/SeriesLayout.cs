using GridDrift.Conventions.Time;

namespace GridDrift.Results;

/// <summary>One quantity of a series product: its variable name, CF metadata and the statistic it holds.</summary>
public sealed record SeriesQuantity(string Name, string LongName, string Units, string CellMethods);

/// <summary>
/// The shape of a (time, region) series product: regions with their areas, the quantities, the
/// time axis of the input (units and calendar kept), and provenance.
/// </summary>
public sealed record SeriesLayout(
    string SourceVariable,
    IReadOnlyList<string> Regions,
    IReadOnlyList<double> RegionAreas,
    IReadOnlyList<SeriesQuantity> Quantities,
    TimeUnits TimeUnits,
    string CalendarAttribute,
    Provenance Provenance,
    IReadOnlyDictionary<string, string> Attributes,
    bool HasTimeBounds = false,
    IReadOnlyList<ScalarCoordinate>? Scalars = null);

/// <summary>Where series time steps go as they are computed, in time order.</summary>
public interface ISeriesSink : IDisposable
{
    /// <param name="values">quantity-major per region: values[region × quantities + quantity]</param>
    /// <param name="validFraction">per region</param>
    /// <param name="earlier">for pair metrics: the earlier frame's time (the step is stamped with the later one)</param>
    void Write(CfTime time, ReadOnlySpan<double> values, ReadOnlySpan<double> validFraction, CfTime? earlier = null);

    /// <summary>Finishes the product and moves it to its final name.</summary>
    void Complete();
}
