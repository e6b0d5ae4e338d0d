using System.Globalization;

namespace GridDrift.Conventions.Units;

/// <summary>
/// A physical unit as UDUNITS-2 (the library CF names for unit strings) models it: a scale and
/// an offset on a product of base units with integer powers — x_SI = scale · x + offset. Base
/// units: kilogram, metre, second, kelvin, mole; "1" and "%" are dimensionless. Parsed from CF
/// strings such as "K", "degC", "kg kg-1", "g/kg", "1", "%", "Pa", "hPa", "millibars", "mm",
/// "kg m-2", "m**2 s**-2", "m2 s-2", "m^2/s^2".
/// </summary>
internal sealed record Unit(double Scale, double Offset, int Kilogram, int Metre, int Second, int Kelvin, int Mole, string Text)
{
    public bool SameDimension(Unit other) =>
        Kilogram == other.Kilogram && Metre == other.Metre && Second == other.Second && Kelvin == other.Kelvin && Mole == other.Mole;

    public string Dimension()
    {
        var parts = new List<string>();
        void Add(string name, int power) { if (power != 0) parts.Add(power == 1 ? name : $"{name}{power.ToString(CultureInfo.InvariantCulture)}"); }
        Add("kg", Kilogram); Add("m", Metre); Add("s", Second); Add("K", Kelvin); Add("mol", Mole);
        return parts.Count == 0 ? "1" : string.Join(" ", parts);
    }

    public static Unit operator *(Unit a, Unit b)
    {
        if (a.Offset != 0 || b.Offset != 0) throw new FormatException($"'{a.Text}' and '{b.Text}': a unit with an offset (like degC) cannot be multiplied");
        return new Unit(a.Scale * b.Scale, 0, a.Kilogram + b.Kilogram, a.Metre + b.Metre, a.Second + b.Second, a.Kelvin + b.Kelvin, a.Mole + b.Mole, $"{a.Text} {b.Text}");
    }

    public Unit Power(int p)
    {
        if (p == 1) return this;
        if (Offset != 0) throw new FormatException($"'{Text}': a unit with an offset cannot be raised to a power");
        return new Unit(Math.Pow(Scale, p), 0, Kilogram * p, Metre * p, Second * p, Kelvin * p, Mole * p, $"{Text}^{p}");
    }
}
