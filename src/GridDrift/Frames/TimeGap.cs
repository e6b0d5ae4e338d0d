using GridDrift.Conventions.Time;

namespace GridDrift.Frames;

/// <summary>A gap in a record: consecutive frames further apart than the record's step.</summary>
public sealed record TimeGap(int IndexBefore, CfTime Before, CfTime After, double MissingSteps)
{
    /// <summary>Every place where consecutive times are more than one step apart.</summary>
    internal static List<TimeGap> Find(IReadOnlyList<CfTime> times, TimeStep? step)
    {
        var gaps = new List<TimeGap>();
        if (step is not { } s) return gaps;
        for (int i = 1; i < times.Count; i++)
        {
            double steps = s.StepsBetween(times[i - 1], times[i]);
            if (steps > 1.0 + 1e-9) gaps.Add(new TimeGap(i - 1, times[i - 1], times[i], steps - 1));
        }
        return gaps;
    }

    public override string ToString() =>
        $"gap between {Before.ToIsoString()} and {After.ToIsoString()} ({MissingSteps:0.##} step(s) missing)";
}
