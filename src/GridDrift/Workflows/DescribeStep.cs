using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Time;
using GridDrift.Conventions.Values;
using GridDrift.Formats;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Results;

namespace GridDrift.Workflows;

/// <summary>Builds the description of files (and, for several files, of the record they form).</summary>
internal static class DescribeStep
{
    public static FileDescription DescribeFile(string path)
    {
        using var reader = DatasetFiles.Open(path);
        var warnings = new List<string>();
        var roles = VariableRoles.Of(reader);
        var variables = reader.Variables.Select(v => new VariableDescription(
            v.Name, v.TypeName, v.Dimensions.Select(d => d.Name).ToList(), v.Shape,
            v.Attributes.Text("units"), v.Attributes.Text("standard_name"), v.Attributes.Text("long_name"),
            roles[v.Name], v.Attributes.Select(Attribute).ToList())).ToList();
        foreach (var v in reader.Variables.Where(v => NcTypes.IsNumeric(v.Type)))
            foreach (var w in ValueCodec.For(v).Warnings) warnings.Add($"variable '{v.Name}': {w}");

        TimeDescription? time = null;
        var timeVariable = PickTime(reader);
        if (timeVariable is not null)
        {
            try
            {
                var axis = TimeAxis.Read(reader, timeVariable);
                foreach (var w in axis.Warnings) warnings.Add($"variable '{axis.VariableName}': {w}");
                time = Describe(axis.VariableName, axis, axis.Times);
            }
            catch (BadInputException e)
            {
                warnings.Add(e.Fault);
            }
        }
        return new FileDescription(path, reader.Format,
            reader.Dimensions.Select(d => new DimensionDescription(d.Name, d.Length, d.IsUnlimited)).ToList(),
            variables, reader.Attributes.Select(Attribute).ToList(), time, GridOf(reader), warnings);
    }

    /// <summary>
    /// The record formed by several files. With a variable named, files that do not form one
    /// record are bad input; without one, the first gridded time-dependent variable that every
    /// file has is tried, and a failure is reported as the reason they form no record.
    /// </summary>
    public static (RecordDescription? Record, string? Problem) DescribeRecord(IReadOnlyList<string> paths, string? variable = null)
    {
        if (variable is not null)
        {
            using var named = FrameSource.Open(paths, variable);
            return (Record(named), null);
        }
        var candidates = CandidateVariables(paths[0]);
        foreach (var path in paths.Skip(1))
        {
            using var r = DatasetFiles.Open(path);
            candidates.RemoveAll(name => r.FindVariable(name) is null);
        }
        if (candidates.Count == 0) return (null, "the files share no gridded variable with a time axis");
        try
        {
            using var source = FrameSource.Open(paths, candidates[0]);
            return (Record(source), null);
        }
        catch (BadInputException e)
        {
            return (null, $"they do not form one record of '{candidates[0]}': {e.Message}");
        }
    }

    static List<string> CandidateVariables(string path)
    {
        using var first = DatasetFiles.Open(path);
        // a time dimension, or one image with a scalar time coordinate (CF §5.7) named in its coordinates
        bool Timed(NcVariable v) => VariableAxes.Discover(first, v).IndexOf(AxisRole.Time) >= 0 || FrameSource.ScalarTime(first, v) is not null;
        return first.Variables.Where(v => v.Rank >= 2 && NcTypes.IsNumeric(v.Type) && Timed(v)).Select(v => v.Name).ToList();
    }

    static RecordDescription Record(FrameSource source) =>
        new(source.VariableName, source.Files, Describe(source.Axes.Time?.Name ?? "time", null, source.Times, source));

    static TimeDescription Describe(string name, TimeAxis? axis, IReadOnlyList<CfTime> times, FrameSource? source = null)
    {
        var step = source?.Step ?? TimeStep.Infer(times);
        var gaps = source?.Gaps.ToList() ?? TimeGap.Find(times, step);
        string calendar = axis?.CalendarAttribute ?? source!.Calendar.CfName();
        string units = axis?.Units.Text ?? source!.TimeUnits.Text;
        return new TimeDescription(name, calendar, units,
            times.Count > 0 ? times[0].ToIsoString() : "", times.Count > 0 ? times[^1].ToIsoString() : "",
            times.Count, step?.ToIso8601(), step?.Describe(), gaps);
    }

    static NcVariable? PickTime(IDatasetReader reader)
    {
        var candidates = reader.Variables
            .Where(v => v.Rank == 1 && v.Dimensions[0].Name == v.Name && AxisClassifier.Classify(v) == AxisRole.Time
                        && TimeUnits.LooksLikeTime(v.Attributes.Text("units")))
            .ToList();
        return candidates.FirstOrDefault(v => v.Name == "time") ?? candidates.FirstOrDefault();
    }

    static HorizontalGrid? GridOf(IDatasetReader reader)
    {
        var data = reader.Variables.Where(v => v.Rank >= 2 && NcTypes.IsNumeric(v.Type)).ToList();
        foreach (var v in data)
        {
            var axes = VariableAxes.Discover(reader, v);
            if (axes.GridMapping?.Attributes.Text("grid_mapping_name") is { } mapping && axes.ProjectionX is { } x && axes.ProjectionY is { } y)
                return HorizontalGrid.Projected(mapping == "geostationary" ? GridKind.Geostationary : GridKind.Projected,
                    (int)y.Dimensions[0].Length, (int)x.Dimensions[0].Length);
            if (axes.Latitude is { } lat && axes.Longitude is { } lon)
            {
                if (lat.Rank == 1 && lon.Rank == 1 && NcTypes.IsNumeric(lat.Type) && NcTypes.IsNumeric(lon.Type))
                    return HorizontalGrid.FromAxes(reader.ReadAllDoubles(lat), reader.ReadAllDoubles(lon));
                if (lat.Rank == 2)
                    return HorizontalGrid.Curvilinear((int)lat.Dimensions[0].Length, (int)lat.Dimensions[1].Length);
            }
        }
        return null;
    }

    static AttributeDescription Attribute(NcAttribute a) =>
        new(a.Name, a.Type == NcType.Unsupported ? "unsupported" : NcTypes.CdlName(a.Type), a.AsText() ?? a.Render());
}
