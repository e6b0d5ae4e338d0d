using GridDrift.Operators.Physics;

namespace GridDrift.Tests.Operators.Physics;

/// <summary>
/// Moisture formulas against their published values and closed forms: Bolton's (1980) saturation
/// vapour pressure is 6.112 hPa at 0 °C and 23.37 hPa at 20 °C; air at its dew point is saturated
/// (100 % relative humidity, by definition); the column integral of a profile linear in pressure
/// equals its closed form (1/g)(a Δp + b Δ(p²)/2), g = 9.80665 m s-2.
/// </summary>
public class MoistureTests
{
    [Theory]
    [InlineData(273.15, 611.2)]
    [InlineData(293.15, 2337)]
    public void Bolton_saturation_vapour_pressure_matches_the_published_values(double kelvin, double pascal) =>
        Assert.True(Math.Abs(Moisture.SaturationVapourPressure(kelvin) - pascal) < 0.5, $"{kelvin} K: {Moisture.SaturationVapourPressure(kelvin):0.00} Pa, published {pascal} Pa");

    [Theory]
    [InlineData(280.0, 85000.0)]
    [InlineData(300.0, 100000.0)]
    [InlineData(260.0, 50000.0)]
    public void Air_at_its_dew_point_has_a_relative_humidity_of_100_percent(double dewPoint, double pressure)
    {
        double q = Moisture.SpecificHumidityFromDewPoint(dewPoint, pressure);
        Assert.Equal(100, Moisture.RelativeHumidity(q, dewPoint, pressure), 9);
    }

    [Fact]
    public void The_column_of_a_profile_linear_in_pressure_equals_its_closed_form()
    {
        // q(p) = a + b p, levels 100 … 1000 hPa, surface at 962.5 hPa (cutting the 925–1000 hPa layer)
        double a = -0.002, b = 1.8e-7, ps = 96250;
        double[] levels = [10000, 20000, 30000, 50000, 70000, 85000, 92500, 100000];
        var q = levels.Select(p => a + b * p).ToArray();
        double expected = (a * (ps - 10000) + b * (ps * ps - 10000.0 * 10000) / 2) / 9.80665;
        Assert.Equal(expected, Moisture.ColumnWaterVapour(levels, q, ps), 10);
        // levels below the surface are excluded: a surface at 850 hPa ignores the 925 and 1000 hPa values
        q[^1] = q[^2] = 99;
        Assert.Equal((a * (85000 - 10000) + b * (85000.0 * 85000 - 10000.0 * 10000) / 2) / 9.80665, Moisture.ColumnWaterVapour(levels, q, 85000), 10);
    }
}
