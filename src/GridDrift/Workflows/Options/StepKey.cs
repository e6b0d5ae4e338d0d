namespace GridDrift.Workflows.Options;

/// <summary>
/// One option of a command, as both front doors know it: the command line's `--NAME` and the
/// recipe's `NAME = …` in the command's table, with one description, one default and one
/// check. The check throws FormatException saying what is allowed.
/// </summary>
internal abstract class StepKey(string name, string description)
{
    public string Name { get; } = name;
    public string Description { get; } = description;

    /// <summary>Checks a value as a recipe holds it (text, number, list of text or true/false) and gives it in the option's own type.</summary>
    public abstract object FromRecipe(object value);
}

/// <inheritdoc />
internal sealed class StepKey<T>(string name, string description, T defaultValue, Action<T>? check = null) : StepKey(name, description)
{
    public T Default { get; } = defaultValue;

    public void Check(T value) => check?.Invoke(value);

    public override object FromRecipe(object value)
    {
        T typed = value switch
        {
            T same => same,
            double d when typeof(T) == typeof(int) => d == Math.Floor(d) && Math.Abs(d) <= int.MaxValue
                ? (T)(object)(int)d : throw new FormatException("should be a whole number"),
            string[] list when typeof(T) == typeof(string) => (T)(object)string.Join(",", list),
            string text when typeof(T) == typeof(string[]) => (T)(object)new[] { text },
            _ => throw new FormatException(typeof(T) == typeof(double) || typeof(T) == typeof(int) ? "should be a number"
                : typeof(T) == typeof(bool) ? "should be true or false"
                : typeof(T) == typeof(string[]) ? "should be a list of text" : "should be text in quotes"),
        };
        Check(typed);
        return typed!;
    }
}

/// <summary>Checks the keys share.</summary>
internal static class KeyChecks
{
    public static Action<double> Between(double low, double high) => v =>
    {
        if (!(v >= low && v <= high)) throw new FormatException($"choose a value from {low:G} to {high:G}");
    };

    public static Action<double> Positive() => v =>
    {
        if (!(v > 0) || double.IsInfinity(v)) throw new FormatException("must be a positive number");
    };

    public static Action<int> AtLeast(int low) => v =>
    {
        if (v < low) throw new FormatException($"must be at least {low}");
    };

    public static Action<int> Between(int low, int high) => v =>
    {
        if (v < low || v > high) throw new FormatException($"choose {low} to {high}");
    };

    /// <summary>A comma-separated list whose every item <paramref name="parse"/> accepts.</summary>
    public static Action<string?> ListOf<TItem>(Func<string, TItem> parse) => text =>
    {
        if (text is null) return;
        var items = text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        if (items.Length == 0) throw new FormatException("give at least one value");
        foreach (var item in items) parse(item);
    };

    /// <summary>One of a fixed set of words.</summary>
    public static Action<string?> OneOf(params string[] words) => v =>
    {
        if (v is not null && !words.Contains(v)) throw new FormatException($"choose {(words.Length == 1 ? words[0] : string.Join(", ", words[..^1]) + " or " + words[^1])}");
    };

    public static Action<string?> Accepts(Action<string> parse) => v =>
    {
        if (v is not null) parse(v);
    };
}
