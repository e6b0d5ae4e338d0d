using System.Globalization;

namespace GridDrift.Outputs.Description;

/// <summary>A count with its noun in the right number: "1 region", "2 regions", "1.5 years".</summary>
public static class Counted
{
    public static string Of(long count, string singular, string? plural = null) =>
        count.ToString(CultureInfo.InvariantCulture) + " " + (count == 1 ? singular : plural ?? singular + "s");

    public static string Of(double count, string format, string singular, string? plural = null) =>
        count.ToString(format, CultureInfo.InvariantCulture) + " " + (count.ToString(format, CultureInfo.InvariantCulture) == "1" ? singular : plural ?? singular + "s");
}
