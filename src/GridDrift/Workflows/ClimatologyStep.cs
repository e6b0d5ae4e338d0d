using GridDrift.Outputs.Description;
using System.Globalization;
using GridDrift.Operators.Climatology;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Outputs;
using GridDrift.Outputs.Fields;
using GridDrift.Results;
using GridDrift.Products;

namespace GridDrift.Workflows;

internal sealed record ClimatologyOptions(
    IReadOnlyList<string> Inputs,
    string Variable,
    ClimatologyKind Kind,
    string Output,
    string? Base = null,
    string? Smooth = null,
    ClassicVariant? Format = null,
    string Command = "griddrift climatology",
    int Workers = 0,
    string? Units = null,
    FrameSlice? Slice = null,
    string? PartialOut = null,
    IReadOnlyList<string>? PartialIn = null,
    IReadOnlyDictionary<string, string>? Attributes = null)
{
    /// <summary>Which frames of the record to read (`--period`; [input] period).</summary>
    public FrameSelection Selection { get; init; } = FrameSelection.All;
}

internal sealed record ClimatologySummary(int FramesUsed, int Slots, int EmptySlots, TimePeriod Base, IReadOnlyList<string> Warnings);

/// <summary>
/// `griddrift climatology`: streams the frames of the base period once, adds each to the
/// running moments of its slot (in parallel over cells), then writes mean, standard deviation
/// and count per slot as a CF §7.4 climatology. Memory is the slot state (24 bytes per slot and
/// cell) plus the frames in flight, whatever the length of the record. A shard of a sharded run
/// accumulates only its slice and leaves the partial state (<see cref="ClimatologyOptions.PartialOut"/>);
/// gathering merges the shards' states (<see cref="ClimatologyOptions.PartialIn"/>) and writes
/// the climatology exactly as a one-machine run would.
/// </summary>
internal static class ClimatologyStep
{
    public const double NormalYears = 30;

