using System.Numerics;

namespace GridDrift.Similarity;

/// <summary>How a filter sees beyond the edge of a row or column.</summary>
public enum Edge
{
    /// <summary>Half-sample symmetric (… c b a | a b c …), scipy.ndimage's 'reflect'.</summary>
    Reflect,
    /// <summary>Periodic: a global grid's longitude circle.</summary>
    Wrap,
}

/// <summary>
/// Separable filtering of row-major float64 fields: first along rows (x), then along columns
/// (y), each pass a straight SIMD loop over a padded copy, so the edge rule costs nothing inside
/// the loop. "Same" output keeps the size; "valid" output (MATLAB filter2's 'valid') drops the
/// border where the window leaves the field.
/// </summary>
public sealed class SeparableFilter
{
    readonly double[] _kernel;
    readonly int _radius;
    double[] _padded = [];
    double[] _rows = [];

    public SeparableFilter(double[] kernel)
    {
        _kernel = kernel;
        _radius = kernel.Length / 2;
    }

    public int Radius => _radius;

    /// <summary>Filters <paramref name="field"/> (rows × columns) into <paramref name="output"/> of the same size.</summary>
    public void Same(ReadOnlySpan<double> field, int rows, int columns, Edge xEdge, Edge yEdge, Span<double> output)
    {
        EnsureScratch(rows, columns);
        var horizontal = _rows.AsSpan(0, rows * columns);
        for (int j = 0; j < rows; j++) FilterRow(field.Slice(j * columns, columns), xEdge, horizontal.Slice(j * columns, columns));
        // vertical: output row j = Σ_k w_k · horizontal row (j + k − r), rows beyond the edge mirrored or wrapped
        for (int j = 0; j < rows; j++)
        {
            var target = output.Slice(j * columns, columns);
            target.Clear();
            for (int k = 0; k < _kernel.Length; k++)
            {
                int source = EdgeIndex(j + k - _radius, rows, yEdge);
                Axpy(_kernel[k], horizontal.Slice(source * columns, columns), target);
            }
        }
    }

    /// <summary>'valid' filtering: output has (rows − 2r) × (columns − 2r) values.</summary>
    public void Valid(ReadOnlySpan<double> field, int rows, int columns, Span<double> output)
    {
        int outRows = rows - 2 * _radius, outColumns = columns - 2 * _radius;
        if (outRows <= 0 || outColumns <= 0) return;
        EnsureScratch(rows, outColumns);
        var horizontal = _rows.AsSpan(0, rows * outColumns);
        for (int j = 0; j < rows; j++)
        {
            var target = horizontal.Slice(j * outColumns, outColumns);
            target.Clear();
            var row = field.Slice(j * columns, columns);
            for (int k = 0; k < _kernel.Length; k++) Axpy(_kernel[k], row.Slice(k, outColumns), target);
        }
        for (int j = 0; j < outRows; j++)
        {
            var target = output.Slice(j * outColumns, outColumns);
            target.Clear();
            for (int k = 0; k < _kernel.Length; k++) Axpy(_kernel[k], horizontal.Slice((j + k) * outColumns, outColumns), target);
        }
    }

    void FilterRow(ReadOnlySpan<double> row, Edge edge, Span<double> target)
    {
        int n = row.Length, r = _radius;
        var padded = _padded.AsSpan(0, n + 2 * r);
        row.CopyTo(padded.Slice(r, n));
        for (int i = 1; i <= r; i++)
        {
            padded[r - i] = row[EdgeIndex(-i, n, edge)];
            padded[r + n - 1 + i] = row[EdgeIndex(n - 1 + i, n, edge)];
        }
        target.Clear();
        for (int k = 0; k < _kernel.Length; k++) Axpy(_kernel[k], padded.Slice(k, n), target);
    }

    /// <summary>target += a · x, vectorised.</summary>
    static void Axpy(double a, ReadOnlySpan<double> x, Span<double> target)
    {
        int i = 0;
        if (Vector.IsHardwareAccelerated && x.Length >= Vector<double>.Count)
        {
            var va = new Vector<double>(a);
            var xs = System.Runtime.InteropServices.MemoryMarshal.Cast<double, Vector<double>>(x);
            var ts = System.Runtime.InteropServices.MemoryMarshal.Cast<double, Vector<double>>(target);
            for (int v = 0; v < xs.Length; v++) ts[v] += va * xs[v];
            i = xs.Length * Vector<double>.Count;
        }
        for (; i < x.Length; i++) target[i] += a * x[i];
    }

    /// <summary>Index of a position beyond the edge: mirrored half-sample symmetrically, or wrapped.</summary>
    public static int EdgeIndex(int i, int n, Edge edge)
    {
        if (edge == Edge.Wrap) return ((i % n) + n) % n;
        if (n == 1) return 0;
        int period = 2 * n;
        i = ((i % period) + period) % period;
        return i < n ? i : period - 1 - i;
    }

    void EnsureScratch(int rows, int columns)
    {
        if (_padded.Length < Math.Max(rows, columns) + 2 * _radius + 8) _padded = new double[Math.Max(rows, columns) + 2 * _radius + 8];
        if (_rows.Length < rows * columns) _rows = new double[rows * columns];
    }
}
