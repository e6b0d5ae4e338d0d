using GridDrift.Conventions.Time;

namespace GridDrift.Frames;

/// <summary>
/// Which frames of a record to read: only those inside a time window (`--period`). The same
/// record for the command line and for recipes ([input] period).
/// </summary>
public sealed record FrameSelection(RecordWindow? Period = null)
{
    public static readonly FrameSelection All = new();

    /// <summary>From the text of `--period` (null for the whole record); a malformed window is a FormatException.</summary>
    public static FrameSelection Of(string? period) => new(period is null ? null : RecordWindow.Parse(period));
}
