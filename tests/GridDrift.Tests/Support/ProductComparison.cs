using GridDrift.Formats;

namespace GridDrift.Tests.Support;

/// <summary>Two products with the same numeric variables holding the same values (NaN where the other has NaN).</summary>
public static class ProductComparison
{
    public static void AssertSameValues(string expected, string actual, double tolerance = 0)
    {
        using var a = DatasetFiles.Open(expected);
        using var b = DatasetFiles.Open(actual);
        foreach (var v in a.Variables.Where(v => NcTypes.IsNumeric(v.Type)))
        {
            var x = a.ReadAllDoubles(v);
            var y = b.ReadAllDoubles(b.RequireVariable(v.Name));
            Assert.Equal(x.Length, y.Length);
            for (int i = 0; i < x.Length; i++)
                Assert.True(x[i].Equals(y[i]) || Math.Abs(x[i] - y[i]) <= tolerance * Math.Max(1, Math.Abs(x[i])),
                    $"{Path.GetFileName(actual)} {v.Name}[{i}]: {y[i]} against {x[i]} in {Path.GetFileName(expected)}");
        }
    }
}
