using System.Numerics;
using System.Numerics.Tensors;
using System.Runtime.Intrinsics;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// VIF's information terms cell by cell over a whole frame, in one pass per pair, so that every
/// region's VIF is a ratio of area-weighted sums of the same two maps. The algorithm is the
/// published one (Sheikh &amp; Bovik 2006, pixel-domain multi-scale: four scales, windows of
/// N = 2^(5−s) + 1 taps with σ = N/5, decimation by 2 after filtering from the second scale on,
/// σ²_N = 2, the released code's 1e−10 guards), with two changes that make it a field on the
/// sphere instead of a planar image: filtering is 'same'-size with the frame's own edges
/// (longitude wraps on a global grid; elsewhere, and down the columns, half-sample reflection,
/// as SSIM's windows), and the terms of scale s are placed on the cell (2^(s−1)·J, 2^(s−1)·I)
/// whose pyramid position they stand for. Then
/// num(cell) = Σ_s log₁₀(1 + g²σ₁²/(σᵥ² + σ²_N)) and den(cell) = Σ_s log₁₀(1 + σ₁²/σ²_N) over the
/// scales whose positions fall on the cell, and VIF(region) = Σ w·num / Σ w·den over the region's
/// cells with their areas w. With equal weights, on the whole of a planar image, this is the
/// published VIF except for the border the published 'valid' filters drop and the pyramid's
/// phase. Values are rescaled to 0–255 over the fixed data range (σ²_N assumes 8-bit grey
/// levels). Missing cells take each frame's mean before filtering and get no terms (NaN).
/// Filtered moments are float32 on values less their frame's mean, terms float32. The coarse
/// scales run first and their arguments are multiplied down the pyramid (a position of scale s
/// stands for the position 2J, 2I of scale s − 1), so one logarithm at the second scale's
/// positions and one per cell at the first replace a logarithm per scale, and the full-size maps
/// are written once instead of being revisited scale by scale. Three factors stay far inside
/// float32's range for any plausible field (each is at most 1 + σ²/σ²_N).
/// </summary>
internal sealed unsafe class VifField
{
    const int Scales = 4;
    const float SigmaNoise = 2, Guard = 1e-10f;
    readonly int _rows, _columns;
    readonly Edge _xEdge;
    readonly double _low, _scale;
    readonly int[] _levelRows = new int[Scales], _levelColumns = new int[Scales];
    readonly BandFilter[] _moments = new BandFilter[Scales];
    readonly BandFilter?[] _pyramid = new BandFilter?[Scales];
    readonly float[][] _levelX = new float[Scales][], _levelY = new float[Scales][];
    readonly float[] _numRow, _denRow;
    // scales 1 … 3: the product of each position's arguments with those of the coarser scales' positions it holds (logarithms at scale 1)
    readonly float[][] _numBelow = new float[Scales][], _denBelow = new float[Scales][];
    readonly BandFilter.RowSource[] _momentSources = new BandFilter.RowSource[Scales], _pyramidSources = new BandFilter.RowSource[Scales];
    readonly BandFilter.RowSink[] _momentSinks = new BandFilter.RowSink[Scales], _pyramidSinks = new BandFilter.RowSink[Scales];

    // the pair being processed (set by Terms, read by the row sources and sinks)
    float* _a, _b, _num, _den;
    float _shiftX, _shiftY;
    bool _complete;

    public VifField(int rows, int columns, bool periodicX, double rangeLow, double rangeHigh)
    {
        _rows = rows;
        _columns = columns;
        _xEdge = periodicX ? Edge.Wrap : Edge.Reflect;
        _low = rangeLow;
        _scale = 255 / (rangeHigh - rangeLow);
        int r = rows, c = columns;
        for (int s = 0; s < Scales; s++)
        {
            int n = (1 << (4 - s)) + 1;
            var kernel = GaussianKernel.WithRadius(n / 5.0, n / 2);
            if (s > 0)
            {
                _pyramid[s] = new BandFilter(kernel, 2, r, c, 2);
                r = (r + 1) / 2;
                c = (c + 1) / 2;
                _levelX[s] = new float[r * c];
                _levelY[s] = new float[r * c];
                // the products of a level take the place of its images: its moment filter has read
                // source row j into its ring before it emits output row j, and never reads it again
                _numBelow[s] = _levelX[s];
                _denBelow[s] = _levelY[s];
            }
            _levelRows[s] = r;
            _levelColumns[s] = c;
            _moments[s] = new BandFilter(kernel, 5, r, c, 1);
            int level = s;
            _momentSources[s] = (row, padded) => MomentRow(level, row, padded);
            _momentSinks[s] = (row, filtered) => TermsRow(level, row, filtered);
            if (s > 0)
            {
                _pyramidSources[s] = (row, padded) => PyramidRow(level - 1, row, padded);
                _pyramidSinks[s] = (row, filtered) =>
                {
                    filtered[0].AsSpan().CopyTo(_levelX[level].AsSpan(row * _levelColumns[level], _levelColumns[level]));
                    filtered[1].AsSpan().CopyTo(_levelY[level].AsSpan(row * _levelColumns[level], _levelColumns[level]));
                };
            }
        }
        _numRow = new float[columns];
        _denRow = new float[columns];
    }

