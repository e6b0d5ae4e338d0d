using System.Globalization;
using System.Text.Json.Nodes;
using GridDrift.Analysis;
using GridDrift.Conventions.Time;

namespace GridDrift.Outputs.Tables;

/// <summary>
/// An event analysis as the four tidy tables of `griddrift events` — flags (per time, region and
/// detector), event counts (moving window and per year), trends (whole record and PELT
/// segments) and change points — and as its JSON summary.
/// </summary>
internal static class EventTables
{
    public sealed record Paths(string Flags, string Counts, string Trends, string ChangePoints);

    public static void Write(EventAnalysis a, Paths paths, IReadOnlyDictionary<string, string> metadata)
    {
        var flags = new TableBuilder().Text("time").Text("region").Text("quantity").Number("value").Text("detector").Number("score").Number("threshold").Flag("flagged").Integer("consensus").Flag("event");
        var counts = new TableBuilder().Text("region").Text("quantity").Text("kind").Text("period").Integer("count");
        var trends = new TableBuilder().Text("region").Text("quantity").Text("scope").Text("start").Text("end").Integer("n").Number("mk_s").Number("mk_s_variance")
            .Number("mk_z").Number("mk_p").Number("mk_log10_p").Number("q_value").Integer("ar_order").Number("ar_persistence")
            .Number("sen_slope_per_day").Number("sen_slope_lo").Number("sen_slope_hi").Text("units").Text("tested_on");
        var changes = new TableBuilder().Text("region").Text("quantity").Text("method").Text("time").Text("time_low").Text("time_high")
            .Number("p_value").Number("log10_p_value").Number("q_value").Flag("significant").Number("mean_before").Number("mean_after")
            .Number("sen_slope_before_per_day").Number("sen_slope_after_per_day").Flag("trend_reverses");
        var times = a.Times;
        string quantity = a.Quantity;
        foreach (var r in a.Regions)
        {
            var found = r.Findings;
            for (int t = 0; t < times.Length; t++)
            {
                string iso = times[t].ToIsoString();
                foreach (var (detector, f) in found.Flags)
                    flags.Add(iso, r.Region, quantity, r.Values[t], MethodNames.Name(detector), f[t].Score, f[t].Threshold, f[t].Flagged, found.Consensus[t], found.Events[t]);
                counts.Add(r.Region, quantity, "window", iso, found.WindowCounts[t]);
            }
            foreach (var (year, count) in r.YearlyEvents) counts.Add(r.Region, quantity, "year", year.ToString("0000", CultureInfo.InvariantCulture), count);
            string on = found.OnResiduals ? "residuals" : "values";
            AddTrend(trends, r.Region, quantity, "record", times, found.Trend, a.Units, on);
            foreach (var segment in found.Segments)
                AddTrend(trends, r.Region, quantity, "segment", times, segment, a.Units, on);
            foreach (var c in found.ChangePoints)
                changes.Add(r.Region, quantity, MethodNames.Name(c.Method), times[c.FirstAfter].ToIsoString(), Time(times, c.Low), Time(times, c.High),
                    PValues.Stored(c.P), c.Log10P, c.Q, c.Q < a.Options.Alpha, c.MeanBefore, c.MeanAfter, c.Before.Slope, c.After.Slope, c.TrendReverses);
        }
        flags.Write(paths.Flags, metadata);
        counts.Write(paths.Counts, metadata);
        trends.Write(paths.Trends, metadata);
        changes.Write(paths.ChangePoints, metadata);
    }

    /// <summary>The JSON summary: change points and whole-record trends per region, with p (floored at 1e-300), log10 p and q.</summary>
    public static JsonObject Summary(EventAnalysis a, string input, IReadOnlyDictionary<string, string> metadata)
    {
        var jsonChanges = new JsonArray();
        var jsonTrends = new JsonArray();
        foreach (var r in a.Regions)
        {
            var found = r.Findings;
            var trend = found.Trend;
            jsonTrends.Add(new JsonObject
            {
                ["region"] = r.Region, ["quantity"] = a.Quantity,
                ["sen_slope"] = Number(trend.Slope.Slope), ["sen_slope_lo"] = Number(trend.Slope.Low), ["sen_slope_hi"] = Number(trend.Slope.High),
                ["mk_z"] = Number(trend.Test.Z), ["mk_p"] = Number(PValues.Stored(trend.Test.P)), ["mk_log10_p"] = Number(trend.Test.Log10P), ["q_value"] = Number(trend.Q),
                ["significant"] = trend.Q < a.Options.Alpha, ["ar_order"] = trend.Test.Noise.Order, ["noise_sd"] = Number(r.NoiseSd),
                ["tested_on"] = found.OnResiduals ? "residuals" : "values",
            });
            foreach (var c in found.ChangePoints)
                jsonChanges.Add(new JsonObject
                {
                    ["region"] = r.Region, ["quantity"] = a.Quantity, ["method"] = MethodNames.Name(c.Method), ["time"] = a.Times[c.FirstAfter].ToIsoString(),
                    ["time_low"] = Time(a.Times, c.Low) is { Length: > 0 } low ? low : null, ["time_high"] = Time(a.Times, c.High) is { Length: > 0 } high ? high : null,
                    ["p_value"] = Number(PValues.Stored(c.P)), ["log10_p_value"] = Number(c.Log10P), ["q_value"] = Number(c.Q), ["significant"] = c.Q < a.Options.Alpha,
                    ["mean_before"] = Number(c.MeanBefore), ["mean_after"] = Number(c.MeanAfter), ["trend_reverses"] = c.TrendReverses,
                });
        }
        return new JsonObject
        {
            ["input"] = input, ["quantity"] = a.Quantity, ["calendar"] = a.Times[0].Calendar.CfName(), ["slope_units"] = metadata["slope_units"],
            ["alpha"] = a.Options.Alpha, ["caution"] = metadata["caution"], ["changepoints"] = jsonChanges, ["trends"] = jsonTrends,
        };
    }

    static string Time(CfTime[] times, int index) => index >= 0 && index < times.Length ? times[index].ToIsoString() : "";

    static void AddTrend(TableBuilder trends, string region, string quantity, string scope, CfTime[] times, TrendFinding f, string units, string on) =>
        trends.Add(region, quantity, scope, times[f.First].ToIsoString(), times[Math.Max(f.First, f.End - 1)].ToIsoString(), f.Test.N, (double)f.Test.S, f.Test.VarS,
            f.Test.Z, PValues.Stored(f.Test.P), f.Test.Log10P, f.Q, f.Test.Noise.Order, f.Test.Noise.Persistence, f.Slope.Slope, f.Slope.Low, f.Slope.High, units, on);

    static JsonNode? Number(double v) => double.IsFinite(v) ? JsonValue.Create(v) : null;
}
