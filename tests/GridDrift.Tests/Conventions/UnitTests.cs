using GridDrift.Conventions.Units;

namespace GridDrift.Tests.Conventions;

/// <summary>
/// Unit strings of CF files and their conversions, against the factors UDUNITS-2 defines (from
/// memory of its XML database; SI definitions, common practice): 1 hPa = 1 mbar = 100 Pa;
/// 1 g/kg = 0.001 kg kg-1; 0 °C = 273.15 K; °F = (K × 9/5) − 459.67; 1 % = 0.01; 1 inch = 0.0254 m;
/// 1 day = 86400 s.
/// </summary>
public class UnitTests
{
    [Theory]
    [InlineData("hPa", "Pa", 1013.25, 101325)]
    [InlineData("millibars", "hPa", 850, 850)]
    [InlineData("mb", "Pa", 1, 100)]
    [InlineData("g/kg", "kg kg-1", 12.5, 0.0125)]
    [InlineData("g kg**-1", "1", 3, 0.003)]
    [InlineData("degC", "K", 0, 273.15)]
    [InlineData("degC", "K", -40, 233.15)]
    [InlineData("K", "degF", 233.15, -40)]
    [InlineData("degF", "degC", 212, 100)]
    [InlineData("%", "1", 55, 0.55)]
    [InlineData("mm", "m", 25.4, 0.0254)]
    [InlineData("in", "mm", 1, 25.4)]
    [InlineData("kg m-2", "g m^-2", 1, 1000)]
    [InlineData("m**2 s**-2", "m2 s-2", 9.81, 9.81)]
    [InlineData("m^2/s^2", "J kg-1", 4, 4)]
    [InlineData("kg m-2 s-1", "kg m-2 day-1", 1, 86400)]
    [InlineData("kg.m-2", "kg/m^2", 7, 7)]
    public void Conversions_use_the_UDUNITS_factors(string from, string to, double value, double expected)
    {
        double actual = UnitConverter.Between(from, to).Convert(value);
        Assert.True(Math.Abs(actual - expected) <= 1e-12 * Math.Max(1, Math.Abs(expected)), $"{value} {from} → {to}: expected {expected}, got {actual:R}");
    }

    [Theory]
    [InlineData("K", "kg m-2")]
    [InlineData("hPa", "kg kg-1")]
    [InlineData("m s-1", "m s-2")]
    public void Incompatible_units_are_refused_naming_both_dimensions(string from, string to)
    {
        var e = Assert.Throws<FormatException>(() => UnitConverter.Between(from, to));
        Assert.Contains(from, e.Message);
        Assert.Contains(to, e.Message);
    }

    [Fact]
    public void An_unknown_unit_is_refused_by_name()
    {
        var e = Assert.Throws<FormatException>(() => UnitParser.Parse("furlongs fortnight-1"));
        Assert.Contains("furlongs", e.Message);
    }
}
