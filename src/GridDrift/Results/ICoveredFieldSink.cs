using GridDrift.Conventions.Time;

namespace GridDrift.Results;

/// <summary>
/// Where remapped fields go, in time order, each with the fraction of every cell that valid
/// source data covered, and — for means over periods — the period's bounds.
/// </summary>
internal interface ICoveredFieldSink
{
    void Write(CfTime time, ReadOnlySpan<float> field, ReadOnlySpan<float> coveredFraction, (CfTime From, CfTime To)? bounds = null);
}
