namespace GridDrift.Pipeline.Cluster;

/// <summary>
/// Text bound for a generated batch script: refused when it holds a control character (a line
/// break would end the #SBATCH or comment line and begin a shell command), and a directive's
/// value put in double quotes when it holds a space or a quote, which sbatch reads as one word.
/// </summary>
internal static class ScriptText
{
    public static void Check(string text, string what)
    {
        int at = text.AsSpan().IndexOfAnyInRange('\0', '\x1f');
        if (at < 0) at = text.AsSpan().IndexOfAnyInRange('\x7f', '\x9f');
        if (at >= 0)
            throw new BadInputException(null, null, $"{what} holds a control character (\\u{(int)text[at]:x4}), which a batch script cannot carry safely: {GridDrift.Outputs.Description.Printable.OneLine(text)}");
    }

    /// <summary>A directive (--name=value or a path) as one word for sbatch.</summary>
    public static string Directive(string text)
    {
        if (!text.Any(c => c is ' ' or '"' or '\'' or '\\')) return text;
        int eq = text.StartsWith("--", StringComparison.Ordinal) ? text.IndexOf('=') : -1;
        string name = eq < 0 ? "" : text[..(eq + 1)], value = eq < 0 ? text : text[(eq + 1)..];
        return name + "\"" + value.Replace("\\", "\\\\").Replace("\"", "\\\"") + "\"";
    }
}
