using GridDrift.Formats;
using GridDrift.Frames;

namespace GridDrift.Workflows;

/// <summary>
/// The dimensions a frame selection fixed (a level, a member), as CF scalar coordinates for the
/// products: the coordinate's own name, value, units and standard name, or the dimension's name
/// and the index where it has no coordinate variable.
/// </summary>
internal static class SelectionScalars
{
    public static IReadOnlyList<ScalarCoordinate> Of(FrameSource source) => source.Fixed.Select(f => f.Coordinate is { } c && f.Value is { } v
        ? new ScalarCoordinate(c.Name, v, c.Attributes.Text("units"), c.Attributes.Text("standard_name"), c.Attributes.Text("long_name"),
            c.Attributes.Text("axis"), c.Attributes.Text("positive"))
        : new ScalarCoordinate(f.Dimension, f.Index, null, null, $"index along {f.Dimension}")).ToList();
}
