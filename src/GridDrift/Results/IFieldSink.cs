using GridDrift.Conventions.Time;

namespace GridDrift.Results;

/// <summary>Where whole fields go as they are computed, in time order (NaN where missing).</summary>
internal interface IFieldSink
{
    void Write(CfTime time, ReadOnlySpan<float> field);
}
