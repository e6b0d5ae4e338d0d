using System.Text;

namespace GridDrift.Outputs.Description;

/// <summary>
/// Text from files made safe for a terminal and for a one-line message: control characters
/// (line breaks, carriage returns, bells, escape sequences) written as C-style escapes, so a
/// file's attribute can neither span lines nor drive the terminal.
/// </summary>
internal static class Printable
{
    public static string OneLine(string text)
    {
        if (!text.Any(char.IsControl)) return text;
        var b = new StringBuilder(text.Length + 8);
        foreach (char c in text)
            b.Append(c switch
            {
                '\n' => "\\n",
                '\r' => "\\r",
                '\t' => "\\t",
                _ when char.IsControl(c) => c <= 0xff ? $"\\x{(int)c:x2}" : $"\\u{(int)c:x4}",
                _ => c.ToString(),
            });
        return b.ToString();
    }
}
