using System.Text.RegularExpressions;

namespace GridDrift.Frames;

/// <summary>Expands file names and globs (* ? [..] in the file-name part) into a sorted list of paths.</summary>
internal static class InputPaths
{
    public static IReadOnlyList<string> Expand(IEnumerable<string> patterns)
    {
        var result = new List<string>();
        foreach (var pattern in patterns)
        {
            string name = Path.GetFileName(pattern);
            if (name.IndexOfAny(['*', '?', '[']) < 0)
            {
                result.Add(pattern);
                continue;
            }
            string dir = Path.GetDirectoryName(pattern) is { Length: > 0 } d ? d : ".";
            if (!Directory.Exists(dir)) throw new BadInputException(pattern, null, $"folder '{dir}' does not exist");
            var regex = new Regex("^" + Regex.Escape(name).Replace(@"\*", ".*").Replace(@"\?", ".").Replace(@"\[", "[") + "$");
            var matches = Directory.EnumerateFiles(dir)
                .Where(f => regex.IsMatch(Path.GetFileName(f)))
                .Select(f => dir == "." && !pattern.StartsWith("./") ? Path.GetFileName(f) : f)
                .Order(StringComparer.Ordinal)
                .ToList();
            if (matches.Count == 0) throw new BadInputException(pattern, null, "no files match this pattern");
            result.AddRange(matches);
        }
        return result.Distinct().ToList();
    }
}
