using GridDrift.Formats;

namespace GridDrift.Outputs;

/// <summary>The attributes of a <see cref="ScalarCoordinate"/>'s variable.</summary>
internal static class ScalarCoordinates
{
    public static IEnumerable<NcAttribute> Attributes(ScalarCoordinate c)
    {
        if (c.StandardName is { } sn) yield return NcAttribute.Text("standard_name", sn);
        if (c.LongName is { } ln) yield return NcAttribute.Text("long_name", ln);
        if (c.Units is { } u) yield return NcAttribute.Text("units", u);
        if (c.Axis is { } a) yield return NcAttribute.Text("axis", a);
        if (c.Positive is { } p) yield return NcAttribute.Text("positive", p);
    }
}
