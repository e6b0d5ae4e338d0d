using System.Text.RegularExpressions;

namespace GridDrift.Frames;

/// <summary>
/// Expands file names, globs (* ? [..] in the file-name part) and @LIST (a text file of paths or
/// globs, one a line, relative to the list's folder; blank lines and # comments skipped: for
/// archives of one file per image, too many for a command line) into a list of paths.
/// </summary>
internal static class InputPaths
{
    public static IReadOnlyList<string> Expand(IEnumerable<string> patterns)
    {
        var result = new List<string>();
        foreach (var pattern in patterns)
        {
            if (pattern.StartsWith('@') && pattern.Length > 1)
            {
                result.AddRange(Expand(Listed(pattern[1..])));
                continue;
            }
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

    static IEnumerable<string> Listed(string list)
    {
        if (!File.Exists(list)) throw new BadInputException(list, null, "no such list of files (@LIST names a text file of paths, one a line)");
        string folder = Path.GetDirectoryName(Path.GetFullPath(list))!;
        foreach (var raw in File.ReadLines(list))
        {
            string line = raw.Trim();
            if (line.Length == 0 || line.StartsWith('#')) continue;
            if (line.StartsWith('@')) throw new BadInputException(list, null, $"'{line}': a list cannot name another list");
            yield return Path.IsPathRooted(line) ? line : Path.Combine(folder, line);
        }
    }
}
