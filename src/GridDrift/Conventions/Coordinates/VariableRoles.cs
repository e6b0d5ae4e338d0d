using GridDrift.Formats;

namespace GridDrift.Conventions.Coordinates;

/// <summary>The CF role of every variable of a file, for `describe`.</summary>
internal static class VariableRoles
{
    public static IReadOnlyDictionary<string, string> Of(IDatasetReader reader)
    {
        var roles = new Dictionary<string, string>();
        foreach (var v in reader.Variables)
        {
            if (v.Attributes.Text("bounds") is { } b) roles[b] = $"bounds of {v.Name}";
            if (v.Attributes.Text("climatology") is { } cb) roles[cb] = $"climatology bounds of {v.Name}";
            if (v.Attributes.Text("grid_mapping") is { } gm) roles[gm.Split(':', ' ')[0]] = "grid mapping";
            if (v.Attributes.Text("cell_measures") is { } cm)
                foreach (var part in cm.Split(' ', StringSplitOptions.RemoveEmptyEntries).Where(p => !p.EndsWith(':')))
                    roles[part] = "cell measure";
            if (v.Attributes.Text("coordinates") is { } co)
                foreach (var name in co.Split(' ', StringSplitOptions.RemoveEmptyEntries))
                    roles.TryAdd(name, "auxiliary coordinate");
        }
        var result = new Dictionary<string, string>();
        foreach (var v in reader.Variables)
        {
            if (roles.TryGetValue(v.Name, out var r))
            {
                var axis = AxisClassifier.Classify(v);
                result[v.Name] = r == "auxiliary coordinate" && axis != AxisRole.None ? $"auxiliary coordinate ({Describe(axis)})" : r;
            }
            else if (v.Rank == 1 && v.Dimensions[0].Name == v.Name)
                result[v.Name] = $"coordinate ({Describe(AxisClassifier.Classify(v))})";
            else if (v.Type == NcType.Unsupported)
                result[v.Name] = $"unsupported ({v.UnsupportedKind})";
            else result[v.Name] = v.Rank == 0 ? "scalar" : "data";
        }
        return result;
    }

    static string Describe(AxisRole role) => role switch
    {
        AxisRole.Time => "time",
        AxisRole.Latitude => "latitude",
        AxisRole.Longitude => "longitude",
        AxisRole.Vertical => "vertical",
        AxisRole.ProjectionX => "projection x",
        AxisRole.ProjectionY => "projection y",
        _ => "other",
    };
}
