using System.CommandLine;
using System.CommandLine.Parsing;

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
        foreach (var token in parse.Tokens)
            if (token.Type == TokenType.Argument && token.Value.StartsWith("--", StringComparison.Ordinal) && token.Value.Length > 2
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
        var nearest = known.Select(k => (Name: k, Distance: Distance(token, k))).OrderBy(x => x.Distance).FirstOrDefault();
        string hint = nearest.Name is not null && nearest.Distance <= Math.Max(2, token.Length / 3) ? $" (did you mean {nearest.Name}?)" : "";
        return $"{what} '{token}'{hint}; 'griddrift {(command is RootCommand ? "" : command.Name + " ")}--help' lists them";
    }

    /// <summary>Optimal string alignment distance: insertions, deletions, substitutions and swaps of neighbours each cost one.</summary>
    internal static int Distance(string a, string b)
    {
        var d = new int[a.Length + 1, b.Length + 1];
        for (int i = 0; i <= a.Length; i++) d[i, 0] = i;
        for (int j = 0; j <= b.Length; j++) d[0, j] = j;
        for (int i = 1; i <= a.Length; i++)
            for (int j = 1; j <= b.Length; j++)
            {
                int cost = a[i - 1] == b[j - 1] ? 0 : 1;
                d[i, j] = Math.Min(Math.Min(d[i - 1, j] + 1, d[i, j - 1] + 1), d[i - 1, j - 1] + cost);
                if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) d[i, j] = Math.Min(d[i, j], d[i - 2, j - 2] + 1);
            }
        return d[a.Length, b.Length];
    }
}
