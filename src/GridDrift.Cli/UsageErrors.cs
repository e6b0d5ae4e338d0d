using System.CommandLine;
using System.CommandLine.Parsing;
using GridDrift.Workflows.Options;

namespace GridDrift.Cli;

/// <summary>
/// What is wrong with a command line before anything runs: unknown or misspelled options (with
/// the nearest known one), a misspelled option taken for an input file, values out of range,
/// missing required options. Each becomes one line on stderr and exit code 1; the help text is
/// not printed.
/// </summary>
internal static class UsageErrors
{
    public static IReadOnlyList<string> Of(ParseResult parse)
    {
        var command = parse.CommandResult.Command;
        var known = KnownNames(command);
        var unknown = new List<string>();
        foreach (var token in parse.UnmatchedTokens) unknown.Add(Unknown(token, known, command));
        // an argument that takes any number of files also takes a misspelled option: one that names no file is refused
        // (only the command's own arguments: an option's value may begin with dashes, e.g. --sbatch-option=--qos=short)
        foreach (var token in parse.CommandResult.Children.OfType<ArgumentResult>().SelectMany(a => a.Tokens))
            if (token.Value.StartsWith("--", StringComparison.Ordinal) && token.Value.Length > 2
                && !File.Exists(token.Value) && !Directory.Exists(token.Value) && !parse.UnmatchedTokens.Contains(token.Value))
                unknown.Add(Unknown(token.Value, known, command));
        if (unknown.Count > 0) return unknown.Distinct().ToList();
        return parse.Errors.Select(e => e.Message).Distinct().ToList();
    }

    static List<string> KnownNames(Command command)
    {
        var names = new List<string>();
        foreach (var o in command.Options.Where(o => !o.Hidden))
        {
            names.Add(o.Name);
            names.AddRange(o.Aliases);
        }
        foreach (var c in command.Subcommands) names.Add(c.Name);
        return names;
    }

    static string Unknown(string token, List<string> known, Command command)
    {
        string what = token.StartsWith('-') ? "unknown option" : "unexpected argument";
        string hint = NearestName.Of(token, known) is { } nearest ? $" (did you mean {nearest}?)" : "";
        return $"{what} '{token}'{hint}; 'griddrift {(command is RootCommand ? "" : command.Name + " ")}--help' lists them";
    }
}
