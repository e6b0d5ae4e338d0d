using GridDrift.Operators.Climatology;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;

namespace GridDrift.Outputs.Fields;

/// <summary>
/// A climatology as CF Conventions §7.4 describes it: one time step per slot whose time
/// coordinate carries `climatology = "climatology_bounds"` (and no `bounds`), climatological
/// cell_methods ("time: mean within years time: mean over years"; the diurnal kind spans
/// years: "time: mean within days time: mean over days time: mean over years"), the data
/// variable under the input's name with NAME_std and NAME_count beside it, on the input's own
/// grid, with the base period, kind and smoothing in the global attributes.
/// </summary>
internal static class ClimatologyNetCdfWriter
{
    public const float Fill = 9.96921e36f; // netCDF's default float fill (NC_FILL_FLOAT)

    public static void Write(string path, FieldTemplate template, string variable, SlotScheme scheme, IClimatologySlots fields, SlotTimes slots,
        TimeUnits units, string calendarAttribute, IReadOnlyDictionary<string, string> globals, ClassicVariant? format)
    {
        // time is the record dimension so the slots are written one by one, without a copy of the whole climatology
        using var w = new FieldNetCdfWriter(path, template, -1, format, globals);
        var nv = w.AddDimension("nv", 2);
        var time = w.Writer.AddVariable("time", NcType.Double, [w.Time],
        [
            NcAttribute.Text("standard_name", "time"), NcAttribute.Text("long_name", $"time of the climatology slot ({scheme.Kind.Name()})"),
            NcAttribute.Text("units", units.Text), NcAttribute.Text("calendar", calendarAttribute), NcAttribute.Text("axis", "T"),
            NcAttribute.Text("climatology", "climatology_bounds"),
        ]);
        var bounds = w.Writer.AddVariable("climatology_bounds", NcType.Double, [w.Time, nv],
            [NcAttribute.Text("long_name", "first and last period of each slot: start of the slot in its first year, end of the slot in its last year")]);
        string within = scheme.Kind == ClimatologyKind.HourByMonth ? "within days" : "within years";
        string over = scheme.Kind == ClimatologyKind.HourByMonth ? "over days time: {0} over years" : "over years";
        string Methods(string first, string second) => $"time: {first} {within} time: {second} " + string.Format(System.Globalization.CultureInfo.InvariantCulture, over, second);
        var dims = w.FieldDimensions().ToArray();
        string? standardName = template.DataAttribute("standard_name");
        string units0 = template.DataAttribute("units") ?? "1";
        var common = template.DataAttributes.Where(a => a.Name is "coordinates" or "grid_mapping").ToList();
        var meanVar = w.Writer.AddVariable(NcNames.Safe(variable), NcType.Float, dims, template.DataAttributes.Where(a => a.Name != "long_name")
            .Append(NcAttribute.Text("long_name", $"climatological mean of {template.DataAttribute("long_name") ?? variable}"))
            .Append(NcAttribute.Text("cell_methods", Methods("mean", "mean")))
            .Append(NcAttribute.Text("ancillary_variables", $"{variable}_std {variable}_count"))
            .Append(NcAttribute.Of("_FillValue", Fill)));
        var stdVar = w.Writer.AddVariable(NcNames.Safe(variable) + "_std", NcType.Float, dims, common
            .Concat(standardName is null ? [] : new[] { NcAttribute.Text("standard_name", standardName) })
            .Append(NcAttribute.Text("long_name", $"climatological standard deviation of {variable}"))
            .Append(NcAttribute.Text("units", units0))
            .Append(NcAttribute.Text("cell_methods", Methods("standard_deviation", "standard_deviation") +
                " (comment: population standard deviation of all samples of the slot, pooled over the base period)"))
            .Append(NcAttribute.Of("_FillValue", Fill)));
        var countVar = w.Writer.AddVariable(NcNames.Safe(variable) + "_count", NcType.Float, dims, common
            .Concat(standardName is null ? [] : new[] { NcAttribute.Text("standard_name", standardName + " number_of_observations") })
            .Append(NcAttribute.Text("long_name", $"number of valid samples of {variable} in the slot"))
            .Append(NcAttribute.Text("units", "1"))
            .Append(NcAttribute.Text("cell_methods", Methods("sum", "sum"))));
        w.EndDefinitions();

        var mean = new float[fields.Cells];
        var std = new float[fields.Cells];
        var count = new float[fields.Cells];
        for (int s = 0; s < fields.Slots; s++)
        {
            w.Writer.WriteRecord<double>(time, s, [units.Encode(slots.Times[s])]);
            w.Writer.WriteRecord<double>(bounds, s, [units.Encode(slots.BoundsStart[s]), units.Encode(slots.BoundsEnd[s])]);
            fields.Fill(s, mean, std, count);
            w.Writer.WriteRecord<float>(meanVar, s, Filled(mean));
            w.Writer.WriteRecord<float>(stdVar, s, Filled(std));
            w.Writer.WriteRecord<float>(countVar, s, count);
        }
        w.Commit();
    }

    static float[] Filled(float[] values)
    {
        var vectors = System.Runtime.InteropServices.MemoryMarshal.Cast<float, System.Numerics.Vector<float>>(values.AsSpan());
        var fill = new System.Numerics.Vector<float>(Fill);
        for (int k = 0; k < vectors.Length; k++)
            vectors[k] = System.Numerics.Vector.ConditionalSelect(System.Numerics.Vector.Equals(vectors[k], vectors[k]), vectors[k], fill);
        for (int i = vectors.Length * System.Numerics.Vector<float>.Count; i < values.Length; i++) if (float.IsNaN(values[i])) values[i] = Fill;
        return values;
    }
}
