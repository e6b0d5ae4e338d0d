using System.Globalization;
using System.Text.RegularExpressions;

namespace GridDrift.Conventions.Units;

/// <summary>
/// Parses the unit strings CF files use, following UDUNITS-2's grammar for the common cases:
/// terms separated by spaces, '*' or '.', divided by '/', each a (prefixed) unit name or symbol
/// with an optional integer power written 2, -2, ^2 or **2. Factors are the SI and UDUNITS-2
/// definitions (common practice: 1 bar = 10⁵ Pa, 1 inch = 0.0254 m, 0 °C = 273.15 K,
/// 1 °F = 5/9 K with 0 °F = 459.67 °R).
/// </summary>
internal static partial class UnitParser
{
    static readonly Unit One = new(1, 0, 0, 0, 0, 0, 0, "1");

    static Unit U(double scale, int kg = 0, int m = 0, int s = 0, int k = 0, int mol = 0, double offset = 0, string text = "") => new(scale, offset, kg, m, s, k, mol, text);

    static readonly Dictionary<string, Unit> Named = new()
    {
        ["1"] = One, ["%"] = U(0.01), ["percent"] = U(0.01), ["ppm"] = U(1e-6), ["ppmv"] = U(1e-6),
        ["g"] = U(1e-3, kg: 1), ["gram"] = U(1e-3, kg: 1), ["grams"] = U(1e-3, kg: 1), ["kilogram"] = U(1, kg: 1), ["kilograms"] = U(1, kg: 1),
        ["m"] = U(1, m: 1), ["meter"] = U(1, m: 1), ["meters"] = U(1, m: 1), ["metre"] = U(1, m: 1), ["metres"] = U(1, m: 1),
        ["in"] = U(0.0254, m: 1), ["inch"] = U(0.0254, m: 1), ["inches"] = U(0.0254, m: 1),
        ["s"] = U(1, s: 1), ["sec"] = U(1, s: 1), ["second"] = U(1, s: 1), ["seconds"] = U(1, s: 1),
        ["min"] = U(60, s: 1), ["minute"] = U(60, s: 1), ["minutes"] = U(60, s: 1),
        ["h"] = U(3600, s: 1), ["hr"] = U(3600, s: 1), ["hour"] = U(3600, s: 1), ["hours"] = U(3600, s: 1),
        ["d"] = U(86400, s: 1), ["day"] = U(86400, s: 1), ["days"] = U(86400, s: 1),
        ["K"] = U(1, k: 1), ["kelvin"] = U(1, k: 1), ["degK"] = U(1, k: 1), ["deg_K"] = U(1, k: 1),
        ["degC"] = U(1, k: 1, offset: 273.15), ["deg_C"] = U(1, k: 1, offset: 273.15), ["celsius"] = U(1, k: 1, offset: 273.15), ["Celsius"] = U(1, k: 1, offset: 273.15),
        ["degF"] = U(5.0 / 9, k: 1, offset: 459.67 * 5 / 9), ["deg_F"] = U(5.0 / 9, k: 1, offset: 459.67 * 5 / 9), ["fahrenheit"] = U(5.0 / 9, k: 1, offset: 459.67 * 5 / 9),
        ["mol"] = U(1, mol: 1), ["mole"] = U(1, mol: 1),
        ["Pa"] = U(1, kg: 1, m: -1, s: -2), ["pascal"] = U(1, kg: 1, m: -1, s: -2), ["pascals"] = U(1, kg: 1, m: -1, s: -2),
        ["bar"] = U(1e5, kg: 1, m: -1, s: -2), ["bars"] = U(1e5, kg: 1, m: -1, s: -2),
        ["mb"] = U(100, kg: 1, m: -1, s: -2), ["mbar"] = U(100, kg: 1, m: -1, s: -2), ["millibar"] = U(100, kg: 1, m: -1, s: -2), ["millibars"] = U(100, kg: 1, m: -1, s: -2),
        ["atm"] = U(101325, kg: 1, m: -1, s: -2),
        ["N"] = U(1, kg: 1, m: 1, s: -2), ["J"] = U(1, kg: 1, m: 2, s: -2), ["W"] = U(1, kg: 1, m: 2, s: -3),
    };

    static readonly (string Prefix, double Factor)[] Prefixes =
    [
        ("da", 1e1), ("h", 1e2), ("k", 1e3), ("M", 1e6), ("G", 1e9), ("d", 1e-1), ("c", 1e-2), ("m", 1e-3), ("u", 1e-6), ("µ", 1e-6), ("n", 1e-9),
        ("deca", 1e1), ("hecto", 1e2), ("kilo", 1e3), ("mega", 1e6), ("giga", 1e9), ("deci", 1e-1), ("centi", 1e-2), ("milli", 1e-3), ("micro", 1e-6), ("nano", 1e-9),
    ];

    public static Unit Parse(string text)
    {
        string t = text.Trim();
        if (t.Length == 0) return One with { Text = text };
        var sides = t.Split('/');
        var unit = Product(sides[0], text);
        foreach (var denominator in sides.Skip(1)) unit *= Product(denominator, text).Power(-1);
        return unit with { Text = text };
    }

    static Unit Product(string text, string whole)
    {
        var unit = One;
        bool first = true;
        foreach (var term in Split(text.Replace("**", "^")))
        {
            var t = Term(term, whole);
            unit = first ? t : unit * t;
            first = false;
        }
        return unit;
    }

    /// <summary>Terms are separated by spaces, '*', or '.' between letters ("kg.m-2").</summary>
    static IEnumerable<string> Split(string text)
    {
        var current = new System.Text.StringBuilder();
        for (int i = 0; i < text.Length; i++)
        {
            char c = text[i];
            bool dotBetweenLetters = c == '.' && i > 0 && i + 1 < text.Length && char.IsLetter(text[i - 1]) && char.IsLetter(text[i + 1]);
            if (char.IsWhiteSpace(c) || c == '*' || dotBetweenLetters)
            {
                if (current.Length > 0) yield return current.ToString();
                current.Clear();
            }
            else current.Append(c);
        }
        if (current.Length > 0) yield return current.ToString();
    }

    static Unit Term(string term, string whole)
    {
        if (double.TryParse(term, NumberStyles.Float, CultureInfo.InvariantCulture, out double number)) return U(number);
        var m = Power().Match(term);
        if (!m.Success) throw new FormatException($"'{whole}': cannot read '{term}'");
        int power = m.Groups["power"].Success ? int.Parse(m.Groups["power"].Value, CultureInfo.InvariantCulture) : 1;
        return Lookup(m.Groups["name"].Value, whole).Power(power);
    }

    static Unit Lookup(string name, string whole)
    {
        if (Named.TryGetValue(name, out var u)) return u with { Text = name };
        foreach (var (prefix, factor) in Prefixes.OrderByDescending(p => p.Prefix.Length))
            if (name.Length > prefix.Length && name.StartsWith(prefix, StringComparison.Ordinal) && Named.TryGetValue(name[prefix.Length..], out var b) && b.Offset == 0 && b != One)
                return b with { Scale = b.Scale * factor, Text = name };
        throw new FormatException($"'{whole}': '{name}' is not a unit GridDrift knows");
    }

    [GeneratedRegex(@"^(?<name>[A-Za-zµ%_]+)\^?(?<power>-?\d+)?$")]
    private static partial Regex Power();
}
