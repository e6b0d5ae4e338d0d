namespace GridDrift;

/// <summary>
/// Bad input the user can act on: a missing, unreadable or malformed file, a missing variable,
/// inconsistent files. The CLI prints <see cref="Exception.Message"/> as one line and exits with 2.
/// </summary>
public sealed class BadInputException : Exception
{
    public string? File { get; }
    public string? Variable { get; }
    public string Fault { get; }

    public BadInputException(string? file, string? variable, string fault, Exception? inner = null)
        : base(Compose(file, variable, fault), inner)
    {
        File = file;
        Variable = variable;
        Fault = fault;
    }

    BadInputException(string file, string fault, string message) : base(message)
    {
        File = file;
        Fault = fault;
    }

    /// <summary>A fault of a recipe: its file, the line and the key (section.key), then the fault.</summary>
    public static BadInputException InRecipe(string path, int line, string key, string fault) =>
        new(path, fault, $"{path}: line {line}: {key}: {fault}");

    static string Compose(string? file, string? variable, string fault)
    {
        var parts = new List<string>(3);
        if (!string.IsNullOrEmpty(file)) parts.Add(file);
        if (!string.IsNullOrEmpty(variable)) parts.Add($"variable '{variable}'");
        parts.Add(fault);
        return string.Join(": ", parts);
    }
}

/// <summary>A broken invariant inside GridDrift itself (exit code 3): never the user's fault.</summary>
public sealed class InternalFaultException(string message, Exception? inner = null) : Exception(message, inner);
