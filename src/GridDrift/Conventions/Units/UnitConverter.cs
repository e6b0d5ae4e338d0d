namespace GridDrift.Conventions.Units;

/// <summary>Converts values between two units of the same dimension: x_to = (scale_from · x + offset_from − offset_to) / scale_to.</summary>
internal sealed class UnitConverter
{
    public Unit From { get; }
    public Unit To { get; }
    public double Scale { get; }
    public double Offset { get; }

    public UnitConverter(Unit from, Unit to)
    {
        if (!from.SameDimension(to))
            throw new FormatException($"'{from.Text}' ({from.Dimension()}) cannot be converted to '{to.Text}' ({to.Dimension()})");
        From = from;
        To = to;
        Scale = from.Scale / to.Scale;
        Offset = (from.Offset - to.Offset) / to.Scale;
    }

    public static UnitConverter Between(string from, string to) => new(UnitParser.Parse(from), UnitParser.Parse(to));

    public double Convert(double x) => Scale * x + Offset;

    public void Convert(Span<float> values)
    {
        for (int i = 0; i < values.Length; i++) values[i] = (float)(Scale * values[i] + Offset);
    }
}
