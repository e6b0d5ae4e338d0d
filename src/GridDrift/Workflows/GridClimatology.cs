using GridDrift.Operators.Climatology;
using GridDrift.Conventions.Time;

namespace GridDrift;

/// <summary>
/// A climatology in memory: per slot (calendar month, day of the year, or hour of each month) and
/// cell, the mean, the population standard deviation and the number of valid samples, from
/// float64 running moments (Welford 1962). Holds the moments until disposed.
/// </summary>
public sealed class GridClimatology : IDisposable
{
    readonly MomentState _state;

    internal GridClimatology(SlotScheme scheme, MomentState state, TimePeriod basePeriod, int frames)
    {
        Scheme = scheme;
        _state = state;
        BasePeriod = basePeriod;
        FramesUsed = frames;
    }

    internal SlotScheme Scheme { get; }
    public ClimatologyKind Kind => Scheme.Kind;
    public TimePeriod BasePeriod { get; }
    public int FramesUsed { get; }
    public int Slots => Scheme.SlotCount;
    public int Cells => _state.Cells;

    /// <summary>The slot a time falls in (−1 for a time of day the climatology does not hold).</summary>
    public int SlotOf(CfTime time) => Scheme.SlotOf(time);

    /// <summary>Mean, standard deviation and count of one slot, NaN where the slot has no sample.</summary>
    public (float[] Mean, float[] Std, float[] Count) Slot(int slot)
    {
        if ((uint)slot >= (uint)Slots) throw new ArgumentOutOfRangeException(nameof(slot), $"slots run from 0 to {Slots - 1}");
        var mean = new float[Cells];
        var std = new float[Cells];
        var count = new float[Cells];
        _state.Fill(slot, mean, std, count);
        return (mean, std, count);
    }

    public void Dispose() => _state.Dispose();
}
