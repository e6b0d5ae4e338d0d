using GridDrift.Conventions.Time;

namespace GridDrift.Frames;

/// <summary>How frames are grouped into means: each frame as it is, or calendar days or months.</summary>
public enum Resampling { None, Daily, Monthly }

/// <summary>
/// Means of consecutive frames over calendar days or months, streamed: the running sum and count
/// of the current period are kept per cell (NaN values left out) and the mean is handed on, with
/// the period's bounds, when a frame of a later period arrives or the record ends. The time of a
/// mean is the middle of its period (CF cell_methods "time: mean", time bounds = the period).
/// </summary>
public sealed class PeriodMeans
{
    readonly Resampling _kind;
    readonly double[] _sum;
    readonly int[] _count;
    readonly float[] _mean;
    CfTime? _start;
    readonly Action<CfTime, CfTime, CfTime, float[]> _emit;

    public PeriodMeans(Resampling kind, int cells, Action<CfTime, CfTime, CfTime, float[]> emit)
    {
        _kind = kind;
        _sum = new double[cells];
        _count = new int[cells];
        _mean = new float[cells];
        _emit = emit;
    }

    public static Resampling Parse(string? text) => text switch
    {
        null or "none" => Resampling.None,
        "daily" or "P1D" => Resampling.Daily,
        "monthly" or "P1M" => Resampling.Monthly,
        _ => throw new FormatException($"--resample {text}: choose daily or monthly"),
    };

    public CfTime PeriodStart(CfTime t) => _kind == Resampling.Daily
        ? new CfTime(t.Calendar, t.DayNumber * CfTime.MicrosPerDay)
        : CfTime.Of(t.Calendar, t.Year, t.Month, 1);

    CfTime PeriodEnd(CfTime start) => _kind == Resampling.Daily
        ? start.AddMicros(CfTime.MicrosPerDay)
        : start.Month == 12 ? CfTime.Of(start.Calendar, start.Year + 1, 1, 1) : CfTime.Of(start.Calendar, start.Year, start.Month + 1, 1);

    public void Add(CfTime time, ReadOnlySpan<float> values)
    {
        var start = PeriodStart(time);
        if (_start is { } current && current != start) Flush();
        _start = start;
        for (int i = 0; i < values.Length; i++)
            if (!float.IsNaN(values[i])) { _sum[i] += values[i]; _count[i]++; }
    }

    public void Flush()
    {
        if (_start is not { } start) return;
        var end = PeriodEnd(start);
        for (int i = 0; i < _sum.Length; i++) _mean[i] = _count[i] > 0 ? (float)(_sum[i] / _count[i]) : float.NaN;
        _emit(start.AddMicros(end.MicrosSince(start) / 2), start, end, _mean);
        Array.Clear(_sum);
        Array.Clear(_count);
        _start = null;
    }
}
