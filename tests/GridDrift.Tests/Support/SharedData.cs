namespace GridDrift.Tests.Support;

/// <summary>
/// The real files of ../shared (beside the checkout, and beside CI's clone). Tests read them in
/// place; they are never copied into the project.
/// </summary>
public static class SharedData
{
    /// <summary>The checkout: the folder holding GridDrift.sln above the test binaries.</summary>
    public static readonly string Repository = FindRepository();

    static string FindRepository()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "GridDrift.sln"))) return dir.FullName;
        throw new InvalidOperationException("GridDrift.sln not found above " + AppContext.BaseDirectory);
    }

    public static string Sample(string name) => Path.Combine(Repository, "cf-samples", name);

    static readonly Lazy<string?> RootLazy = new(() =>
    {
        if (Environment.GetEnvironmentVariable("GRIDDRIFT_SHARED") is { Length: > 0 } env && Directory.Exists(env)) return env;
        var shared = Path.Combine(Path.GetDirectoryName(Repository) ?? "", "shared");
        return Directory.Exists(shared) ? shared : null;
    });

    public static string? Root => RootLazy.Value;

    public static string Interop(string name) => Path.Combine(Root ?? throw new InvalidOperationException("../shared is absent"), "interop", "netcdf-c", name);
    public static string Reanalysis(string name) => Path.Combine(Root ?? throw new InvalidOperationException("../shared is absent"), "data", "reanalysis", name);

    public static IEnumerable<string> InteropFiles() =>
        Root is null ? [] : Directory.EnumerateFiles(Path.Combine(Root, "interop", "netcdf-c"), "*.nc").Order();
}
