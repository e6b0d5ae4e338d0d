using System.Net;
using System.Text;

namespace GridDrift.Outputs.Report;

/// <summary>
/// A report as a list of blocks — headings, paragraphs, bullet lists, tables, figures — rendered
/// to Markdown (figures referenced by relative path) and to one self-contained HTML page (figures
/// embedded as data: URIs, so the page can be sent on alone).
/// </summary>
internal sealed class ReportDocument
{
    abstract record Block;
    sealed record Heading(int Level, string Text) : Block;
    sealed record Paragraph(string Text) : Block;
    sealed record Table(string[] Header, List<string[]> Rows) : Block;
    sealed record Figure(string Path, string Caption) : Block;
    sealed record Code(string Text) : Block;
    sealed record Bullets(List<string> Items) : Block;

    readonly List<Block> _blocks = [];

    public string Title { get; }
    public ReportDocument(string title) => Title = title;

    public void Section(string text, int level = 2) => _blocks.Add(new Heading(level, text));
    public void Text(string text) => _blocks.Add(new Paragraph(text));
    public void Verbatim(string text) => _blocks.Add(new Code(text));
    public void List(IEnumerable<string> items) => _blocks.Add(new Bullets(items.ToList()));

    /// <summary>Appends the blocks of <paramref name="other"/> (its title is not repeated).</summary>
    public void Append(ReportDocument other) => _blocks.AddRange(other._blocks);
    public void Image(string relativePath, string caption) => _blocks.Add(new Figure(relativePath, caption));
    public void Rows(string[] header, IEnumerable<string[]> rows) => _blocks.Add(new Table(header, rows.ToList()));

    public string ToMarkdown()
    {
        var sb = new StringBuilder($"# {Title}\n\n");
        foreach (var b in _blocks)
            switch (b)
            {
                case Heading h: sb.Append(new string('#', h.Level)).Append(' ').Append(h.Text).Append("\n\n"); break;
                case Paragraph p: sb.Append(p.Text).Append("\n\n"); break;
                case Code c: sb.Append("```\n").Append(c.Text.TrimEnd()).Append("\n```\n\n"); break;
                case Bullets l: foreach (var item in l.Items) sb.Append("- ").Append(item).Append('\n'); sb.Append('\n'); break;
                case Figure f: sb.Append($"![{f.Caption}]({f.Path})\n\n*{f.Caption}*\n\n"); break;
                case Table t:
                    sb.Append("| ").Append(string.Join(" | ", t.Header)).Append(" |\n|").Append(string.Concat(t.Header.Select(_ => "---|"))).Append('\n');
                    foreach (var r in t.Rows) sb.Append("| ").Append(string.Join(" | ", r.Select(c => c.Replace("|", "\\|")))).Append(" |\n");
                    sb.Append('\n');
                    break;
            }
        return sb.ToString();
    }

    /// <param name="folder">where the figures' relative paths start; their bytes are embedded</param>
    public string ToHtml(string folder)
    {
        static string E(string s) => WebUtility.HtmlEncode(s);
        var sb = new StringBuilder("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>").Append(E(Title)).Append("</title>\n<style>")
            .Append("body{font-family:sans-serif;max-width:70em;margin:2em auto;line-height:1.45}table{border-collapse:collapse}td,th{border:1px solid #bbb;padding:.25em .6em}")
            .Append("figure{margin:1em 0}img{max-width:100%}pre{background:#f4f4f4;padding:.8em;overflow-x:auto}.caution{border-left:4px solid #c60;padding:.5em 1em;background:#fff6ee}")
            .Append("</style></head><body>\n<h1>").Append(E(Title)).Append("</h1>\n");
        foreach (var b in _blocks)
            switch (b)
            {
                case Heading h: sb.Append($"<h{h.Level}>{E(h.Text)}</h{h.Level}>\n"); break;
                case Paragraph p: sb.Append(p.Text.StartsWith("**GridDrift is an analysis tool", StringComparison.Ordinal) ? "<p class=\"caution\">" : "<p>").Append(Inline(E(p.Text))).Append("</p>\n"); break;
                case Code c: sb.Append("<pre>").Append(E(c.Text.TrimEnd())).Append("</pre>\n"); break;
                case Figure f:
                    string file = Path.Combine(folder, f.Path);
                    string source = File.Exists(file) ? "data:image/png;base64," + Convert.ToBase64String(File.ReadAllBytes(file)) : E(f.Path);
                    sb.Append($"<figure><img src=\"{source}\" alt=\"{E(f.Caption)}\"><figcaption>{E(f.Caption)}</figcaption></figure>\n");
                    break;
                case Bullets l: sb.Append("<ul>").Append(string.Concat(l.Items.Select(i => $"<li>{Inline(E(i))}</li>"))).Append("</ul>\n"); break;
                case Table t:
                    sb.Append("<table><tr>").Append(string.Concat(t.Header.Select(h => $"<th>{E(h)}</th>"))).Append("</tr>\n");
                    foreach (var r in t.Rows) sb.Append("<tr>").Append(string.Concat(r.Select(c => $"<td>{Inline(E(c))}</td>"))).Append("</tr>\n");
                    sb.Append("</table>\n");
                    break;
            }
        return sb.Append("</body></html>\n").ToString();
    }

    /// <summary>**bold** and `code` of the Markdown text, in HTML.</summary>
    static string Inline(string html) =>
        System.Text.RegularExpressions.Regex.Replace(System.Text.RegularExpressions.Regex.Replace(html, @"\*\*(.+?)\*\*", "<strong>$1</strong>"), "`(.+?)`", "<code>$1</code>");

    /// <summary>Writes NAME.md and NAME.html, each under a temporary name first.</summary>
    public void Save(string stem)
    {
        string folder = Path.GetDirectoryName(Path.GetFullPath(stem))!;
        foreach (var (ext, text) in new[] { (".md", ToMarkdown()), (".html", ToHtml(folder)) })
        {
            string final = stem + ext, temp = Path.Combine(Path.GetDirectoryName(Path.GetFullPath(final))!, "." + Path.GetFileName(final) + ".part");
            File.WriteAllText(temp, text);
            File.Move(temp, final, overwrite: true);
        }
    }
}
