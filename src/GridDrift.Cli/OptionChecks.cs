using System.CommandLine;
using System.Globalization;

namespace GridDrift.Cli;

/// <summary>
/// Checks on option values made while parsing, so a value out of range or a word not in the list
/// is a usage error (exit 1) naming what is allowed, before any file is opened.
/// </summary>
internal static class OptionChecks
{
    public static Option<double> Between(this Option<double> option, double low, double high)
    {
        option.Validators.Add(r =>
        {
            double v = r.GetValueOrDefault<double>();
            if (!(v >= low && v <= high)) r.AddError($"{option.Name} {Text(v)}: choose a value from {Text(low)} to {Text(high)}");
        });
        return option;
    }

    public static Option<double> Positive(this Option<double> option)
    {
        option.Validators.Add(r =>
        {
            double v = r.GetValueOrDefault<double>();
            if (!(v > 0) || double.IsInfinity(v)) r.AddError($"{option.Name} {Text(v)}: must be a positive number");
        });
        return option;
    }

    public static Option<int> Between(this Option<int> option, int low, int high)
    {
        option.Validators.Add(r =>
        {
            int v = r.GetValueOrDefault<int>();
            if (v < low || v > high) r.AddError(high == int.MaxValue ? $"{option.Name} {v}: must be at least {low}" : $"{option.Name} {v}: choose {low} to {high}");
        });
        return option;
    }

    /// <summary>A comma-separated list whose every item <paramref name="parse"/> accepts (it throws FormatException with the reason otherwise).</summary>
    public static Option<string> ListOf<T>(this Option<string> option, Func<string, T> parse)
    {
        option.Validators.Add(r =>
        {
            string? text = r.GetValueOrDefault<string>();
            if (text is null) return;
            var items = text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            if (items.Length == 0) r.AddError($"{option.Name}: give at least one value");
            foreach (var item in items)
                try { parse(item); }
                catch (FormatException e) { r.AddError($"{option.Name} {item}: {e.Message}"); }
        });
        return option;
    }

    /// <summary>A single value that <paramref name="parse"/> accepts.</summary>
    public static Option<T> Accepts<T>(this Option<T> option, Action<T> parse)
    {
        option.Validators.Add(r =>
        {
            var value = r.GetValueOrDefault<T>();
            if (value is null) return;
            try { parse(value); }
            catch (FormatException e) { r.AddError(e.Message.StartsWith(option.Name, StringComparison.Ordinal) ? e.Message : $"{option.Name} {value}: {e.Message}"); }
        });
        return option;
    }

    /// <summary>One of a fixed set of words.</summary>
    public static Option<string> OneOf(this Option<string> option, params string[] words)
    {
        option.Validators.Add(r =>
        {
            string? v = r.GetValueOrDefault<string>();
            if (v is not null && !words.Contains(v)) r.AddError($"{option.Name} {v}: choose {Choices(words)}");
        });
        return option;
    }

    static string Choices(string[] words) => words.Length == 1 ? words[0] : string.Join(", ", words[..^1]) + " or " + words[^1];

    static string Text(double v) => v.ToString("G", CultureInfo.InvariantCulture);
}
