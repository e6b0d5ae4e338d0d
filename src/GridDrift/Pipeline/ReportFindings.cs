using System.Globalization;
using System.Text.Json.Nodes;
using GridDrift.Analysis;
using GridDrift.Outputs.Report;

namespace GridDrift.Pipeline;

/// <summary>
/// What a run found, as the report tells it: only what survives the false-discovery control
/// (q &lt; α) is a finding; the rest is counted, not presented. Read from the summaries of the
/// events and attribute steps.
/// </summary>
internal sealed class ReportFindings
{
    public string Quantity { get; private init; } = "";
    public double Alpha { get; private init; } = 0.05;
    public List<string> Regions { get; } = [];
    public List<JsonObject> Changes { get; } = [];
    public List<JsonObject> Trends { get; } = [];
    public int Tests { get; private set; }
    public JsonObject? Attribute { get; private init; }
    public bool HasEvents { get; private init; }

    public static ReportFindings From(JsonObject? events, JsonObject? attribute)
    {
        var f = new ReportFindings
        {
            Quantity = (string?)events?["quantity"] ?? "", Alpha = events?["alpha"]?.GetValue<double>() ?? 0.05, Attribute = attribute, HasEvents = events is not null,
        };
        if (events is null) return f;
        foreach (var t in events["trends"]!.AsArray().Select(n => n!.AsObject()))
        {
            f.Regions.Add((string)t["region"]!);
            f.Tests++;
            if (t["significant"]?.GetValue<bool>() == true) f.Trends.Add(t);
        }
        foreach (var c in events["changepoints"]!.AsArray().Select(n => n!.AsObject()))
        {
            f.Tests++;
            if (c["significant"]?.GetValue<bool>() == true) f.Changes.Add(c);
        }
        return f;
    }

    static string Region(JsonObject o) => (string)o["region"]!;
    static string Method(JsonObject o) => (string)o["method"]!;
    static double Q(JsonObject o) => o["q_value"]?.GetValue<double>() ?? double.NaN;
    static double Value(JsonObject o, string key) => o[key]?.GetValue<double>() ?? double.NaN;
    static string Day(JsonNode? time) => time is null ? "–" : ((string)time!)[..Math.Min(10, ((string)time!).Length)];

    /// <summary>Each region's main change of the series (not of the event rate): Pettitt's where it survives, else the PELT change with the least q.</summary>
    public Dictionary<string, JsonObject> MainChanges() => Changes.Where(c => Method(c) != "event-rate").GroupBy(Region)
        .ToDictionary(g => g.Key, g => g.OrderBy(c => Method(c) == "pettitt" ? 0 : 1).ThenBy(Q).First());

    public HashSet<string> FlaggedRegions() => Changes.Select(Region).Concat(Trends.Select(Region)).ToHashSet();

    /// <summary>The first paragraph: what changed, when, where, how sure, and what did not.</summary>
    public IEnumerable<string> PlainWords()
    {
        if (!HasEvents) { yield return "This run has no series analysis ([events]): there are no findings about changes."; yield break; }
        string level = Alpha.ToString("0.##", CultureInfo.InvariantCulture);
        var main = MainChanges();
        yield return main.Count == 0
            ? $"**What changed.** No region's `{Quantity}` series changed: no change survived the false-discovery control (q < {level})."
            : $"**What changed, when and where.** The `{Quantity}` series changed in {main.Count} of {Regions.Count} regions: " +
              string.Join("; ", Regions.Where(main.ContainsKey).Select(r => Sentence(r, main[r]))) + ".";
        var rates = Changes.Where(c => Method(c) == "event-rate").ToList();
        if (rates.Count > 0)
            yield return "**Events.** The rate of outlier events changed in " + string.Join("; ", rates.Select(c =>
                $"{Region(c)} from {Day(c["time"])} ({Value(c, "mean_before").ToString("0.#", CultureInfo.InvariantCulture)} → {Value(c, "mean_after").ToString("0.#", CultureInfo.InvariantCulture)} events per month" +
                (c["trend_reverses"]?.GetValue<bool>() == true ? ", the event-count trend reverses" : "") + $", q {PValues.Format(Q(c))})")) + ".";
        else yield return $"**Events.** No region's rate of outlier events changed at q < {level}.";
        if (Trends.Count > 0)
            yield return "**Trends over the record.** " + string.Join("; ", Trends.Select(t =>
                $"{Region(t)}: {PerYear(Value(t, "sen_slope"))} per year (95 % interval {PerYear(Value(t, "sen_slope_lo"))} to {PerYear(Value(t, "sen_slope_hi"))}), q {PValues.Format(Q(t))}")) + ".";
        else yield return $"**Trends over the record.** None at q < {level}.";
        yield return $"**How sure.** A finding here holds at a false discovery rate of {100 * Alpha:0} % over all {Tests} tests of the run (Benjamini–Hochberg q < {level}); " +
            "the tests run on the series less its seasonal cycle and allow for persistence (each series is whitened by its own autoregressive model). " +
            "Dates carry 95 % bootstrap intervals.";
        var quiet = Regions.Where(r => !FlaggedRegions().Contains(r)).ToList();
        yield return quiet.Count == 0 ? "**What did not change.** Every region has at least one finding."
            : $"**What did not change.** No change, trend or event-rate change in: {string.Join(", ", quiet)}.";
        if (Leaders() is { Count: > 0 } leaders)
            yield return $"**Which regions drive the change.** For `{Attribute!["target"]}`, the importance that rose most from before to after the change ({Attribute["periods"]}): " +
                string.Join("; ", leaders.Take(3).Select(l => $"{(string)l["region"]!} ({Signed(Value(l, "change"))}; 95 % interval {Signed(Value(l, "change_lo"))} to {Signed(Value(l, "change_hi"))}" +
                    (Value(l, "change_lo") <= 0 ? ", which includes no change" : "") + ")")) + ".";
        else if (Attribute is not null) yield return $"**Which regions drive the change.** Not assessed: {Attribute["periods"]}.";
    }

