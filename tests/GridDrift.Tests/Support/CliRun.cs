using GridDrift.Cli;

namespace GridDrift.Tests.Support;

/// <summary>Runs the griddrift command line in-process, with a time limit so a hang fails the test.</summary>
public static class CliRun
{
    public sealed record Outcome(int ExitCode, string Stdout, string Stderr)
    {
        public string[] StderrLines => Stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries);
    }

    public static Outcome Run(params string[] args)
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        var task = Task.Run(() => CliApp.Run(args, stdout, stderr));
        if (!task.Wait(TimeSpan.FromSeconds(180))) throw new TimeoutException($"griddrift {string.Join(' ', args)} did not finish in 180 s");
        return new Outcome(task.Result, stdout.ToString(), stderr.ToString());
    }
}
