using Spectre.Console;

namespace GridDrift.Cli;

/// <summary>
/// A progress bar on stderr for long steps, drawn only when stderr is a terminal and the command
/// is not --quiet (data never go to stderr, and logs stay clean). Spectre.Console honours NO_COLOR.
/// </summary>
internal static class ProgressDisplay
{
    public static T Run<T>(TextWriter error, bool quiet, string label, Func<IProgress<(int Done, int Total)>?, T> work)
    {
        if (quiet || !ReferenceEquals(error, Console.Error) || Console.IsErrorRedirected) return work(null);
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(Console.Error) });
        T result = default!;
        console.Progress().AutoClear(true).HideCompleted(true)
            .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new RemainingTimeColumn())
            .Start(context =>
            {
                var task = context.AddTask(label);
                result = work(new Reporter(task));
                task.StopTask();
            });
        return result;
    }

    /// <summary>Sets the bar directly: Progress&lt;T&gt; would post updates late, after the work is done.</summary>
    sealed class Reporter(ProgressTask task) : IProgress<(int Done, int Total)>
    {
        public void Report((int Done, int Total) value)
        {
            task.MaxValue = Math.Max(1, value.Total);
            task.Value = value.Done;
        }
    }
}
