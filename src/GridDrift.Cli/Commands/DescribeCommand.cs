using System.CommandLine;
using GridDrift.Frames;
using GridDrift.Outputs.Description;
using GridDrift.Pipeline;
using GridDrift.Workflows;

namespace GridDrift.Cli.Commands;

/// <summary>`griddrift describe FILE... [--json]`: what a file or a multi-file record holds.</summary>
public static class DescribeCommand
{
    public static Command Build()
    {
        var files = new Argument<string[]>("FILE") { Description = "NetCDF files (classic, 64-bit offset, CDF-5 or netCDF-4) or globs", Arity = ArgumentArity.OneOrMore };
        var json = new Option<bool>("--json") { Description = "print the description as JSON on stdout" };
        var attributes = new Option<bool>("--attributes") { Description = "list every attribute as well" };
        var variable = new Option<string?>("--var") { Description = "the variable whose record several files form (default: the first gridded variable with a time axis)" };
        var command = new Command("describe", "Format, dimensions, variables, time span with calendar and step, grid kind and resolution, and gaps.\n\n" +
            "Examples:\n  griddrift describe cf-samples/tcwv_synthetic_2031.nc\n  griddrift describe 'era_2031_*.nc' --json")
        {
            files, json, attributes, variable,
        };
        command.SetAction(parse =>
        {
            var paths = InputPaths.Expand(parse.GetValue(files)!);
            var descriptions = paths.Select(DescribeStep.DescribeFile).ToList();
            var (record, problem) = paths.Count > 1 ? DescribeStep.DescribeRecord(paths, parse.GetValue(variable)) : (null, null);
            var output = parse.InvocationConfiguration.Output;
            if (parse.GetValue(json))
                output.WriteLine(DescriptionJson.Render(descriptions, record, problem));
            else
            {
                foreach (var d in descriptions) output.WriteLine(DescriptionText.Render(d, parse.GetValue(attributes)));
                if (record is not null) output.WriteLine(DescriptionText.Render(record));
                if (problem is not null) output.WriteLine($"no single record: {problem}");
            }
            return ExitCodes.Success;
        });
        return command;
    }
}
