using System.Numerics.Tensors;
using GridDrift.Formats;
using GridDrift.Formats.Classic;

namespace GridDrift.Conventions.Values;

/// <summary>
/// CF value decoding of one variable as a chain of two reversible steps (CF Conventions §2.5.1
/// and §8.1): masking (raw values equal to _FillValue or missing_value, or outside
/// valid_min/valid_max/valid_range, become NaN) and unpacking (× scale_factor + add_offset).
/// Decoding runs mask then unpack; encoding runs pack then fill, so a round trip is exact for
/// every value the packed type can represent. Arithmetic is in float64; output is float32.
/// </summary>
internal sealed class ValueCodec
{
    readonly double[] _missing;
    readonly double _validMin;
    readonly double _validMax;
    readonly bool _rangeOnPacked;

    public NcType StorageType { get; }
    public double Scale { get; }
    public double Offset { get; }
    public bool IsPacked => Scale != 1 || Offset != 0;
    /// <summary>The value written for a missing cell when encoding (in raw units), if any.</summary>
    public double? FillValue { get; }
    public IReadOnlyList<string> Warnings { get; }

    ValueCodec(NcType storage, double scale, double offset, double? fill, double[] missing,
        double validMin, double validMax, bool rangeOnPacked, List<string> warnings)
    {
        StorageType = storage;
        Scale = scale;
        Offset = offset;
        FillValue = fill;
        _missing = missing;
        _validMin = validMin;
        _validMax = validMax;
        _rangeOnPacked = rangeOnPacked;
        Warnings = warnings;
    }

    public static ValueCodec For(NcVariable variable)
    {
        var warnings = new List<string>();
        var a = variable.Attributes;
        double scale = a.Find("scale_factor")?.FirstNumber() ?? 1;
        double offset = a.Find("add_offset")?.FirstNumber() ?? 0;
        bool integerStorage = variable.Type is not (NcType.Float or NcType.Double);

        var missing = new List<double>();
        double? fill = null;
        if (a.Find("_FillValue") is { } fv)
        {
            double? v = fv.FirstNumber();
            if (v is not { } value)
                warnings.Add("_FillValue is not a number; ignored");
            else if (integerStorage && (!double.IsFinite(value) || value != Math.Round(value)))
                warnings.Add($"_FillValue {fv.Render()} cannot be cast to the variable's type {variable.TypeName}; ignored");
            else
            {
                fill = value;
                missing.Add(value);
            }
        }
        else if (variable.Type is not (NcType.Byte or NcType.UByte or NcType.Char) && NcTypes.IsNumeric(variable.Type))
        {
            // Without a _FillValue, unwritten data hold the format's default fill value (netCDF-C
            // behaviour; python netCDF4 masks it too, except for bytes).
            missing.Add(((Array)FillValues.DefaultTyped(variable.Type)).GetValue(0) is { } d ? Convert.ToDouble(d) : double.NaN);
        }
        if (a.Find("missing_value") is { } mv)
            foreach (var v in mv.AsDoubles())
                if (integerStorage && (!double.IsFinite(v) || v != Math.Round(v)))
                    warnings.Add($"missing_value {v} cannot be cast to the variable's type {variable.TypeName}; ignored");
                else missing.Add(v);

        double lo = double.NegativeInfinity, hi = double.PositiveInfinity;
        NcAttribute? rangeAttr = null;
        if (a.Find("valid_range") is { Count: >= 2 } vr) { var r = vr.AsDoubles(); lo = r[0]; hi = r[1]; rangeAttr = vr; }
        if (a.Find("valid_min") is { } vmin) { lo = vmin.FirstNumber() ?? lo; rangeAttr = vmin; }
        if (a.Find("valid_max") is { } vmax) { hi = vmax.FirstNumber() ?? hi; rangeAttr = vmax; }
        // CF §8.1: valid bounds are in packed units when they have the packed (storage) type.
        bool rangeOnPacked = rangeAttr is null || rangeAttr.Type == variable.Type || scale == 1 && offset == 0;

        missing.RemoveAll(double.IsNaN); // NaN never compares equal; NaN raw values decode to NaN anyway
        return new ValueCodec(variable.Type, scale, offset, fill, missing.Distinct().ToArray(), lo, hi, rangeOnPacked, warnings);
    }

