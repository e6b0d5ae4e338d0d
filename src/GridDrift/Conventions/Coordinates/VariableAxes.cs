using GridDrift.Formats;

namespace GridDrift.Conventions.Coordinates;

/// <summary>
/// The coordinates of one data variable: per dimension its coordinate variable (a 1-D variable
/// named like the dimension, CF §1.2), plus auxiliary coordinates named by the coordinates
/// attribute (CF §5.2, e.g. 2-D latitude/longitude of a curvilinear grid) and the grid_mapping
/// variable (CF §5.6).
/// </summary>
internal sealed class VariableAxes
{
    public required NcVariable Data { get; init; }
    /// <summary>Per dimension of <see cref="Data"/>: its coordinate variable, or null.</summary>
    public required NcVariable?[] DimensionCoordinates { get; init; }
    /// <summary>Per dimension: what it measures.</summary>
    public required AxisRole[] DimensionRoles { get; init; }
    public NcVariable? Time { get; init; }
    public NcVariable? Latitude { get; init; }
    public NcVariable? Longitude { get; init; }
    public NcVariable? Vertical { get; init; }
    public NcVariable? ProjectionX { get; init; }
    public NcVariable? ProjectionY { get; init; }
    public NcVariable? GridMapping { get; init; }
    public IReadOnlyList<NcVariable> Auxiliary { get; init; } = [];

    public int IndexOf(AxisRole role) => Array.IndexOf(DimensionRoles, role);

    public static VariableAxes Discover(IDatasetReader reader, NcVariable data)
    {
        var coords = new NcVariable?[data.Rank];
        var roles = new AxisRole[data.Rank];
        for (int d = 0; d < data.Rank; d++)
        {
            var dim = data.Dimensions[d];
            var c = reader.Variables.FirstOrDefault(v => v.Rank == 1 && v.Dimensions[0] == dim && v.Name == dim.Name && v != data);
            coords[d] = c;
            roles[d] = c is null ? AxisRole.None : AxisClassifier.Classify(c);
        }

        var auxiliary = new List<NcVariable>();
        if (data.Attributes.Text("coordinates") is { } list)
            foreach (var name in list.Split(' ', StringSplitOptions.RemoveEmptyEntries))
                if (reader.FindVariable(name) is { } aux && !coords.Contains(aux)) auxiliary.Add(aux);

        NcVariable? Pick(AxisRole role)
        {
            int i = Array.IndexOf(roles, role);
            if (i >= 0) return coords[i];
            return auxiliary.FirstOrDefault(v => AxisClassifier.Classify(v) == role);
        }

        NcVariable? mapping = null;
        if (data.Attributes.Text("grid_mapping") is { } gm)
            mapping = reader.FindVariable(gm.Split(':', ' ')[0].Trim());

        // Dimensions without a coordinate variable but spanned by a 2-D auxiliary latitude/longitude
        // are the curvilinear grid's index axes: leave them None.
        return new VariableAxes
        {
            Data = data,
            DimensionCoordinates = coords,
            DimensionRoles = roles,
            Time = Pick(AxisRole.Time),
            Latitude = Pick(AxisRole.Latitude),
            Longitude = Pick(AxisRole.Longitude),
            Vertical = Pick(AxisRole.Vertical),
            ProjectionX = Pick(AxisRole.ProjectionX),
            ProjectionY = Pick(AxisRole.ProjectionY),
            GridMapping = mapping,
            Auxiliary = auxiliary,
        };
    }
}
