using System.CommandLine;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli;

/// <summary>A command's option made from its shared key: the recipe's key with two dashes, the same description, default and check.</summary>
internal static class KeyOptions
{
    public static Option<T> For<T>(StepKey<T> key, bool required = false)
    {
        var option = new Option<T>("--" + key.Name) { Description = key.Description, Required = required };
        if (!required) option.DefaultValueFactory = _ => key.Default;
        if (typeof(T) == typeof(string[])) option.AllowMultipleArgumentsPerToken = true;
        return option.CheckedBy(key.Check);
    }
}
