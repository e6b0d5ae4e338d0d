using GridDrift.Conventions.Time;
using GridDrift.Conventions.Units;
using GridDrift.Frames;
using GridDrift.Results;

namespace GridDrift.Operators.Physics;

/// <summary>What <see cref="HumidityOperator"/> derives.</summary>
internal enum HumidityQuantity
{
    /// <summary>Relative humidity (%) from specific humidity, temperature and pressure.</summary>
    RelativeHumidity,
    /// <summary>Specific humidity (kg kg-1) from the dew point and pressure.</summary>
    SpecificHumidityFromDewPoint,
}

/// <summary>
/// Relative humidity or specific humidity, cell by cell (<see cref="Moisture"/>). Sources: the
/// humidity variable, then the temperature (relative humidity only), then a pressure field when
/// the pressure is not the levels of the frame's first dimension.
/// </summary>
/// <param name="levels">pressure of each level, Pa, when the frames are (level, cells); null when a pressure field is a source</param>
/// <param name="input">the humidity variable's units to kg kg-1 (relative humidity) or K (dew point)</param>
/// <param name="temperature">the temperature's units to K (relative humidity only)</param>
/// <param name="pressureScale">factor taking the pressure field's units to Pa</param>
/// <param name="output">from % or kg kg-1 to the units asked for, or null</param>
internal sealed class HumidityOperator(HumidityQuantity quantity, double[]? levels, int cellsPerLevel, UnitConverter input, UnitConverter? temperature, double pressureScale,
    UnitConverter? output, int frameLength, IReadOnlyList<CfTime> times, IFieldSink sink) : IFrameOperator<float[]>
{
    public float[] NewWorker() => new float[frameLength];

    public void Process(float[] result, int frame, in FrameInputs inputs)
    {
        bool rh = quantity == HumidityQuantity.RelativeHumidity;
        var x = inputs.Primary;
        var t = rh ? inputs[1] : default;
        var pressure = levels is null ? inputs[rh ? 2 : 1] : default;
        for (int i = 0; i < x.Length; i++)
        {
            double p = levels is null ? pressure[i] * pressureScale : levels[i / cellsPerLevel];
            double v = input.Convert(x[i]);
            double r = rh ? Moisture.RelativeHumidity(v, temperature!.Convert(t[i]), p) : Moisture.SpecificHumidityFromDewPoint(v, p);
            result[i] = double.IsFinite(r) ? (float)(output?.Convert(r) ?? r) : float.NaN;
        }
    }

    public void Complete(float[] result, int frame) => sink.Write(times[frame], result);
}
