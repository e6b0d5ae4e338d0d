using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;

namespace GridDrift.Demo;

/// <summary>
/// The invented record of `griddrift demo`: a fictional water-vapour-channel brightness
/// temperature, global, regular latitude-longitude, with a moist-tropics/dry-subtropics mean
/// state, hemispheric annual cycles, a diurnal cycle, eastward-travelling waves and noise. On
/// <see cref="ShiftDate"/> a regime shift is injected in two regions: there the waves travel
/// <see cref="SpeedFactor"/> times faster and the noise is <see cref="NoiseFactor"/> times larger,
/// so consecutive frames become less alike. The shift fades out towards the sectors' edges
/// (<see cref="Strength"/>), so that windowed measures of the neighbouring sectors (SSIM's window
/// reaches five cells) do not see it: untouched regions stay untouched. Nothing here is real data.
/// </summary>
internal sealed record DemoScenario(string Size, double Resolution, double StepHours, int FirstYear, int Years, CfTime ShiftDate)
{
    public const double SpeedFactor = 2.5, NoiseFactor = 2.0;
    public const string Variable = "tb";

    /// <summary>Eight sectors covering the globe; the shift goes into the two named in <see cref="ChangedRegions"/>.</summary>
    public static readonly (string Name, double South, double North, double West, double East)[] Sectors =
    [
        ("arctic_east", 45, 90, 0, 180), ("arctic_west", 45, 90, 180, 360),
        ("north_east", 0, 45, 0, 180), ("north_west", 0, 45, 180, 360),
        ("south_east", -45, 0, 0, 180), ("south_west", -45, 0, 180, 360),
        ("antarctic_east", -90, -45, 0, 180), ("antarctic_west", -90, -45, 180, 360),
    ];

    public static readonly string[] ChangedRegions = ["north_west", "south_east"];

    public static DemoScenario For(string size) => size switch
    {
        "small" => new DemoScenario("small", 4, 6, 2031, 4, CfTime.Of(CfCalendar.Standard, 2033, 1, 1)),
        "default" => new DemoScenario("default", 2, 3, 2031, 6, CfTime.Of(CfCalendar.Standard, 2034, 1, 1)),
        _ => throw new BadInputException(null, null, $"--size {size}: choose small or default"),
    };

    public int Rows => (int)Math.Round(180 / Resolution);
    public int Columns => (int)Math.Round(360 / Resolution);
    public CfTime Start => CfTime.Of(CfCalendar.Standard, FirstYear, 1, 1);
    public CfTime End => CfTime.Of(CfCalendar.Standard, FirstYear + Years, 1, 1);
    public int Frames => (int)(End.MicrosSince(Start) / (long)(StepHours * 3600 * CfTime.MicrosPerSecond));

    public IEnumerable<string> RegionSpecs() =>
        new[] { "global" }.Concat(Sectors.Select(s => $"box:{s.Name}={s.South},{s.North},{s.West},{s.East}"));

    /// <summary>Writes the record, one year per file (as archives usually come), and returns the paths.</summary>
    public IReadOnlyList<string> Write(string folder, IProgress<(int, int)>? progress = null)
    {
        Directory.CreateDirectory(folder);
        var paths = new List<string>();
        int done = 0;
        for (int year = FirstYear; year < FirstYear + Years; year++)
        {
            string path = Path.Combine(folder, $"tb_invented_{year}.nc");
            WriteYear(path, year, ref done, progress);
            paths.Add(path);
        }
        return paths;
    }

