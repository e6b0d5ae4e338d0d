using System.Text;

namespace GridDrift.Formats;

/// <summary>
/// Names a product may give its variables. The NetCDF data model refuses '/' and control
/// characters in names and wants them to begin with a letter, a digit or '_' (netCDF-C's name
/// check, NetCDF User Guide "Names"); an input variable may be named otherwise (HDF5 allows it), so
/// a name taken from the input is made safe before a product uses it.
/// </summary>
internal static class NcNames
{
    public static string Safe(string name)
    {
        var b = new StringBuilder(name.Length + 2);
        foreach (char c in name) b.Append(char.IsLetterOrDigit(c) || c is '_' or '.' or '@' or '+' or '-' ? c : '_');
        if (b.Length == 0 || !(char.IsLetterOrDigit(b[0]) || b[0] == '_')) b.Insert(0, "v_");
        return b.ToString();
    }
}