    /// <summary>The attribution's regions by how much their importance rose between the periods, most first.</summary>
    public List<JsonObject> Leaders() => Attribute?["importance_change"]?.AsArray().Select(n => n!.AsObject()).ToList() ?? [];

    static string Sentence(string region, JsonObject c) =>
        $"{region} on {Day(c["time"])}" + (c["time_low"] is null ? "" : $" (95 % interval {Day(c["time_low"])} to {Day(c["time_high"])})") +
        $", mean {Number(Value(c, "mean_before"))} → {Number(Value(c, "mean_after"))}, q {PValues.Format(Q(c))}";

    static string Number(double v) => double.IsNaN(v) ? "–" : Math.Abs(v) >= 0.01 || v == 0 ? v.ToString("0.####", CultureInfo.InvariantCulture) : v.ToString("0.##E+0", CultureInfo.InvariantCulture);
    static string PerYear(double perDay) => Number(perDay * 365.2425);
    static string Signed(double v) => (v >= 0 ? "+" : "") + Number(v);

    /// <summary>The findings' tables: changes and trends that survive, and the drivers of the change.</summary>
    public void Tables(ReportDocument doc)
    {
        if (!HasEvents) return;
        doc.Section("Findings");
        string level = Alpha.ToString("0.##", CultureInfo.InvariantCulture);
        if (Changes.Count > 0)
        {
            doc.Text($"Changes at q < {level} (method: Pettitt's test and PELT on the whitened series; the event rate is the monthly rate of outlier events):");
            doc.Rows(["region", "method", "date", "95 % interval", "before", "after", "p", "q"], Changes.Select(c => new[]
            {
                Region(c), Method(c), Day(c["time"]), c["time_low"] is null ? "–" : $"{Day(c["time_low"])} … {Day(c["time_high"])}",
                Number(Value(c, "mean_before")), Number(Value(c, "mean_after")), PValues.Format(Value(c, "p_value") <= PValues.Floor ? 0 : Value(c, "p_value")), PValues.Format(Q(c)),
            }));
        }
        if (Trends.Count > 0)
        {
            doc.Text($"Trends over the record at q < {level} (Mann–Kendall on the whitened series; Sen's slope per year):");
            doc.Rows(["region", "slope per year", "95 % interval", "p", "q"], Trends.Select(t => new[]
            {
                Region(t), PerYear(Value(t, "sen_slope")), $"{PerYear(Value(t, "sen_slope_lo"))} … {PerYear(Value(t, "sen_slope_hi"))}",
                PValues.Format(Value(t, "mk_p") <= PValues.Floor ? 0 : Value(t, "mk_p")), PValues.Format(Q(t)),
            }));
        }
        int kept = Changes.Count + Trends.Count;
        doc.Text($"{Tests - kept} of the run's {Tests} candidate changes and trends did not survive the false-discovery control; they are not findings. " +
            "All of them are in the events tables (`_changepoints`, `_trends`) with their p- and q-values.");
        var leaders = Leaders();
        if (leaders.Count > 0)
        {
            doc.Section("Which regions drive the change");
            doc.Text($"Change of each region's permutation importance for `{Attribute!["target"]}` between the periods ({Attribute["periods"]}); " +
                "the interval comes from resampling the years of each period:");
            doc.Rows(["rank", "region", "importance before", "importance after", "change", "95 % interval"], leaders.Select(l => new[]
            {
                l["rank"]!.ToString(), (string)l["region"]!, Number(Value(l, "importance_before")), Number(Value(l, "importance_after")),
                Signed(Value(l, "change")), $"{Signed(Value(l, "change_lo"))} … {Signed(Value(l, "change_hi"))}",
            }));
        }
    }

    /// <summary>The run summary's keys: changed and unchanged regions, and the regions leading the change.</summary>
    public void Describe(JsonObject summary)
    {
        if (!HasEvents) return;
        var flagged = FlaggedRegions();
        summary["changed_regions"] = new JsonArray(Regions.Where(MainChanges().ContainsKey).Select(r => (JsonNode)r).ToArray());
        summary["regions_without_findings"] = new JsonArray(Regions.Where(r => !flagged.Contains(r)).Select(r => (JsonNode)r).ToArray());
        summary["findings"] = Changes.Count + Trends.Count;
        summary["tests"] = Tests;
        if (Leaders() is { Count: > 0 } leaders)
            summary["leading_regions"] = new JsonArray(leaders.Take(3).Select(l => (JsonNode)(string)l["region"]!).ToArray());
    }
}