    /// <summary>
    /// Writes each cell's numerator and denominator terms (all scales) for the pair: x = earlier
    /// (reference), y = later (distorted). Cells missing in either frame get NaN.
    /// </summary>
    public void Terms(ReadOnlySpan<float> x, ReadOnlySpan<float> y, Span<float> num, Span<float> den)
    {
        if (x.Length != _rows * _columns || y.Length != x.Length || num.Length != x.Length || den.Length != x.Length)
            throw new ArgumentException($"VIF terms need {_rows} × {_columns} cells in every field");
        var (sx, sy, count) = ValidPairs.Sums(x, y);
        _complete = count == x.Length;
        _shiftX = count > 0 ? (float)((sx / count - _low) * _scale) : 0;
        _shiftY = count > 0 ? (float)((sy / count - _low) * _scale) : 0;
        fixed (float* a = x, b = y, pn = num, pd = den)
        {
            _a = a; _b = b; _num = pn; _den = pd;
            try
            {
                for (int s = 1; s < Scales; s++) _pyramid[s]!.Run(_pyramidSources[s], _pyramidSinks[s]);
                for (int s = Scales - 1; s >= 0; s--) _moments[s].Run(_momentSources[s], _momentSinks[s]);
            }
            finally { _a = _b = _num = _den = null; }
        }
    }

    /// <summary>Row <paramref name="row"/> of level <paramref name="level"/>'s two images into padded[0] and padded[1].</summary>
    void LevelRow(int level, int row, float[] px, float[] py, int radius)
    {
        int c = _levelColumns[level];
        if (level == 0)
        {
            float scale = (float)_scale, low = (float)_low;
            var a = new ReadOnlySpan<float>(_a + (long)row * c, c);
            var b = new ReadOnlySpan<float>(_b + (long)row * c, c);
            int i = 0;
            if (Vector256.IsHardwareAccelerated)
            {
                var vscale = Vector256.Create(scale); var vlow = Vector256.Create(low);
                var vsx = Vector256.Create(_shiftX); var vsy = Vector256.Create(_shiftY);
                for (; i + 8 <= c; i += 8)
                {
                    var va = Vector256.Create(a.Slice(i, 8));
                    var vb = Vector256.Create(b.Slice(i, 8));
                    var valid = Vector256.Equals(va, va) & Vector256.Equals(vb, vb);
                    (((va - vlow) * vscale - vsx) & valid).CopyTo(px.AsSpan(radius + i, 8));
                    (((vb - vlow) * vscale - vsy) & valid).CopyTo(py.AsSpan(radius + i, 8));
                }
            }
            for (; i < c; i++)
            {
                bool valid = !float.IsNaN(a[i]) && !float.IsNaN(b[i]);
                px[radius + i] = valid ? (a[i] - low) * scale - _shiftX : 0;
                py[radius + i] = valid ? (b[i] - low) * scale - _shiftY : 0;
            }
        }
        else
        {
            _levelX[level].AsSpan(row * c, c).CopyTo(px.AsSpan(radius));
            _levelY[level].AsSpan(row * c, c).CopyTo(py.AsSpan(radius));
        }
        BandFilter.PadEdges(px, c, radius, _xEdge);
        BandFilter.PadEdges(py, c, radius, _xEdge);
    }

    void PyramidRow(int level, int row, float[][] padded) => LevelRow(level, row, padded[0], padded[1], _pyramid[level + 1]!.Radius);

    void MomentRow(int level, int row, float[][] padded)
    {
        int radius = _moments[level].Radius;
        LevelRow(level, row, padded[0], padded[1], radius);
        int n = _levelColumns[level] + 2 * radius;
        var px = padded[0].AsSpan(0, n);
        var py = padded[1].AsSpan(0, n);
        TensorPrimitives.Multiply(px, px, padded[2].AsSpan(0, n));
        TensorPrimitives.Multiply(py, py, padded[3].AsSpan(0, n));
        TensorPrimitives.Multiply(px, py, padded[4].AsSpan(0, n));
    }

