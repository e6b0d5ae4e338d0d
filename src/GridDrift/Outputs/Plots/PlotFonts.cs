namespace GridDrift.Outputs.Plots;

/// <summary>
/// ScottPlot draws no text at all unless a regular and a bold typeface are registered
/// explicitly: this finds a TrueType family on the machine (DejaVu Sans, Liberation Sans, Lato)
/// and registers both faces once. Without one, plots are refused with the package to install.
/// </summary>
internal static class PlotFonts
{
    static readonly object Gate = new();
    static string? _family;

    static readonly (string Family, string Regular, string Bold)[] Candidates =
    [
        ("DejaVu Sans", "dejavu/DejaVuSans.ttf", "dejavu/DejaVuSans-Bold.ttf"),
        ("Liberation Sans", "liberation2/LiberationSans-Regular.ttf", "liberation2/LiberationSans-Bold.ttf"),
        ("Liberation Sans", "liberation/LiberationSans-Regular.ttf", "liberation/LiberationSans-Bold.ttf"),
        ("Lato", "lato/Lato-Regular.ttf", "lato/Lato-Bold.ttf"),
    ];

    public static string Ensure()
    {
        lock (Gate)
        {
            if (_family is not null) return _family;
            var roots = new[] { GridDriftSettings.Current.FontFolder, "/usr/share/fonts/truetype", "/usr/local/share/fonts", "/Library/Fonts", @"C:\Windows\Fonts" };
            foreach (var root in roots.Where(r => !string.IsNullOrEmpty(r)))
                foreach (var (family, regular, bold) in Candidates)
                {
                    string r = Path.Combine(root!, regular), b = Path.Combine(root!, bold);
                    if (!File.Exists(r) || !File.Exists(b)) continue;
                    ScottPlot.Fonts.AddFontFile(family, r, bold: false, italic: false);
                    ScottPlot.Fonts.AddFontFile(family, b, bold: true, italic: false);
                    ScottPlot.Fonts.Default = family;
                    return _family = family;
                }
            throw new BadInputException(null, null,
                "no TrueType font for plot labels was found (install Debian's fonts-dejavu-core, or set GRIDDRIFT_FONT_DIR)");
        }
    }
}
