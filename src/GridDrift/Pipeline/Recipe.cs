using System.Security.Cryptography;
using System.Text;
using Tomlyn.Parsing;
using Tomlyn.Syntax;
using GridDrift.Results;

namespace GridDrift.Pipeline;

/// <summary>
/// A recipe: the whole chain in one TOML file. Tables: [input] (files, variable, regions, out)
/// and one table per step — [stats], [similarity], [climatology], [anomalies], [events],
/// [attribute], [report] — with the step's options. Paths are relative to the recipe's folder;
/// product names are relative to [input] out. Unknown tables and keys, wrong types and missing
/// keys are refused with the recipe's path, the line and the key.
/// </summary>
public sealed class Recipe
{
    public sealed record Value(object Data, int Line);

    public sealed class Section
    {
        public required string Name { get; init; }
        public required int Line { get; init; }
        public required Dictionary<string, Value> Keys { get; init; }
        /// <summary>The section's text as parsed, normalised: what its checkpoint fingerprint covers.</summary>
        public required string Canonical { get; init; }
    }

    public static readonly IReadOnlyDictionary<string, string[]> Allowed = new Dictionary<string, string[]>
    {
        ["input"] = ["files", "variable", "regions", "out"],
        ["stats"] = ["statistics", "min_valid", "out", "table"],
        ["similarity"] = ["metrics", "range", "lag", "min_valid", "out", "table"],
        ["climatology"] = ["by", "base", "smooth", "out"],
        ["anomalies"] = ["kind", "fields", "out", "table"],
        ["events"] = ["series", "quantity", "detect", "on", "window_days", "changepoints", "consensus", "min_segment", "out", "plots"],
        ["attribute"] = ["series", "target", "quantity", "periods", "profiles", "out", "plots"],
        ["report"] = ["title", "out", "truth"],
    };

    public required string Path { get; init; }
    public required string Folder { get; init; }
    public required IReadOnlyDictionary<string, Section> Sections { get; init; }

    public static Recipe Load(string path)
    {
        if (!File.Exists(path)) throw new BadInputException(path, null, "no such recipe file");
        string text = File.ReadAllText(path);
        var document = SyntaxParser.Parse(text, path, false);
        if (document.HasErrors)
        {
            var first = document.Diagnostics.First(d => d.Kind == DiagnosticMessageKind.Error);
            throw new BadInputException(path, null, $"line {first.Span.Start.Line + 1}: {first.Message}");
        }
        if (document.KeyValues.ChildrenCount > 0)
        {
            var kv = document.KeyValues.First();
            throw new BadInputException(path, KeyName(kv.Key), $"line {Line(kv)}: keys belong in a table such as [input]");
        }
        var sections = new Dictionary<string, Section>();
        foreach (var table in document.Tables)
        {
            string name = KeyName(table.Name);
            int line = table.Span.Start.Line + 1;
            if (table is TableArraySyntax || !Allowed.TryGetValue(name, out var allowed))
                throw new BadInputException(path, name, $"line {line}: unknown table [{name}] (known: {string.Join(", ", Allowed.Keys.Select(k => $"[{k}]"))})");
            if (sections.ContainsKey(name)) throw new BadInputException(path, name, $"line {line}: [{name}] appears twice");
            var keys = new Dictionary<string, Value>();
            var canonical = new StringBuilder();
            foreach (var kv in table.Items)
            {
                string key = KeyName(kv.Key);
                if (!allowed.Contains(key))
                    throw new BadInputException(path, $"{name}.{key}", $"line {Line(kv)}: unknown key (known in [{name}]: {string.Join(", ", allowed)})");
                keys[key] = new Value(Convert(path, name, key, kv.Value, Line(kv)), Line(kv));
                canonical.Append(key).Append('=').Append(kv.Value?.ToString()?.Trim()).Append('\n');
            }
            sections[name] = new Section { Name = name, Line = line, Keys = keys, Canonical = canonical.ToString() };
        }
        if (!sections.ContainsKey("input")) throw new BadInputException(path, "input", "line 1: the recipe needs an [input] table");
        return new Recipe { Path = System.IO.Path.GetFullPath(path), Folder = System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(path))!, Sections = sections };
    }

    static int Line(KeyValueSyntax kv) => kv.Span.Start.Line + 1;

    static string KeyName(KeySyntax? key) => (key?.ToString() ?? "").Trim().Trim('"');

    static object Convert(string path, string table, string key, ValueSyntax? value, int line) => value switch
    {
        StringValueSyntax s => s.Value ?? "",
        IntegerValueSyntax i => (double)i.Value,
        FloatValueSyntax f => f.Value,
        BooleanValueSyntax b => b.Value,
        ArraySyntax a => a.Items.Select(item => item.Value is StringValueSyntax s ? s.Value ?? ""
            : throw new BadInputException(path, $"{table}.{key}", $"line {line}: lists hold text only, e.g. [\"mean\", \"std\"]")).ToArray(),
        _ => throw new BadInputException(path, $"{table}.{key}", $"line {line}: a value of this kind is not used here"),
    };

    public bool Has(string section) => Sections.ContainsKey(section);

    public string Text(string section, string key, string? fallback = null)
    {
        var s = Sections[section];
        if (!s.Keys.TryGetValue(key, out var v))
            return fallback ?? throw new BadInputException(Path, $"{section}.{key}", $"line {s.Line}: [{section}] needs '{key}'");
        return v.Data as string ?? throw new BadInputException(Path, $"{section}.{key}", $"line {v.Line}: should be text in quotes");
    }

    public string? OptionalText(string section, string key) => Sections[section].Keys.ContainsKey(key) ? Text(section, key) : null;

    public string[] List(string section, string key, string[]? fallback = null)
    {
        var s = Sections[section];
        if (!s.Keys.TryGetValue(key, out var v))
            return fallback ?? throw new BadInputException(Path, $"{section}.{key}", $"line {s.Line}: [{section}] needs '{key}'");
        return v.Data as string[] ?? (v.Data is string one ? [one] : throw new BadInputException(Path, $"{section}.{key}", $"line {v.Line}: should be a list of text"));
    }

    public double Number(string section, string key, double fallback)
    {
        if (!Sections[section].Keys.TryGetValue(key, out var v)) return fallback;
        return v.Data is double d ? d : throw new BadInputException(Path, $"{section}.{key}", $"line {v.Line}: should be a number");
    }

    public bool Flag(string section, string key, bool fallback)
    {
        if (!Sections[section].Keys.TryGetValue(key, out var v)) return fallback;
        return v.Data is bool b ? b : throw new BadInputException(Path, $"{section}.{key}", $"line {v.Line}: should be true or false");
    }

    /// <summary>Fingerprint of a step: its own section, the [input] table it reads and the GridDrift version that ran it.</summary>
    public string Fingerprint(string section) =>
        System.Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(Provenance.Version + "\n" + Sections["input"].Canonical + "\n[" + section + "]\n" + Sections[section].Canonical)));
}
