using System.CommandLine;
using System.Diagnostics;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace GridDrift.Cli;

/// <summary>
/// `--json` on every command that writes products: one JSON object on stdout for pipeline
/// authors, with the products written, the command's counts, its warnings and the seconds it took
/// (docs/schemas.md, "Command summaries"). The human lines stay on stderr.
/// </summary>
internal static class CommandJson
{
    public static Option<bool> Option() => new("--json") { Description = "print a JSON summary on stdout: products written, counts, warnings and seconds taken (docs/schemas.md)" };

    /// <summary>The summary object; <paramref name="into"/> is a command's own JSON result that the summary's keys are added to.</summary>
    public static JsonObject Summary(string command, Stopwatch clock, IEnumerable<string?> products, JsonObject counts, IEnumerable<string>? warnings = null, JsonObject? into = null)
    {
        var o = into ?? new JsonObject();
        o["command"] = command;
        o["products"] = new JsonArray(products.OfType<string>().Select(p => (JsonNode)p).ToArray());
        o["counts"] = counts;
        o["warnings"] = new JsonArray((warnings ?? []).Select(w => (JsonNode)w).ToArray());
        o["seconds"] = Math.Round(clock.Elapsed.TotalSeconds, 3);
        return o;
    }

    public static void Print(ParseResult parse, Option<bool> json, JsonObject summary)
    {
        if (parse.GetValue(json)) parse.InvocationConfiguration.Output.WriteLine(summary.ToJsonString(Indented));
    }

    static readonly JsonSerializerOptions Indented = new() { WriteIndented = true, Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping };
}
