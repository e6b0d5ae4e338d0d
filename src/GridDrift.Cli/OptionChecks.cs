using System.CommandLine;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli;

/// <summary>
/// Checks on the values of options that no recipe shares, made while parsing with the same checks
/// the shared keys use (<see cref="KeyChecks"/>): a value out of range or not in the list is a
/// usage error (exit 1) naming what is allowed, before any file is opened.
/// </summary>
internal static class OptionChecks
{
    public static Option<double> Positive(this Option<double> option) => option.Checked(KeyChecks.Positive());

    public static Option<int> Between(this Option<int> option, int low, int high) => option.Checked(KeyChecks.Between(low, high));

    public static Option<string> OneOf(this Option<string> option, params string[] words)
    {
        option.CompletionSources.Add(words); // tab completion offers the words
        return option.Checked<string>(v => KeyChecks.OneOf(words)(v));
    }

    /// <summary>A single value that <paramref name="parse"/> accepts (it throws FormatException with the reason otherwise).</summary>
    public static Option<T> Accepts<T>(this Option<T> option, Action<T> parse) => option.Checked<T>(v => { if (v is not null) parse(v); });

    /// <summary>A shared key's check, which decides itself what an absent value means.</summary>
    public static Option<T> CheckedBy<T>(this Option<T> option, Action<T> check) => option.Checked(check);

    static Option<T> Checked<T>(this Option<T> option, Action<T> check)
    {
        option.Validators.Add(r =>
        {
            var value = r.GetValueOrDefault<T>();
            try { check(value); }
            catch (FormatException e)
            {
                string shown = value is string[] list ? string.Join(" ", list) : value?.ToString() ?? "";
                r.AddError(e.Message.StartsWith(option.Name, StringComparison.Ordinal) ? e.Message : $"{option.Name} {shown}: {e.Message}");
            }
        });
        return option;
    }
}
