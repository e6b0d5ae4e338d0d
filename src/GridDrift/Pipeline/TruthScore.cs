using System.Globalization;
using System.Text.Json.Nodes;
using GridDrift.Outputs.Report;

namespace GridDrift.Pipeline;

/// <summary>
/// The report's scoring against an injected truth (the demo's truth.json): for each region,
/// whether it was flagged (a finding at q &lt; α), when its main change lies and whether the date
/// interval holds the truth; over regions, precision and recall of the flags (regions that hold a
/// changed sector count as changed) and the untouched regions flagged; and whether the
/// attribution puts the changed sectors first by change of importance.
/// </summary>
internal static class TruthScore
{
    public static void Write(ReportDocument doc, JsonObject truth, ReportFindings found, JsonObject summary)
    {
        doc.Section("Injected truth and what was recovered");
        var when = DateTime.Parse((string)truth["shift_time"]!, CultureInfo.InvariantCulture);
        var changed = Names(truth["changed_regions"]);
        var containing = Names(truth["containing_regions"]);
        var positive = changed.Concat(containing).ToHashSet();
        doc.Text($"The invented record carries a regime shift on {when:yyyy-MM-dd} in {string.Join(" and ", changed)} " +
            $"(waves {truth["wave_speed_factor"]}× faster, noise {truth["noise_factor"]}× larger){(containing.Length > 0 ? $"; {string.Join(", ", containing)} contains them" : "")}.");
        var flagged = found.FlaggedRegions();
        var main = found.MainChanges();
        var rows = new List<string[]>();
        var recovered = new JsonArray();
        foreach (var region in found.Regions)
        {
            string kind = changed.Contains(region) ? "changed" : containing.Contains(region) ? "contains a changed sector" : "untouched";
            string date = "", offset = "", holds = "";
            if (main.TryGetValue(region, out var c))
            {
                var at = DateTime.Parse((string)c["time"]!, CultureInfo.InvariantCulture);
                date = at.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture);
                offset = (at - when).TotalDays.ToString("0.0", CultureInfo.InvariantCulture);
                if (c["time_low"] is { } low && c["time_high"] is { } high)
                    holds = DateTime.Parse((string)low!, CultureInfo.InvariantCulture) <= when && when <= DateTime.Parse((string)high!, CultureInfo.InvariantCulture) ? "yes" : "no";
                recovered.Add(new JsonObject { ["region"] = region, ["time"] = (string)c["time"]!, ["offset_days"] = (at - when).TotalDays, ["interval_holds_truth"] = holds == "yes" });
            }
            rows.Add([region, kind, flagged.Contains(region) ? "yes" : "no", date, offset, holds]);
        }
        doc.Rows(["region", "injected", "flagged (q < 0.05)", "main change", "days from the truth", "interval holds the truth"], rows);
        int truePositives = flagged.Count(positive.Contains);
        double precision = flagged.Count == 0 ? double.NaN : (double)truePositives / flagged.Count;
        double recall = positive.Count == 0 ? double.NaN : (double)found.Regions.Count(r => positive.Contains(r) && flagged.Contains(r)) / found.Regions.Count(positive.Contains);
        var falseAlarms = flagged.Where(r => !positive.Contains(r)).Order().ToList();
        var onTime = changed.Where(r => main.TryGetValue(r, out var c) && Math.Abs((DateTime.Parse((string)c["time"]!, CultureInfo.InvariantCulture) - when).TotalDays) <= RunReport.TruthToleranceDays).ToList();
        var leaders = found.Leaders().Take(changed.Length).Select(l => (string)l["region"]!).Order().ToArray();
        bool ranked = leaders.Length > 0 && leaders.SequenceEqual(changed.Order());
        doc.List(
        [
            $"Places: precision {Share(precision)}, recall {Share(recall)} over the regions (flagged regions that hold the change, and regions holding the change that were flagged).",
            falseAlarms.Count == 0 ? "False alarms: no untouched region was flagged." : $"False alarms: {string.Join(", ", falseAlarms)} flagged though untouched.",
            $"Timing: {onTime.Count} of {changed.Length} changed sectors have their main change within {RunReport.TruthToleranceDays:0} days of the truth.",
            ranked ? $"Attribution: {string.Join(" and ", changed)} lead the change of importance, as injected."
                : $"Attribution: the regions leading the change of importance are {(leaders.Length == 0 ? "not assessed" : string.Join(" and ", leaders))}; the injected ones are {string.Join(" and ", changed)}.",
        ]);
        summary["truth"] = truth.DeepClone();
        summary["recovered"] = recovered;
        summary["precision"] = double.IsNaN(precision) ? null : precision;
        summary["recall"] = double.IsNaN(recall) ? null : recall;
        summary["false_alarm_regions"] = new JsonArray(falseAlarms.Select(r => (JsonNode)r).ToArray());
        summary["attribution_matches_truth"] = ranked;
    }

    static string[] Names(JsonNode? list) => list?.AsArray().Select(n => (string)n!).ToArray() ?? [];

    static string Share(double v) => double.IsNaN(v) ? "–" : v.ToString("0.00", CultureInfo.InvariantCulture);
}
