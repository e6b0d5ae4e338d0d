namespace GridDrift.Regions;

/// <summary>
/// The one rule for when a region's value is kept: some of its area holds data, and at least the
/// minimum fraction of it does (NaN fractions are not kept).
/// </summary>
internal static class ValidFraction
{
    public static bool Keeps(double valid, double minValid) => valid > 0 && valid >= minValid;

    /// <summary>Valid area ÷ region area, clamped to [0, 1]: summing cell areas in another order can overshoot 1 by a few ulps.</summary>
    public static double Of(double validArea, double regionArea) => regionArea > 0 ? Math.Clamp(validArea / regionArea, 0, 1) : double.NaN;

    /// <summary>Refuses a minimum outside [0, 1], naming the option.</summary>
    public static double Check(double minValid, string option = "--min-valid") =>
        minValid is >= 0 and <= 1 ? minValid : throw new BadInputException(null, null, $"{option} {minValid}: choose a fraction from 0 to 1");
}