    public static ClimatologySummary Run(ClimatologyOptions o, IProgress<(int Done, int Total)>? progress = null)
    {
        // the input checksums take a core-second per gigabyte: start them before the files are even
        // opened, so they run beside the frame loop (a shard's partial state needs only its own
        // files' checksums, and a gather takes them from the shards' states)
        bool wholeRecord = o.PartialOut is null && o.PartialIn is null;
        var hashing = wholeRecord ? ChecksumCache.Prefetch(o.Inputs) : Task.CompletedTask;
        using var source = FrameSource.Open(o.Inputs, o.Variable, o.Selection);
        if (o.Units is { } wantedUnits) source.ConvertUnits(wantedUnits);
        var warnings = new List<string>(source.Warnings);
        var calendar = source.Calendar;
        Smoothing? smoothing = null;
        if (o.Smooth is { } text)
        {
            try { smoothing = Smoothing.Parse(text); }
            catch (FormatException e) { throw new BadInputException(null, null, e.Message); }
            if (o.Kind != ClimatologyKind.DayOfYear) throw new BadInputException(null, null, $"--smooth applies to day-of-year climatologies, not to {o.Kind.Name()}");
        }
        var basePeriod = BasePeriods.Resolve(source, o.Base);
        var used = Enumerable.Range(0, source.FrameCount).Where(i => basePeriod.Contains(source.Times[i])).ToArray();
        if (used.Length == 0)
            throw new BadInputException(source.Files[0], o.Variable, $"no time step falls in the base period {basePeriod.ToIsoString()} (the record runs {source.Times[0]} … {source.Times[^1]})");
        var usedTimes = used.Select(i => source.Times[i]).ToArray();
        if (o.Kind == ClimatologyKind.HourByMonth && source.Step is not { IsCalendarMonths: false, Micros: > 0 and < CfTime.MicrosPerDay })
            throw new BadInputException(source.Files[0], o.Variable, $"hour-by-month needs sub-daily data; the record's step is {source.Step?.Describe() ?? "unknown"}");
        if (basePeriod.Years < NormalYears - 1e-9)
            warnings.Add($"the base period {basePeriod.ToIsoString()} covers {Counted.Of(basePeriod.Years, "0.##", "year")}, fewer than the {NormalYears:0} years of a " +
                "climatological standard normal (WMO-No. 1203, Guidelines on the Calculation of Climate Normals, 2017): treat it as a provisional baseline");
        var remembered = new Dictionary<string, string>();
        var provenance = wholeRecord ? Task.Run(() => Provenance.For(o.Command, source.Files)) : null;
        var scheme = SlotScheme.For(o.Kind, calendar, usedTimes);
        using var state = new MomentState(scheme.SlotCount, source.FrameLength);
        if (o.PartialIn is { } parts)
        {
            double frames = 0;
            foreach (var part in parts)
            {
                var attributes = PartialClimatologyFile.MergeInto(part, state, o.Kind.Name());
                var files = attributes.GetValueOrDefault("input_files", "").Split('\n', StringSplitOptions.RemoveEmptyEntries);
                var sums = attributes.GetValueOrDefault("input_sha256", "").Split('\n', StringSplitOptions.RemoveEmptyEntries);
                for (int i = 0; i < Math.Min(files.Length, sums.Length); i++) remembered[files[i]] = sums[i];
                if (attributes.GetValueOrDefault("climatology_base_period") != basePeriod.ToIsoString())
                    throw new BadInputException(part, null, $"was made for the base period {attributes.GetValueOrDefault("climatology_base_period")}, not {basePeriod.ToIsoString()}");
                frames += double.Parse(attributes.GetValueOrDefault("climatology_frames", "0"), CultureInfo.InvariantCulture);
            }
            if (frames != used.Length)
                throw new BadInputException(parts.Count > 0 ? parts[0] : null, null, $"the partial states hold {frames} frames; the base period of the record has {used.Length}: a shard is missing or repeated");
        }
        else
        {
            var own = o.Slice is { } slice ? used.Where(slice.Contains).ToArray() : used;
            // while the checksums run they hold a core: the frame loop takes the others, and all once they are done
            FrameEngine.RunBatches(source, own, new SlotAccumulator(scheme, state, source.Times), new EngineSettings(o.Workers, progress), hashing);
            if (o.PartialOut is { } partial)
            {
                PartialClimatologyFile.Write(partial, state, new Dictionary<string, string>
                {
                    ["climatology_kind"] = o.Kind.Name(),
                    ["climatology_base_period"] = basePeriod.ToIsoString(),
                    ["climatology_frames"] = own.Length.ToString(CultureInfo.InvariantCulture),
                    ["frames_of_record"] = o.Slice is { } s ? $"{s.First}..{s.End - 1} of {source.FrameCount}" : $"all {source.FrameCount}",
                    ["history"] = $"{DateTime.UtcNow:yyyy-MM-ddTHH:mm:ssZ} {o.Command}",
                    ["input_files"] = string.Join("\n", own.Length == 0 ? [] : source.FilesOf(own[0], own[^1] + 1)),
                    ["input_sha256"] = string.Join("\n", own.Length == 0 ? [] : source.FilesOf(own[0], own[^1] + 1).Select(ChecksumCache.Sha256)),
                });
                return new ClimatologySummary(own.Length, scheme.SlotCount, 0, basePeriod, warnings);
            }
        }

        var fields = ClimatologyFields.From(state, smoothing);
        var slots = SlotPeriods.From(scheme, usedTimes, basePeriod, source.Step);
        int empty = Enumerable.Range(0, scheme.SlotCount).Count(s => !HasData(state, s));
        if (empty > 0) warnings.Add($"{empty} of {Counted.Of(scheme.SlotCount, "slot")} have no sample in the base period: their values are missing");
        var template = FieldTemplate.From(source);
        var calendarAttribute = source.Template.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard";
        var extra = new Dictionary<string, string>
        {
            ["title"] = $"Climatology ({o.Kind.Name()}) of {o.Variable}",
            ["climatology_kind"] = o.Kind.Name(),
            ["climatology_base_period"] = basePeriod.ToIsoString(),
            ["climatology_base_years"] = basePeriod.Years.ToString("0.###", CultureInfo.InvariantCulture),
            ["climatology_frames"] = used.Length.ToString(CultureInfo.InvariantCulture),
            ["climatology_slots"] = SlotRule(scheme),
            ["climatology_times_of_day"] = string.Join(" ", scheme.TimesOfDay.Select(t => TimeSpan.FromTicks(t * 10).ToString(@"hh\:mm\:ss", CultureInfo.InvariantCulture))),
            ["climatology_smoothing"] = smoothing?.Describe() ?? "none",
            ["climatology_statistics"] = "per slot and cell: mean, population standard deviation (divisor n) and number of valid samples, " +
                "accumulated in float64 by Welford's update (Welford 1962), mergeable by Chan, Golub & LeVeque (1983)",
        };
        foreach (var (k, v) in o.Attributes ?? new Dictionary<string, string>()) extra[k] = v;
        var made = provenance?.GetAwaiter().GetResult()
            ?? new Provenance(o.Command, source.Files, source.Files.Select(f => remembered.TryGetValue(f, out var sum) ? sum : ChecksumCache.Sha256(f)).ToList(), DateTime.UtcNow);
        var globals = made.AsKeyValues(extra);
        ClimatologyNetCdfWriter.Write(o.Output, template, o.Variable, scheme, fields, slots, source.TimeUnits, calendarAttribute, globals, o.Format);
        return new ClimatologySummary(used.Length, scheme.SlotCount, empty, basePeriod, warnings);
    }

    static bool HasData(MomentState state, int slot)
    {
        var counts = state.Count.Slice(slot * state.Cells, state.Cells);
        foreach (var c in counts) if (c > 0) return true;
        return false;
    }

    static string SlotRule(SlotScheme scheme) => scheme.Kind switch
    {
        ClimatologyKind.Month => "12 calendar months",
        ClimatologyKind.DayOfYear when scheme.SlotCount == 366 && scheme.Calendar is not CfCalendar.AllLeap =>
            "366 days keyed by month and day as in a leap year: 29 February has its own slot, filled by leap years only",
        ClimatologyKind.DayOfYear => $"{scheme.SlotCount} days of the {scheme.Calendar.CfName()} year",
        _ => $"12 months x {scheme.TimesOfDay.Count} times of day",
    };

}