    /// <summary>
    /// The valid range (valid_range, or valid_min and valid_max) in physical units, when the
    /// variable gives both ends; CF §8.1's rule decides whether it was stated packed.
    /// </summary>
    public (double Low, double High)? ValidRange
    {
        get
        {
            if (double.IsInfinity(_validMin) || double.IsInfinity(_validMax)) return null;
            if (!_rangeOnPacked) return (_validMin, _validMax);
            double a = _validMin * Scale + Offset, b = _validMax * Scale + Offset;
            return (Math.Min(a, b), Math.Max(a, b));
        }
    }

    /// <summary>Raw values (already widened to double) to physical float32, NaN where missing.</summary>
    public void Decode(ReadOnlySpan<double> raw, Span<float> physical)
    {
        if (raw.Length != physical.Length) throw new ArgumentException("length mismatch");
        var missing = _missing;
        for (int i = 0; i < raw.Length; i++)
        {
            double r = raw[i];
            bool bad = false;
            foreach (var m in missing) bad |= r == m;
            double value = r * Scale + Offset;
            double test = _rangeOnPacked ? r : value;
            bad |= test < _validMin || test > _validMax;
            physical[i] = bad ? float.NaN : (float)value;
        }
    }

    /// <summary>
    /// In-place decoding of a float32 variable stored unpacked, the common case of a hot frame
    /// loop: vectorised where only one fill value applies and no valid range is set.
    /// </summary>
    public void DecodeInPlace(Span<float> values)
    {
        if (StorageType != NcType.Float || IsPacked) throw new InvalidOperationException("only for unpacked float storage");
        if (TrySingleFill(out float fill))
        {
            if (!float.IsNaN(fill)) ReplaceVectorised(values, fill);
            return;
        }
        float lo = (float)_validMin, hi = (float)_validMax;
        for (int i = 0; i < values.Length; i++)
        {
            float v = values[i];
            bool bad = v < lo || v > hi;
            foreach (var m in _missing) bad |= v == (float)m;
            if (bad) values[i] = float.NaN;
        }
    }

    /// <summary>
    /// True where decoding a float32 stored value is only "this one value means missing" (or
    /// nothing at all: <paramref name="fill"/> is then NaN): no packing, no valid range, at most
    /// one missing value. A frame loop may then decode while it reads.
    /// </summary>
    public bool TrySingleFill(out float fill)
    {
        fill = float.NaN;
        bool hasRange = !double.IsNegativeInfinity(_validMin) || !double.IsPositiveInfinity(_validMax);
        if (StorageType != NcType.Float || IsPacked || hasRange || _missing.Length > 1) return false;
        if (_missing.Length == 1) fill = (float)_missing[0];
        return true;
    }

    static void ReplaceVectorised(Span<float> values, float fill)
    {
        var vfill = new System.Numerics.Vector<float>(fill);
        var vnan = new System.Numerics.Vector<float>(float.NaN);
        int width = System.Numerics.Vector<float>.Count;
        int i = 0;
        var asVectors = System.Runtime.InteropServices.MemoryMarshal.Cast<float, System.Numerics.Vector<float>>(values);
        for (int k = 0; k < asVectors.Length; k++)
        {
            var v = asVectors[k];
            asVectors[k] = System.Numerics.Vector.ConditionalSelect(System.Numerics.Vector.Equals(v, vfill), vnan, v);
        }
        for (i = asVectors.Length * width; i < values.Length; i++)
            if (values[i] == fill) values[i] = float.NaN;
    }

    /// <summary>Physical values to raw (double) values: packed and rounded for integer storage, NaN to the fill value.</summary>
    public void Encode(ReadOnlySpan<float> physical, Span<double> raw)
    {
        bool integer = StorageType is not (NcType.Float or NcType.Double);
        double fill = FillValue ?? (integer ? Convert.ToDouble(((Array)FillValues.DefaultTyped(StorageType)).GetValue(0)) : double.NaN);
        for (int i = 0; i < physical.Length; i++)
        {
            float p = physical[i];
            if (float.IsNaN(p)) { raw[i] = fill; continue; }
            double r = (p - Offset) / Scale;
            raw[i] = integer ? Math.Round(r, MidpointRounding.ToEven) : r;
        }
    }
}
