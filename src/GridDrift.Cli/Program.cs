using System.CommandLine;
using GridDrift;
using GridDrift.Cli;
using GridDrift.Cli.Commands;

var root = new RootCommand(
    "GridDrift: find whether and where the large-scale moisture pattern of gridded water-vapour records changed.\n" +
    "An analysis tool, not a warning or forecasting service: for decisions on floods and droughts, consult the responsible meteorological service.");
root.Subcommands.Add(DescribeCommand.Build());

var parse = root.Parse(args);
try
{
    return parse.Invoke(new InvocationConfiguration { EnableDefaultExceptionHandler = false });
}
catch (BadInputException e)
{
    Console.Error.WriteLine($"griddrift: {e.Message}");
    return ExitCodes.BadInput;
}
catch (Exception e) when (e is InternalFaultException or not OperationCanceledException)
{
    Console.Error.WriteLine($"griddrift: internal fault ({e.GetType().Name}): {e.Message}. Please report it with the command that caused it.");
    if (Environment.GetEnvironmentVariable("GRIDDRIFT_TRACE") == "1") Console.Error.WriteLine(e);
    return ExitCodes.InternalFault;
}
