namespace GridDrift.Tests.Support;

/// <summary>Invented pairs of fields for the similarity checks, and the raw files the reference scripts read.</summary>
internal static class FieldPairs
{
    /// <summary>a = smooth + noiseA·(u − ½), b = smooth + change + noiseB·(u − ½), u uniform, row-major.</summary>
    public static (float[] A, float[] B) Make(int rows, int columns, int seed, Func<int, int, double> smooth, Func<int, int, double> change, double noiseA, double noiseB)
    {
        var rng = new Random(seed);
        var a = new float[rows * columns];
        var b = new float[rows * columns];
        for (int j = 0; j < rows; j++)
            for (int i = 0; i < columns; i++)
            {
                double s = smooth(j, i);
                a[j * columns + i] = (float)(s + noiseA * (rng.NextDouble() - 0.5));
                b[j * columns + i] = (float)(s + change(j, i) + noiseB * (rng.NextDouble() - 0.5));
            }
        return (a, b);
    }

    /// <summary>Writes the values as little-endian float64, as the reference scripts read them.</summary>
    public static string Bin(TempFolder dir, string name, IEnumerable<double> values)
    {
        string path = dir.File(name);
        File.WriteAllBytes(path, values.SelectMany(BitConverter.GetBytes).ToArray());
        return path;
    }
}
