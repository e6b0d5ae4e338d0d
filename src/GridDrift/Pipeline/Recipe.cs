using System.Security.Cryptography;
using System.Text;
using Tomlyn.Parsing;
using Tomlyn.Syntax;
using GridDrift.Results;
using GridDrift.Workflows.Options;

namespace GridDrift.Pipeline;

/// <summary>
/// A recipe: the whole chain in one TOML file. Tables: [input] (files, variable, regions, out)
/// and one table per step — [stats], [similarity], [climatology], [anomalies], [events],
/// [attribute], [report] — with the step's options. Paths are relative to the recipe's folder;
/// product names are relative to [input] out. Unknown tables and keys, wrong types and missing
/// keys are refused with the recipe's path, the line and the key.
/// </summary>
internal sealed class Recipe
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

    /// <summary>The keys of each table: [input] and [report] have their own; every step's are its command's options (Workflows/Options).</summary>
    public static readonly IReadOnlyDictionary<string, string[]> Allowed = new Dictionary<string, string[]>
    {
        ["input"] = ["files", "variable", "regions", "out", "period", "level", "at", RecipeRunner.WriteOutside],
        ["stats"] = Names(StatsKeys.All),
        ["similarity"] = Names(SimilarityKeys.All),
        ["climatology"] = Names(ClimatologyKeys.All),
        ["anomalies"] = Names(AnomaliesKeys.All),
        ["events"] = Names(EventsKeys.All),
        ["attribute"] = Names(AttributeKeys.All),
        ["report"] = ["title", "out", "truth"],
    };

    static string[] Names(IReadOnlyList<StepKey> keys) => keys.Select(k => k.Name).ToArray();

    /// <summary>Keys of earlier recipes, now spelled as the command line's options.</summary>
    static readonly IReadOnlyDictionary<string, string> Renamed = new Dictionary<string, string>
    {
        ["statistics"] = "stat", ["metrics"] = "metric", ["min_valid"] = "min-valid", ["window_days"] = "window", ["min_segment"] = "min-segment", ["plots"] = "plot",
    };

    public required string Path { get; init; }
    public required string Folder { get; init; }
    public required IReadOnlyDictionary<string, Section> Sections { get; init; }

    public static Recipe Load(string path)
    {
        if (!File.Exists(path)) throw new BadInputException(path, null, "no such recipe file");
        try { return Parse(path); }
        // what the TOML library refuses beyond its grammar (nesting deeper than it allows) is a fault of the recipe
        catch (Tomlyn.TomlException e) { throw new BadInputException(path, null, "not a recipe GridDrift can read: " + e.Message, e); }
    }

    static Recipe Parse(string path)
    {
        string text = File.ReadAllText(path);
        var document = SyntaxParser.Parse(text, path, false);
        if (document.HasErrors)
        {
            var first = document.Diagnostics.First(d => d.Kind == DiagnosticMessageKind.Error);
            throw BadInputException.InRecipe(path, first.Span.Start.Line + 1, "syntax", first.Message);
        }
        if (document.KeyValues.ChildrenCount > 0)
        {
            var kv = document.KeyValues.First();
            throw BadInputException.InRecipe(path, Line(kv), KeyName(kv.Key), "keys belong in a table such as [input]");
        }
        var sections = new Dictionary<string, Section>();
        foreach (var table in document.Tables)
        {
            string name = KeyName(table.Name);
            int line = table.Span.Start.Line + 1;
            if (table is TableArraySyntax || !Allowed.TryGetValue(name, out var allowed))
                throw BadInputException.InRecipe(path, line, $"[{name}]", "unknown table" + (NearestName.Of(name, Allowed.Keys) is { } near ? $" (did you mean [{near}]?)" : "") +
                    $"; known: {string.Join(", ", Allowed.Keys.Select(k => $"[{k}]"))}");
            if (sections.ContainsKey(name)) throw BadInputException.InRecipe(path, line, $"[{name}]", "the table appears twice");
            var keys = new Dictionary<string, Value>();
            var canonical = new StringBuilder();
            foreach (var kv in table.Items)
            {
                string key = KeyName(kv.Key);
                if (!allowed.Contains(key))
                    throw BadInputException.InRecipe(path, Line(kv), $"{name}.{key}", "unknown key" +
                        (Renamed.TryGetValue(key, out var now) && allowed.Contains(now) ? $" (now '{now}', as the command line's --{now})"
                            : NearestName.Of(key, allowed) is { } near ? $" (did you mean '{near}'?)" : "") +
                        $"; known in [{name}]: {string.Join(", ", allowed)}");
                keys[key] = new Value(Convert(path, name, key, kv.Value, Line(kv)), Line(kv));
                canonical.Append(key).Append('=').Append(kv.Value?.ToString()?.Trim()).Append('\n');
            }
            sections[name] = new Section { Name = name, Line = line, Keys = keys, Canonical = canonical.ToString() };
        }
        if (!sections.ContainsKey("input")) throw BadInputException.InRecipe(path, 1, "[input]", "the recipe needs an [input] table");
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
            : throw BadInputException.InRecipe(path, line, $"{table}.{key}", "lists hold text only, e.g. [\"mean\", \"std\"]")).ToArray(),
        _ => throw BadInputException.InRecipe(path, line, $"{table}.{key}", "a value of this kind is not used here"),
    };

    public bool Has(string section) => Sections.ContainsKey(section);

    /// <summary>A step's option: the key's default when absent, else the value checked as the command line checks it.</summary>
    public T Get<T>(string section, StepKey<T> key) => Checked(section, key) is { } value ? (T)value : key.Default;

    /// <summary>A key's value checked and in the key's own type, or null when the table does not give it; a fault names the line and key.</summary>
    public object? Checked(string section, StepKey key)
    {
        if (!Sections.TryGetValue(section, out var s) || !s.Keys.TryGetValue(key.Name, out var v)) return null;
        try { return key.FromRecipe(v.Data); }
        catch (FormatException e) { throw BadInputException.InRecipe(Path, v.Line, $"{section}.{key.Name}", e.Message); }
    }

    /// <summary>The line of a key, or of its table when the key is absent.</summary>
    public int LineOf(string section, string? key = null) =>
        key is not null && Sections[section].Keys.TryGetValue(key, out var v) ? v.Line : Sections[section].Line;

    public string Text(string section, string key, string? fallback = null)
    {
        var s = Sections[section];
        if (!s.Keys.TryGetValue(key, out var v))
            return fallback ?? throw BadInputException.InRecipe(Path, s.Line, $"{section}.{key}", $"[{section}] needs '{key}'");
        return v.Data as string ?? throw BadInputException.InRecipe(Path, v.Line, $"{section}.{key}", $"should be text in quotes");
    }

    public string? OptionalText(string section, string key) => Sections[section].Keys.ContainsKey(key) ? Text(section, key) : null;

    public string[] List(string section, string key, string[]? fallback = null)
    {
        var s = Sections[section];
        if (!s.Keys.TryGetValue(key, out var v))
            return fallback ?? throw BadInputException.InRecipe(Path, s.Line, $"{section}.{key}", $"[{section}] needs '{key}'");
        return v.Data as string[] ?? (v.Data is string one ? [one] : throw BadInputException.InRecipe(Path, v.Line, $"{section}.{key}", $"should be a list of text"));
    }

    public double Number(string section, string key, double fallback)
    {
        if (!Sections[section].Keys.TryGetValue(key, out var v)) return fallback;
        return v.Data is double d ? d : throw BadInputException.InRecipe(Path, v.Line, $"{section}.{key}", $"should be a number");
    }

    public bool Flag(string section, string key, bool fallback)
    {
        if (!Sections[section].Keys.TryGetValue(key, out var v)) return fallback;
        return v.Data is bool b ? b : throw BadInputException.InRecipe(Path, v.Line, $"{section}.{key}", $"should be true or false");
    }

    /// <summary>Fingerprint of a step: its own section, the [input] table it reads and the GridDrift version that ran it.</summary>
    public string Fingerprint(string section) =>
        System.Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(Provenance.Version + "\n" + Sections["input"].Canonical + "\n[" + section + "]\n" + Sections[section].Canonical)));
}
