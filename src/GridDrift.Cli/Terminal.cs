using System.Text;

namespace GridDrift.Cli;

/// <summary>Text bound for the terminal: control characters (escape sequences, carriage returns, bells) shown as escapes, so one message stays one line.</summary>
internal static class Terminal
{
    public static string Safe(string text)
    {
        if (!text.Any(char.IsControl)) return text;
        var b = new StringBuilder(text.Length + 8);
        foreach (char c in text) b.Append(char.IsControl(c) ? $"\\u{(int)c:x4}" : c);
        return b.ToString();
    }
}
