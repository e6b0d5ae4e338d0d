using GridDrift.Conventions.Time;
using GridDrift.Formats.Classic;
using GridDrift.Results;

namespace GridDrift.Outputs.Fields;

/// <summary>Fields as records of a field file: the time, then the field with missing values as the fill value.</summary>
internal sealed class FieldRecords(FieldNetCdfWriter w, ClassicWriter.Definition time, ClassicWriter.Definition data, TimeUnits units, int cells) : IFieldSink
{
    readonly float[] _record = new float[cells];
    readonly double[] _time = new double[1];

    public int Written { get; private set; }

    public void Write(CfTime when, ReadOnlySpan<float> field)
    {
        _time[0] = units.Encode(when);
        w.Writer.WriteRecord<double>(time, Written, _time);
        for (int i = 0; i < field.Length; i++) _record[i] = float.IsNaN(field[i]) ? ClimatologyNetCdfWriter.Fill : field[i];
        w.Writer.WriteRecord<float>(data, Written, _record);
        Written++;
    }
}
