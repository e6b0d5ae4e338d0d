using GridDrift.Conventions.Time;

namespace GridDrift.Operators.Resampling;

/// <summary>How frames are grouped into means: each frame as it is, periods of whole hours from midnight, calendar days or months.</summary>
internal enum Resampling { None, Hours, Daily, Monthly }

/// <summary>
/// Means of consecutive frames over periods of hours, calendar days or months, streamed: the running sum and count
/// of the current period are kept per cell (NaN values left out) and the mean is handed on, with
/// the period's bounds, when a frame of a later period arrives or the record ends. The time of a
/// mean is the middle of its period (CF cell_methods "time: mean", time bounds = the period).
/// </summary>
internal sealed class PeriodMeans
{
    readonly Resampling _kind;
    readonly int _hours;
    readonly double[] _sum;
    readonly int[] _count;
    readonly float[] _mean;
    CfTime? _start;
    readonly Action<CfTime, CfTime, CfTime, float[]> _emit;

    public PeriodMeans(Resampling kind, int cells, Action<CfTime, CfTime, CfTime, float[]> emit, int hours = 0)
    {
        _kind = kind;
        _hours = hours;
        if (kind == Resampling.Hours && (hours <= 0 || 24 % hours != 0)) throw new ArgumentOutOfRangeException(nameof(hours), "hourly periods must divide the day (1, 2, 3, 4, 6, 8, 12 h)");
        _sum = new double[cells];
        _count = new int[cells];
        _mean = new float[cells];
        _emit = emit;
    }

    /// <summary>`daily`/`P1D`, `monthly`/`P1M`, or `PTnH` (n hours dividing the day, periods from midnight); the hours come back in <paramref name="hours"/>.</summary>
    public static Resampling Parse(string? text, out int hours)
    {
        hours = 0;
        switch (text)
        {
            case null or "none": return Resampling.None;
            case "daily" or "P1D": return Resampling.Daily;
            case "monthly" or "P1M": return Resampling.Monthly;
        }
        if (text.StartsWith("PT", StringComparison.Ordinal) && text.EndsWith('H') && int.TryParse(text[2..^1], out hours) && hours > 0 && 24 % hours == 0)
            return Resampling.Hours;
        throw new FormatException($"--resample {text}: choose daily, monthly or PTnH with n dividing 24 (e.g. PT3H)");
    }

    public CfTime PeriodStart(CfTime t) => _kind switch
    {
        Resampling.Hours => new CfTime(t.Calendar, t.DayNumber * CfTime.MicrosPerDay + t.MicrosOfDay / (_hours * 3600 * CfTime.MicrosPerSecond) * (_hours * 3600 * CfTime.MicrosPerSecond)),
        Resampling.Daily => new CfTime(t.Calendar, t.DayNumber * CfTime.MicrosPerDay),
        _ => CfTime.Of(t.Calendar, t.Year, t.Month, 1),
    };

    CfTime PeriodEnd(CfTime start) => _kind switch
    {
        Resampling.Hours => start.AddMicros(_hours * 3600 * CfTime.MicrosPerSecond),
        Resampling.Daily => start.AddMicros(CfTime.MicrosPerDay),
        _ => start.Month == 12 ? CfTime.Of(start.Calendar, start.Year + 1, 1, 1) : CfTime.Of(start.Calendar, start.Year, start.Month + 1, 1),
    };

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
