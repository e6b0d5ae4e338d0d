using System.Text;
using GridDrift.Results;

namespace GridDrift.Outputs.Description;

/// <summary>The human-readable form of `describe`.</summary>
internal static class DescriptionText
{
    public static string Render(FileDescription f, bool withAttributes = false)
    {
        var s = new StringBuilder();
        Line(s, $"{f.Path}");
        Line(s, $"  format      {f.Format}");
        Line(s, $"  dimensions  " + (f.Dimensions.Count == 0 ? "none" : string.Join(", ",
            f.Dimensions.Select(d => d.IsUnlimited ? $"{d.Name} = {d.Length} (unlimited)" : $"{d.Name} = {d.Length}"))));
        Line(s, "  variables");
        int width = f.Variables.Count == 0 ? 0 : f.Variables.Max(v => Signature(v).Length);
        foreach (var v in f.Variables)
        {
            var extras = new List<string>();
            if (v.Units is { } u) extras.Add($"[{u}]");
            if (v.StandardName is { } sn) extras.Add(sn);
            else if (v.LongName is { } ln) extras.Add($"\"{ln}\"");
            extras.Add($"({v.Role})");
            Line(s, $"    {Signature(v).PadRight(width)}  {string.Join("  ", extras)}");
            if (withAttributes)
                foreach (var a in v.Attributes) Line(s, $"        {a.Name} = {Quote(a)}");
        }
        if (withAttributes && f.GlobalAttributes.Count > 0)
        {
            Line(s, "  global attributes");
            foreach (var a in f.GlobalAttributes) Line(s, $"    {a.Name} = {Quote(a)}");
        }
        if (f.Time is { } t) AppendTime(s, t);
        if (f.Grid is { } g) Line(s, $"  grid        {g.Describe()}");
        foreach (var w in f.Warnings) Line(s, $"  warning     {w}");
        return s.ToString();
    }

    public static string Render(RecordDescription r)
    {
        var s = new StringBuilder();
        Line(s, $"record of '{r.Variable}' over {Counted.Of(r.Files.Count, "file")} (in time order)");
        foreach (var file in r.Files) Line(s, $"    {file}");
        AppendTime(s, r.Time);
        return s.ToString();
    }

    static void AppendTime(StringBuilder s, TimeDescription t)
    {
        string step = t.StepText is null ? "" : $", step {t.StepText} ({t.Step})";
        Line(s, $"  time        {t.First} … {t.Last}, {Counted.Of(t.Count, "step")}{step}");
        Line(s, $"              calendar {t.Calendar}, units \"{t.Units}\"");
        Line(s, $"  gaps        " + (t.Gaps.Count == 0 ? "none" : $"{t.Gaps.Count}"));
        foreach (var gap in t.Gaps.Take(20)) Line(s, $"              {gap}");
        if (t.Gaps.Count > 20) Line(s, $"              … and {t.Gaps.Count - 20} more");
    }

    static string Signature(VariableDescription v) => $"{v.Type} {v.Name}({string.Join(", ", v.Dimensions)})";

    static string Quote(AttributeDescription a) => a.Type is "char" or "string" ? $"\"{a.Value}\"" : a.Value;

    /// <summary>Every line of the description goes through here: what came from the file cannot break it or reach the terminal raw.</summary>
    static void Line(StringBuilder s, string line) => s.AppendLine(Printable.OneLine(line));
}
