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
            .Number("mk_z").Number("mk_p").Number("mk_z_hamed_rao").Number("mk_p_hamed_rao").Number("sen_slope_per_day").Number("sen_slope_lo").Number("sen_slope_hi").Text("units");
        var changes = new TableBuilder().Text("region").Text("quantity").Text("method").Text("time").Number("p_value").Number("mean_before").Number("mean_after")
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
            AddTrend(trends, r.Region, quantity, "record", times[0], times[^1], found.Trend, found.Slope, a.Units);
            foreach (var (first, end, trend, slope) in found.Segments)
                AddTrend(trends, r.Region, quantity, "segment", times[first], times[end - 1], trend, slope, a.Units);
            foreach (var c in found.ChangePoints)
                changes.Add(r.Region, quantity, MethodNames.Name(c.Method), times[c.FirstAfter].ToIsoString(), c.P ?? double.NaN, c.MeanBefore, c.MeanAfter,
                    c.Before.Slope, c.After.Slope, c.TrendReverses);
        }
        flags.Write(paths.Flags, metadata);
        counts.Write(paths.Counts, metadata);
        trends.Write(paths.Trends, metadata);
        changes.Write(paths.ChangePoints, metadata);
    }

    /// <summary>The JSON summary: change points and whole-record trends per region (Hamed–Rao-corrected Mann–Kendall beside the uncorrected values).</summary>
    public static JsonObject Summary(EventAnalysis a, string input, IReadOnlyDictionary<string, string> metadata)
    {
        var jsonChanges = new JsonArray();
        var jsonTrends = new JsonArray();
        foreach (var r in a.Regions)
        {
            var found = r.Findings;
            jsonTrends.Add(new JsonObject
            {
                ["region"] = r.Region, ["quantity"] = a.Quantity,
                ["sen_slope"] = Number(found.Slope.Slope), ["sen_slope_lo"] = Number(found.Slope.Low), ["sen_slope_hi"] = Number(found.Slope.High),
                // the same names mean the same values as in the _trends table: mk_z/mk_p uncorrected, *_hamed_rao corrected
                ["mk_z"] = Number(found.Trend.Z), ["mk_p"] = Number(found.Trend.P),
                ["mk_z_hamed_rao"] = Number(found.Trend.ZCorrected), ["mk_p_hamed_rao"] = Number(found.Trend.PCorrected),
                ["noise_sd"] = Number(r.NoiseSd),
            });
            foreach (var c in found.ChangePoints)
                jsonChanges.Add(new JsonObject
                {
                    ["region"] = r.Region, ["quantity"] = a.Quantity, ["method"] = MethodNames.Name(c.Method), ["time"] = a.Times[c.FirstAfter].ToIsoString(),
                    ["p_value"] = c.P is { } p ? Number(p) : null,
                    ["mean_before"] = Number(c.MeanBefore), ["mean_after"] = Number(c.MeanAfter), ["trend_reverses"] = c.TrendReverses,
                });
        }
        return new JsonObject
        {
            ["input"] = input, ["quantity"] = a.Quantity, ["calendar"] = a.Times[0].Calendar.CfName(), ["slope_units"] = metadata["slope_units"],
            ["caution"] = metadata["caution"], ["changepoints"] = jsonChanges, ["trends"] = jsonTrends,
        };
    }

    static void AddTrend(TableBuilder trends, string region, string quantity, string scope, CfTime start, CfTime end, MannKendall.Result mk, SenSlope.Estimate sen, string units) =>
        trends.Add(region, quantity, scope, start.ToIsoString(), end.ToIsoString(), mk.N, (double)mk.S, mk.VarS, mk.Z, mk.P, mk.ZCorrected, mk.PCorrected, sen.Slope, sen.Low, sen.High, units);

    static JsonNode? Number(double v) => double.IsFinite(v) ? JsonValue.Create(v) : null;
}
