using GridDrift.Tests.Support;

namespace GridDrift.Tests.Docs;

/// <summary>
/// docs/reading-products.md: the page's command makes the products, and its python block marked
/// "run: python3" runs with Debian's python netCDF4 on them, printing the regions GridDrift was
/// asked for and the command attribute, which runs as written.
/// </summary>
public class ReadingProductsTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void The_python_example_reads_the_products_of_the_example_command()
    {
        using var dir = new TempFolder();
        Directory.CreateSymbolicLink(dir.File("cf-samples"), Path.Combine(SharedData.Repository, "cf-samples"));
        string page = File.ReadAllText(Path.Combine(SharedData.Repository, "docs", "reading-products.md"));
        string command = System.Text.RegularExpressions.Regex.Match(page, "```sh\n(griddrift [^\n]*)\n```").Groups[1].Value;
        string python = System.Text.RegularExpressions.Regex.Match(page, "<!-- run: python3 -->\n```python\n(.*?)```", System.Text.RegularExpressions.RegexOptions.Singleline).Groups[1].Value;
        Assert.NotEqual("", command);
        Assert.NotEqual("", python);
        File.WriteAllText(dir.File("make.sh"), $"set -eu\nexport PATH=\"{AppContext.BaseDirectory.TrimEnd('/')}:$PATH\"\n{command}\n");
        var made = ExternalTools.Run("bash", "make.sh", workingDirectory: dir.Path);
        Assert.True(made.ExitCode == 0, made.Stderr);
        File.WriteAllText(dir.File("read.py"), python);
        var read = ExternalTools.Run(ExternalTools.Python, "read.py", workingDirectory: dir.Path);
        Assert.True(read.ExitCode == 0, read.Stderr);
        Assert.Contains("48 times, regions ['global', 'band_s90_s60'", read.Stdout);
        Assert.Contains("global mean tcwv: ", read.Stdout);

        // the command attribute, run by bash as written, makes the same product again
        string madeBy = read.Stdout.Split('\n').Single(l => l.StartsWith("made by: ", StringComparison.Ordinal))["made by: ".Length..];
        File.Delete(dir.File("s.nc"));
        File.WriteAllText(dir.File("again.sh"), $"set -eu\nexport PATH=\"{AppContext.BaseDirectory.TrimEnd('/')}:$PATH\"\n{madeBy}\n");
        var again = ExternalTools.Run("bash", "again.sh", workingDirectory: dir.Path);
        Assert.True(again.ExitCode == 0, $"{madeBy}: {again.Stderr}");
        Assert.True(File.Exists(dir.File("s.nc")));
    }
}