    void WriteYear(string path, int year, ref int done, IProgress<(int, int)>? progress)
    {
        var from = CfTime.Of(CfCalendar.Standard, year, 1, 1);
        var to = CfTime.Of(CfCalendar.Standard, year + 1, 1, 1);
        long step = (long)(StepHours * 3600 * CfTime.MicrosPerSecond);
        int first = (int)(from.MicrosSince(Start) / step), count = (int)(to.MicrosSince(from) / step);
        using var w = ClassicWriter.Create(path);
        w.AddAttribute(NcAttribute.Text("Conventions", "CF-1.12"));
        w.AddAttribute(NcAttribute.Text("title", "Invented water-vapour-channel brightness temperature (GridDrift demo; not real data)"));
        w.AddAttribute(NcAttribute.Text("source", "griddrift demo: synthetic scenario with a regime shift injected in two regions"));
        var time = w.AddDimension("time", 0, unlimited: true);
        var lat = w.AddDimension("lat", Rows);
        var lon = w.AddDimension("lon", Columns);
        var vt = w.AddVariable("time", NcType.Double, [time],
            [NcAttribute.Text("standard_name", "time"), NcAttribute.Text("units", "hours since 2031-01-01 00:00:00"), NcAttribute.Text("calendar", "standard")]);
        var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("standard_name", "latitude"), NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("standard_name", "longitude"), NcAttribute.Text("units", "degrees_east")]);
        var v = w.AddVariable(Variable, NcType.Float, [time, lat, lon],
        [
            NcAttribute.Text("standard_name", "toa_brightness_temperature"), NcAttribute.Text("long_name", "water-vapour-channel brightness temperature (invented)"),
            NcAttribute.Text("units", "K"), NcAttribute.Of("valid_min", 180f), NcAttribute.Of("valid_max", 320f),
        ]);
        w.EndDefinitions();
        w.Write<float>(vlat, Enumerable.Range(0, Rows).Select(j => (float)(-90 + Resolution * (j + 0.5))).ToArray());
        w.Write<float>(vlon, Enumerable.Range(0, Columns).Select(i => (float)(Resolution * (i + 0.5))).ToArray());
        const int Batch = 64;
        var frames = new float[Batch][];
        for (int k = 0; k < Batch; k++) frames[k] = new float[Rows * Columns];
        for (int b = 0; b < count; b += Batch)
        {
            int n = Math.Min(Batch, count - b);
            Parallel.For(0, n, k => Frame(first + b + k, frames[k]));
            for (int k = 0; k < n; k++)
            {
                w.WriteRecord<double>(vt, b + k, [(first + b + k) * StepHours]);
                w.WriteRecord<float>(v, b + k, frames[k]);
            }
            done += n;
            progress?.Report((done, Frames));
        }
        w.Commit();
    }

    /// <summary>
    /// One frame, a pure function of its index (so frames can be made in any order, on any core).
    /// The waves use cos(a + b) = cos a cos b − sin a sin b with the longitude part per column and
    /// the time-and-latitude part per row, so a cell costs a few multiplications, not three cosines.
    /// </summary>
    public void Frame(int index, Span<float> field)
    {
        double hours = index * StepHours, days = hours / 24;
        var time = Start.AddMicros((long)(hours * 3600 * CfTime.MicrosPerSecond));
        bool shifted = time >= ShiftDate;
        double shiftDays = ShiftDate.SecondsSince(Start) / 86400;
        double season = Math.Sin(2 * Math.PI * (days - 80) / 365.2425);
        var rng = new Random(FrameSeed(index));
        int columns = Columns;
        Span<double> cosA = stackalloc double[3 * columns], sinA = stackalloc double[3 * columns], diurnal = stackalloc double[columns];
        for (int i = 0; i < columns; i++)
        {
            double lambda = Resolution * (i + 0.5);
            for (int m = 1; m <= 3; m++)
            {
                double a = m * 2 * lambda * Math.PI / 180;
                cosA[(m - 1) * columns + i] = Math.Cos(a);
                sinA[(m - 1) * columns + i] = Math.Sin(a);
            }
            diurnal[i] = 1.5 * Math.Cos(2 * Math.PI * ((hours % 24) + lambda / 15) / 24);
        }
        Span<double> cosB = stackalloc double[6], sinB = stackalloc double[6];
        double spare = double.NaN;
        for (int j = 0; j < Rows; j++)
        {
            double phi = -90 + Resolution * (j + 0.5), rad = phi * Math.PI / 180, c = Math.Cos(rad);
            double mean = 238 + 22 * Math.Pow(Math.Sin(2 * rad), 2) + 6 * Math.Abs(Math.Sin(rad)) + 4 * season * Math.Sign(phi) * Math.Abs(Math.Sin(rad));
            // the waves keep their phase at the shift: after it they advance from where they were, faster
            double fast = shiftDays + (days - shiftDays) * SpeedFactor;
            for (int m = 1; m <= 3; m++)
            {
                double speed = 6.0 + 2 * m; // degrees of longitude per day, eastward
                double b0 = -m * 2 * speed * days * Math.PI / 180 + 0.7 * m + 3 * rad, b1 = -m * 2 * speed * fast * Math.PI / 180 + 0.7 * m + 3 * rad;
                cosB[m - 1] = Math.Cos(b0); sinB[m - 1] = Math.Sin(b0);
                cosB[m + 2] = Math.Cos(b1); sinB[m + 2] = Math.Sin(b1);
            }
            for (int i = 0; i < columns; i++)
            {
                double lambda = Resolution * (i + 0.5);
                double w = shifted ? Strength(phi, lambda) : 0;
                double waves = 0, fastWaves = 0;
                for (int m = 0; m < 3; m++)
                {
                    waves += (5.0 / (m + 1)) * c * (cosA[m * columns + i] * cosB[m] - sinA[m * columns + i] * sinB[m]);
                    if (w > 0) fastWaves += (5.0 / (m + 1)) * c * (cosA[m * columns + i] * cosB[3 + m] - sinA[m * columns + i] * sinB[3 + m]);
                }
                waves = (1 - w) * waves + w * fastWaves;
                double z;
                if (double.IsNaN(spare))
                {
                    double r = Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())), t = 2 * Math.PI * rng.NextDouble();
                    z = r * Math.Cos(t);
                    spare = r * Math.Sin(t);
                }
                else
                {
                    z = spare;
                    spare = double.NaN;
                }
                double noise = (1 + (NoiseFactor - 1) * w) * 0.8 * z;
                field[j * columns + i] = (float)(mean + waves + c * diurnal[i] + noise);
            }
        }
    }

    /// <summary>
    /// The noise seed of a frame: SplitMix64 (Steele, Lea &amp; Flood 2014) of its index. Seeds that
    /// follow each other (17 + index) give System.Random streams whose first draws are correlated,
    /// and that correlation drifts slowly with the seed: the similarity of consecutive frames then
    /// drifted in regions nothing was done to.
    /// </summary>
    static int FrameSeed(int index)
    {
        ulong z = unchecked((ulong)index + 0x9E3779B97F4A7C15UL * 17);
        z = unchecked((z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL);
        z = unchecked((z ^ (z >> 27)) * 0x94D049BB133111EBUL);
        return (int)((z ^ (z >> 31)) >> 33);
    }

    /// <summary>
    /// How much of the shift a cell gets: 0 outside the changed sectors and within
    /// <see cref="GuardCells"/> cells of their edges, rising linearly to 1 over as many cells again.
    /// </summary>
    public double Strength(double phi, double lambda)
    {
        foreach (var s in Sectors)
            if (ChangedRegions.Contains(s.Name) && phi >= s.South && phi < s.North && lambda >= s.West && lambda < s.East)
            {
                double cells = Math.Min(Math.Min(phi - s.South, s.North - phi), Math.Min(lambda - s.West, s.East - lambda)) / Resolution;
                return Math.Clamp((cells - GuardCells) / GuardCells, 0, 1);
            }
        return 0;
    }

    /// <summary>Cells next to a sector's edge that the shift leaves alone (SSIM's Gaussian window weighs cells four or more away by under 3 %).</summary>
    public const double GuardCells = 3;

    /// <summary>The injected truth, for the report to set beside what was recovered.</summary>
    public string TruthJson() => System.Text.Json.JsonSerializer.Serialize(new
    {
        shift_time = ShiftDate.ToIsoString(),
        changed_regions = ChangedRegions,
        containing_regions = new[] { "global" },
        untouched_regions = Sectors.Select(s => s.Name).Where(n => !ChangedRegions.Contains(n)).ToArray(),
        wave_speed_factor = SpeedFactor,
        noise_factor = NoiseFactor,
        fades_out_within_cells_of_sector_edges = 2 * GuardCells,
        noise = "independent per frame (seeds by SplitMix64 of the frame index)",
        note = "invented scenario of griddrift demo; not real data",
    }, new System.Text.Json.JsonSerializerOptions { WriteIndented = true });
}
