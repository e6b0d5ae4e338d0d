using System.Text;
using GridDrift.Results;

namespace GridDrift.Outputs.Description;

/// <summary>The human-readable form of `describe`.</summary>
internal static class DescriptionText
{
    public static string Render(FileDescription f, bool withAttributes = false)
    {
        var s = new StringBuilder();
        s.AppendLine($"{f.Path}");
        s.AppendLine($"  format      {f.Format}");
        s.AppendLine($"  dimensions  " + (f.Dimensions.Count == 0 ? "none" : string.Join(", ",
            f.Dimensions.Select(d => d.IsUnlimited ? $"{d.Name} = {d.Length} (unlimited)" : $"{d.Name} = {d.Length}"))));
        s.AppendLine("  variables");
        int width = f.Variables.Count == 0 ? 0 : f.Variables.Max(v => Signature(v).Length);
        foreach (var v in f.Variables)
        {
            var extras = new List<string>();
            if (v.Units is { } u) extras.Add($"[{u}]");
            if (v.StandardName is { } sn) extras.Add(sn);
            else if (v.LongName is { } ln) extras.Add($"\"{ln}\"");
            extras.Add($"({v.Role})");
            s.AppendLine($"    {Signature(v).PadRight(width)}  {string.Join("  ", extras)}");
            if (withAttributes)
                foreach (var a in v.Attributes) s.AppendLine($"        {a.Name} = {Quote(a)}");
        }
        if (withAttributes && f.GlobalAttributes.Count > 0)
        {
            s.AppendLine("  global attributes");
            foreach (var a in f.GlobalAttributes) s.AppendLine($"    {a.Name} = {Quote(a)}");
        }
        if (f.Time is { } t) AppendTime(s, t);
        if (f.Grid is { } g) s.AppendLine($"  grid        {g.Describe()}");
        foreach (var w in f.Warnings) s.AppendLine($"  warning     {w}");
        return s.ToString();
    }

    public static string Render(RecordDescription r)
    {
        var s = new StringBuilder();
        s.AppendLine($"record of '{r.Variable}' over {r.Files.Count} files (in time order)");
        foreach (var file in r.Files) s.AppendLine($"    {file}");
        AppendTime(s, r.Time);
        return s.ToString();
    }

    static void AppendTime(StringBuilder s, TimeDescription t)
    {
        string step = t.StepText is null ? "" : $", step {t.StepText} ({t.Step})";
        s.AppendLine($"  time        {t.First} … {t.Last}, {t.Count} steps{step}");
        s.AppendLine($"              calendar {t.Calendar}, units \"{t.Units}\"");
        s.AppendLine($"  gaps        " + (t.Gaps.Count == 0 ? "none" : $"{t.Gaps.Count}"));
        foreach (var gap in t.Gaps.Take(20)) s.AppendLine($"              {gap}");
        if (t.Gaps.Count > 20) s.AppendLine($"              … and {t.Gaps.Count - 20} more");
    }

    static string Signature(VariableDescription v) => $"{v.Type} {v.Name}({string.Join(", ", v.Dimensions)})";

    static string Quote(AttributeDescription a) => a.Type is "char" or "string" ? $"\"{a.Value.Replace("\n", "\\n")}\"" : a.Value;
}
