namespace GridDrift.Cli;

/// <summary>Text bound for the terminal: control characters shown as escapes, so one message stays one line.</summary>
internal static class Terminal
{
    public static string Safe(string text) => GridDrift.Outputs.Description.Printable.OneLine(text);
}
