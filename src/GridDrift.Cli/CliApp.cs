using System.CommandLine;
using GridDrift.Cli.Commands;

namespace GridDrift.Cli;

/// <summary>The whole command line: parse, run one command, map failures to exit codes and one line on stderr.</summary>
public static class CliApp
{
    public const string Caution =
        "GridDrift is an analysis tool, not a warning or forecasting service: for decisions on floods and droughts, consult the responsible meteorological service.";

    public static RootCommand BuildRoot(string[]? args = null)
    {
        var root = new RootCommand(
            "GridDrift finds whether and where the large-scale moisture pattern of gridded water-vapour records changed.\n" + Caution);
        root.Subcommands.Add(DescribeCommand.Build());
        root.Subcommands.Add(RegionsCommand.Build(args ?? []));
        root.Subcommands.Add(StatsCommand.Build(args ?? []));
        root.Subcommands.Add(SimilarityCommand.Build(args ?? []));
        root.Subcommands.Add(ClimatologyCommand.Build(args ?? []));
        root.Subcommands.Add(AnomaliesCommand.Build(args ?? []));
        root.Subcommands.Add(EventsCommand.Build(args ?? []));
        root.Subcommands.Add(AttributeCommand.Build(args ?? []));
        root.Subcommands.Add(RegridCommand.Build(args ?? []));
        root.Subcommands.Add(DeriveCommand.Build(args ?? []));
        root.Subcommands.Add(RunCommands.Run(args ?? []));
        root.Subcommands.Add(RunCommands.Gather(args ?? []));
        root.Subcommands.Add(RunCommands.Submit(args ?? []));
        root.Subcommands.Add(RunCommands.Demo(args ?? []));
        root.Subcommands.Add(CompletionCommand.Build());
        return root;
    }

    public static int Run(string[] args, TextWriter output, TextWriter error)
    {
        // @LIST is a list of input files for GridDrift (paths relative to the list), not System.CommandLine's response file
        var parse = BuildRoot(args).Parse(args, new ParserConfiguration { ResponseFileTokenReplacer = null });
        // [suggest:N] is System.CommandLine's completion directive, which the shell scripts of `griddrift completion` call
        bool asksForHelpOrVersion = args.Any(a => a is "--help" or "-h" or "-?" or "--version") || args is [['[', 's', 'u', 'g', ..], ..];
        if (!asksForHelpOrVersion && UsageErrors.Of(parse) is { Count: > 0 } usage)
        {
            string name = parse.CommandResult.Command is RootCommand ? "griddrift" : "griddrift " + parse.CommandResult.Command.Name;
            foreach (var line in usage) error.WriteLine($"{name}: {Terminal.Safe(line)}");
            return ExitCodes.Usage;
        }
        try
        {
            return parse.Invoke(new InvocationConfiguration { EnableDefaultExceptionHandler = false, Output = output, Error = error });
        }
        catch (AggregateException e) when (e.InnerExceptions.Count == 1 && e.InnerException is BadInputException bad)
        {
            error.WriteLine($"griddrift: {Terminal.Safe(bad.Message)}");
            return ExitCodes.BadInput;
        }
        catch (BadInputException e)
        {
            error.WriteLine($"griddrift: {Terminal.Safe(e.Message)}");
            return ExitCodes.BadInput;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // a folder that cannot be written, a full disk: the environment's fault, told in one line like bad input
            error.WriteLine($"griddrift: cannot write or read a file: {Terminal.Safe(e.Message)}");
            return ExitCodes.BadInput;
        }
        catch (Exception e) when (e is not OperationCanceledException)
        {
            error.WriteLine($"griddrift: internal fault ({e.GetType().Name}): {Terminal.Safe(e.Message)}. Please report it with the command that caused it.");
            if (Environment.GetEnvironmentVariable("GRIDDRIFT_TRACE") == "1") error.WriteLine(e);
            return ExitCodes.InternalFault;
        }
    }
}
