using GridDrift.Conventions.Time;

namespace GridDrift.Frames;

/// <summary>Which frames a pair run compares: at a lag within one record, each against a fixed field, or two records at their shared times.</summary>
internal static class FramePairs
{
    /// <summary>Frame i − lag with frame i; a pair whose time gap is not lag × the record's step is left out and listed, unless <paramref name="acrossGaps"/>.</summary>
    public static List<FramePair> AtLag(FrameSource source, int lag, bool acrossGaps, out List<(CfTime Earlier, CfTime Later)> skipped)
    {
        skipped = [];
        var pairs = new List<FramePair>();
        var step = source.Step;
        for (int i = lag; i < source.FrameCount; i++)
        {
            var a = source.Times[i - lag];
            var b = source.Times[i];
            bool regular = step is { } s && Math.Abs(s.StepsBetween(a, b) - lag) < 1e-9;
            if (regular || acrossGaps) pairs.Add(new FramePair(i - lag, i));
            else skipped.Add((a, b));
        }
        return pairs;
    }

    /// <summary>Every frame against the fixed field (earlier index −1).</summary>
    public static List<FramePair> AgainstFixed(int frames) => Enumerable.Range(0, frames).Select(i => new FramePair(-1, i)).ToList();

    /// <summary>The reference's frame with the candidate's at every time both hold (Earlier indexes the reference, Later the candidate).</summary>
    public static List<FramePair> AtSharedTimes(FrameSource reference, FrameSource candidate)
    {
        var byTime = new Dictionary<long, int>();
        for (int i = 0; i < reference.FrameCount; i++) byTime[reference.Times[i].Micros] = i;
        var pairs = new List<FramePair>();
        for (int i = 0; i < candidate.FrameCount; i++)
            if (byTime.TryGetValue(candidate.Times[i].Micros, out int r)) pairs.Add(new FramePair(r, i));
        return pairs;
    }
}
