using System.Text;
using System.Text.Json;
using GridDrift.Results;

namespace GridDrift.Outputs.Description;

/// <summary>
/// The JSON form of `describe`: format, dimensions (name → length), variables (name → type, dims,
/// shape, units, standard_name …), time (calendar, units, first, last, count, step as an ISO 8601
/// duration, gaps) and grid.
/// </summary>
internal static class DescriptionJson
{
    static readonly JsonWriterOptions Options = new() { Indented = true, Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping };

    public static string Render(IReadOnlyList<FileDescription> files, RecordDescription? record, string? recordProblem = null)
    {
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, Options))
        {
            if (files.Count == 1 && record is null && recordProblem is null) File(w, files[0]);
            else
            {
                w.WriteStartObject();
                w.WriteStartArray("files");
                foreach (var f in files) File(w, f);
                w.WriteEndArray();
                if (record is not null)
                {
                    w.WriteStartObject("record");
                    w.WriteString("variable", record.Variable);
                    w.WriteStartArray("files");
                    foreach (var f in record.Files) w.WriteStringValue(f);
                    w.WriteEndArray();
                    Time(w, record.Time);
                    w.WriteEndObject();
                }
                else w.WriteNull("record");
                if (recordProblem is not null) w.WriteString("record_problem", recordProblem);
                w.WriteEndObject();
            }
        }
        return Encoding.UTF8.GetString(stream.ToArray());
    }

    static void File(Utf8JsonWriter w, FileDescription f)
    {
        w.WriteStartObject();
        w.WriteString("path", f.Path);
        w.WriteString("format", f.Format);
        w.WriteStartObject("dimensions");
        foreach (var d in f.Dimensions) w.WriteNumber(d.Name, d.Length);
        w.WriteEndObject();
        w.WriteStartArray("unlimited_dimensions");
        foreach (var d in f.Dimensions.Where(d => d.IsUnlimited)) w.WriteStringValue(d.Name);
        w.WriteEndArray();
        w.WriteStartObject("variables");
        foreach (var v in f.Variables)
        {
            w.WriteStartObject(v.Name);
            w.WriteString("type", v.Type);
            w.WriteStartArray("dims");
            foreach (var d in v.Dimensions) w.WriteStringValue(d);
            w.WriteEndArray();
            w.WriteStartArray("shape");
            foreach (var n in v.Shape) w.WriteNumberValue(n);
            w.WriteEndArray();
            NullableString(w, "units", v.Units);
            NullableString(w, "standard_name", v.StandardName);
            NullableString(w, "long_name", v.LongName);
            w.WriteString("role", v.Role);
            w.WriteStartObject("attributes");
            foreach (var a in v.Attributes) w.WriteString(a.Name, a.Value);
            w.WriteEndObject();
            w.WriteEndObject();
        }
        w.WriteEndObject();
        w.WriteStartObject("global_attributes");
        foreach (var a in f.GlobalAttributes) w.WriteString(a.Name, a.Value);
        w.WriteEndObject();
        if (f.Time is { } t) Time(w, t);
        else w.WriteNull("time");
        if (f.Grid is { } g)
        {
            w.WriteStartObject("grid");
            w.WriteString("kind", g.Kind.ToString());
            w.WriteString("description", g.Describe());
            w.WriteNumber("rows", g.LatitudeCount);
            w.WriteNumber("columns", g.LongitudeCount);
            if (g.LatitudeStep is { } a) w.WriteNumber("latitude_step", a); else w.WriteNull("latitude_step");
            if (g.LongitudeStep is { } b) w.WriteNumber("longitude_step", b); else w.WriteNull("longitude_step");
            w.WriteEndObject();
        }
        else w.WriteNull("grid");
        w.WriteStartArray("warnings");
        foreach (var x in f.Warnings) w.WriteStringValue(x);
        w.WriteEndArray();
        w.WriteEndObject();
    }

    static void Time(Utf8JsonWriter w, TimeDescription t)
    {
        w.WriteStartObject("time");
        w.WriteString("variable", t.Variable);
        w.WriteString("calendar", t.Calendar);
        w.WriteString("units", t.Units);
        w.WriteString("first", t.First);
        w.WriteString("last", t.Last);
        w.WriteNumber("count", t.Count);
        NullableString(w, "step", t.Step);
        w.WriteStartArray("gaps");
        foreach (var g in t.Gaps)
        {
            w.WriteStartObject();
            w.WriteString("after", g.Before.ToIsoString());
            w.WriteString("before", g.After.ToIsoString());
            w.WriteNumber("missing_steps", g.MissingSteps);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteEndObject();
    }

    static void NullableString(Utf8JsonWriter w, string name, string? value)
    {
        if (value is null) w.WriteNull(name); else w.WriteString(name, value);
    }
}