    /// <summary>
    /// The arguments of one row of level <paramref name="level"/>, times those of the coarser
    /// positions each one holds: kept as products at the coarse levels (their logarithms at level
    /// 1), turned into the cells' terms at level 0.
    /// </summary>
    void TermsRow(int level, int row, float[][] m)
    {
        int c = _levelColumns[level];
        var num = _numRow.AsSpan(0, c);
        var den = _denRow.AsSpan(0, c);
        Arguments(m[0], m[1], m[2], m[3], m[4], num, den);
        if (level == Scales - 1)
        {
            num.CopyTo(_numBelow[level].AsSpan(row * c, c));
            den.CopyTo(_denBelow[level].AsSpan(row * c, c));
            return;
        }
        if (level > 0)
        {
            var numOut = _numBelow[level].AsSpan(row * c, c);
            var denOut = _denBelow[level].AsSpan(row * c, c);
            num.CopyTo(numOut);
            den.CopyTo(denOut);
            if (row % 2 == 0) MultiplyEvenColumns(numOut, denOut, level + 1, row / 2);
            if (level == 1)
            {
                TensorPrimitives.Log10(numOut, numOut);
                TensorPrimitives.Log10(denOut, denOut);
            }
            return;
        }
        long at = (long)row * _columns;
        var numCells = new Span<float>(_num + at, c);
        var denCells = new Span<float>(_den + at, c);
        TensorPrimitives.Log10(num, numCells);
        TensorPrimitives.Log10(den, denCells);
        if (row % 2 == 0)
        {
            int cc = _levelColumns[1];
            var numCoarse = _numBelow[1].AsSpan(row / 2 * cc, cc);
            var denCoarse = _denBelow[1].AsSpan(row / 2 * cc, cc);
            for (int i = 0; i < cc; i++)
            {
                numCells[2 * i] += numCoarse[i];
                denCells[2 * i] += denCoarse[i];
            }
        }
        if (!_complete)
        {
            var a = new ReadOnlySpan<float>(_a + at, c);
            var b = new ReadOnlySpan<float>(_b + at, c);
            // missing cells carry no terms at any scale
            for (int i = 0; i < c; i++)
                if (float.IsNaN(a[i]) || float.IsNaN(b[i])) numCells[i] = denCells[i] = float.NaN;
        }
    }

    /// <summary>Multiplies the even positions 2I of a row by position I of row <paramref name="coarseRow"/> of level <paramref name="coarse"/>.</summary>
    void MultiplyEvenColumns(Span<float> num, Span<float> den, int coarse, int coarseRow)
    {
        int cc = _levelColumns[coarse];
        var numCoarse = _numBelow[coarse].AsSpan(coarseRow * cc, cc);
        var denCoarse = _denBelow[coarse].AsSpan(coarseRow * cc, cc);
        for (int i = 0; i < cc; i++)
        {
            num[2 * i] *= numCoarse[i];
            den[2 * i] *= denCoarse[i];
        }
    }

    /// <summary>
    /// 1 + g²σ₁²/(σᵥ² + σ²_N) and 1 + σ₁²/σ²_N per position from the filtered moments, with the
    /// released code's guards in its order; eight positions at a time.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    static void Arguments(float[] mu1, float[] mu2, float[] s11, float[] s22, float[] s12, Span<float> num, Span<float> den)
    {
        int n = num.Length, i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var zero = Vector256<float>.Zero; var one = Vector256.Create(1f); var guard = Vector256.Create(Guard); var noise = Vector256.Create(SigmaNoise);
            for (; i + 8 <= n; i += 8)
            {
                var m1 = Vector256.Create(mu1.AsSpan(i, 8)); var m2 = Vector256.Create(mu2.AsSpan(i, 8));
                var sigma1 = Vector256.Max(zero, Vector256.Create(s11.AsSpan(i, 8)) - m1 * m1);
                var sigma2 = Vector256.Max(zero, Vector256.Create(s22.AsSpan(i, 8)) - m2 * m2);
                var sigma12 = Vector256.Create(s12.AsSpan(i, 8)) - m1 * m2;
                var g = sigma12 / (sigma1 + guard);
                var sv = sigma2 - g * sigma12;
                var flat1 = Vector256.LessThan(sigma1, guard);
                g = Vector256.ConditionalSelect(flat1, zero, g); sv = Vector256.ConditionalSelect(flat1, sigma2, sv); sigma1 = Vector256.ConditionalSelect(flat1, zero, sigma1);
                var flat2 = Vector256.LessThan(sigma2, guard);
                g = Vector256.ConditionalSelect(flat2, zero, g); sv = Vector256.ConditionalSelect(flat2, zero, sv);
                var negative = Vector256.LessThan(g, zero);
                sv = Vector256.ConditionalSelect(negative, sigma2, sv); g = Vector256.ConditionalSelect(negative, zero, g);
                sv = Vector256.Max(sv, guard);
                (one + g * g * sigma1 / (sv + noise)).CopyTo(num.Slice(i, 8));
                (one + sigma1 / noise).CopyTo(den.Slice(i, 8));
            }
        }
        for (; i < n; i++)
        {
            float sigma1 = Math.Max(0, s11[i] - mu1[i] * mu1[i]);
            float sigma2 = Math.Max(0, s22[i] - mu2[i] * mu2[i]);
            float sigma12 = s12[i] - mu1[i] * mu2[i];
            float g = sigma12 / (sigma1 + Guard);
            float sv = sigma2 - g * sigma12;
            if (sigma1 < Guard) { g = 0; sv = sigma2; sigma1 = 0; }
            if (sigma2 < Guard) { g = 0; sv = 0; }
            if (g < 0) { sv = sigma2; g = 0; }
            if (sv <= Guard) sv = Guard;
            num[i] = 1 + g * g * sigma1 / (sv + SigmaNoise);
            den[i] = 1 + sigma1 / SigmaNoise;
        }
    }
}
