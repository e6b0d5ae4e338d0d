using GridDrift.Outputs.Plots;

namespace GridDrift.Tests.Outputs;

/// <summary>
/// The shipped low-resolution coastline lies where the coasts are: it passes within a degree of
/// capes whose positions are common knowledge (from memory, to a tenth of a degree), and lines
/// that cross the map's edge are split there instead of being drawn across the whole map.
/// </summary>
public class CoastlineTests
{
    [Theory]
    [InlineData(18.5, -34.4)]   // Cape of Good Hope
    [InlineData(-67.3, -56.0)]  // Cape Horn
    [InlineData(-5.6, 36.0)]    // Strait of Gibraltar, European side
    [InlineData(-9.5, 38.8)]    // Cabo da Roca, westernmost point of mainland Europe
    [InlineData(142.5, -10.7)]  // Cape York
    [InlineData(-70.0, 41.7)]   // Cape Cod
    public void The_coastline_passes_near_a_well_known_cape(double lon, double lat)
    {
        double nearest = Coastlines.Wrapped(-180).SelectMany(l => l.X.Zip(l.Y)).Min(p => Math.Sqrt(Math.Pow((p.First - lon) * Math.Cos(lat * Math.PI / 180), 2) + Math.Pow(p.Second - lat, 2)));
        Assert.True(nearest < 1, $"nearest coastline point {nearest:0.00}° from ({lon}, {lat})");
    }

    [Fact]
    public void No_drawn_segment_jumps_across_the_map()
    {
        foreach (double left in new[] { -180.0, 0.0 })
            foreach (var (x, _) in Coastlines.Wrapped(left))
                for (int i = 1; i < x.Length; i++)
                    Assert.True(Math.Abs(x[i] - x[i - 1]) < 30, $"a segment from {x[i - 1]} to {x[i]} with the map starting at {left}");
    }
}
