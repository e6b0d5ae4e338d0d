using GridDrift.Conventions.Time;
using GridDrift.Results;

namespace GridDrift.Operators.Resampling;

/// <summary>
/// Turns a stream of fields and their covered fractions into means over periods
/// (<see cref="PeriodMeans"/>), each handed on with the period's bounds and stamped with its middle.
/// </summary>
internal sealed class PeriodMeanSink : ICoveredFieldSink
{
    readonly PeriodMeans _fields, _fractions;
    readonly ICoveredFieldSink _next;
    float[] _fieldMean = [];

    public PeriodMeanSink(Resampling kind, int hours, int cells, ICoveredFieldSink next)
    {
        _next = next;
        // both flush together (a frame of a later period, or the end): the field's mean is kept until the fraction's arrives
        _fields = new PeriodMeans(kind, cells, (_, _, _, mean) => _fieldMean = mean, hours);
        _fractions = new PeriodMeans(kind, cells, (mid, from, to, fraction) => _next.Write(mid, _fieldMean, fraction, (from, to)), hours);
    }

    public CfTime PeriodStart(CfTime t) => _fields.PeriodStart(t);

    public void Write(CfTime time, ReadOnlySpan<float> field, ReadOnlySpan<float> coveredFraction, (CfTime From, CfTime To)? bounds = null)
    {
        _fields.Add(time, field);
        _fractions.Add(time, coveredFraction);
    }

    /// <summary>Hands on the last period's mean.</summary>
    public void Flush()
    {
        _fields.Flush();
        _fractions.Flush();
    }
}
