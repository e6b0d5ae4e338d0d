using System.Text.Json;
using GridDrift.Formats;
using GridDrift.Grids;
using GridDrift.Grids.Regridding;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Grids;

/// <summary>
/// Remapping: conservative weights keep the area integral (a conservation law: Σ value × area is
/// the same on both grids, here 1e-12 relative) and reproduce a constant exactly, also from an
/// irregular (Gaussian-like) source; bilinear reproduces a function linear in latitude and
/// longitude and equals scipy.interpolate.RegularGridInterpolator (Interop/scripts/bilinear_reference.py),
/// across the date line too; missing cells lower the covered fraction instead of the value.
/// </summary>
public class RegridTests
{
    static Grid Regular(double d) => TargetGrids.TryParse($"regular:{d.ToString(System.Globalization.CultureInfo.InvariantCulture)}")!;

    static Grid Irregular()
    {
        // latitudes unevenly spaced and descending, like many reanalysis files
        var lat = new[] { 85.0, 70, 52, 35, 18, 4, -10, -27, -44, -60, -74, -87 };
        var lon = Enumerable.Range(0, 40).Select(i => 4.5 + 9 * i).ToArray();
        return RectilinearGrid.Build(lat, lon);
    }

    [Fact]
    public void Conservative_remapping_keeps_the_area_integral_and_a_constant()
    {
        foreach (var (source, target) in new[] { (Regular(5), Regular(3)), (Irregular(), Regular(10)), (Regular(2), Regular(7.5)) })
        {
            var weights = ConservativeRemap.Build(source, target);
            var rng = new Random(3);
            var field = Enumerable.Range(0, source.CellCount).Select(_ => (float)(250 + 30 * rng.NextDouble())).ToArray();
            var output = new float[target.CellCount];
            var covered = new float[target.CellCount];
            weights.Apply(field, output, covered);
            double before = 0, after = 0;
            for (int c = 0; c < source.CellCount; c++) before += (double)field[c] * source.CellArea[c];
            for (int c = 0; c < target.CellCount; c++) after += (double)output[c] * target.CellArea[c];
            Assert.True(Math.Abs(after - before) <= 1e-6 * Math.Abs(before), $"area integral {before:R} → {after:R}"); // float32 output values
            // in float64, straight from the weights: Σ over target cells of Σ_k w_k x_k is the source integral to 1e-12
            double exact = 0;
            for (int t = 0; t < target.CellCount; t++)
                for (int k = weights.RowStart[t]; k < weights.RowStart[t + 1]; k++) exact += weights.Weight[k] * field[weights.Column[k]];
            Assert.True(Math.Abs(exact - before) <= 1e-12 * Math.Abs(before), $"area integral in float64 {before:R} → {exact:R}");
            Assert.All(covered, f => Assert.True(Math.Abs(f - 1) < 1e-6));
            var constant = Enumerable.Repeat(273.15f, source.CellCount).ToArray();
            weights.Apply(constant, output, covered);
            Assert.All(output, v => Assert.Equal(273.15f, v));
        }
    }

    [Fact]
    public void A_curvilinear_source_keeps_its_integral_and_a_constant()
    {
        // the rotated-pole sample: every source cell's 64 sub-cells land in some cell of a global target,
        // so the weights of each source cell sum to its area and the integral is kept (1e-12)
        using var reader = GridDrift.Formats.DatasetFiles.Open(SharedData.Sample("q_curvilinear_360day.nc"));
        var axes = GridDrift.Conventions.Coordinates.VariableAxes.Discover(reader, reader.RequireVariable("huss"));
        var source = GridDrift.Grids.GridReader.Read(reader, axes);
        var target = Regular(5);
        var w = ConservativeRemap.Build(source, target);
        var rng = new Random(4);
        var field = Enumerable.Range(0, source.CellCount).Select(_ => (float)rng.NextDouble()).ToArray();
        double before = 0, after = 0;
        for (int j = 0; j < source.Rows; j++)
            for (int i = 0; i < source.Columns; i++) before += source.CellArea[j * source.Columns + i] * field[source.FrameIndex(j, i)];
        for (int k = 0; k < w.Column.Length; k++) after += w.Weight[k] * field[w.Column[k]];
        Assert.True(Math.Abs(after - before) <= 1e-12 * before, $"integral {before:R} → {after:R}");
        var output = new float[target.CellCount];
        w.Apply(Enumerable.Repeat(0.004f, source.CellCount).ToArray(), output, []);
        Assert.All(output.Where(v => !float.IsNaN(v)), v => Assert.Equal(0.004f, v));
        Assert.Contains(output, v => !float.IsNaN(v));
    }

    [Fact]
    public void Conservative_weights_sum_to_the_target_areas_to_1e_12()
    {
        var source = Irregular();
        var target = Regular(6);
        var w = ConservativeRemap.Build(source, target);
        for (int t = 0; t < target.CellCount; t++)
        {
            double sum = 0;
            for (int k = w.RowStart[t]; k < w.RowStart[t + 1]; k++) sum += w.Weight[k];
            Assert.True(Math.Abs(sum - target.CellArea[t]) <= 1e-12 * target.CellArea[t], $"cell {t}: overlaps {sum:R}, area {target.CellArea[t]:R}");
        }
    }

    [Fact]
    public void Missing_source_cells_lower_the_covered_fraction_not_the_value()
    {
        var source = Regular(5);
        var target = Regular(10);
        var w = ConservativeRemap.Build(source, target);
        var field = Enumerable.Repeat(1f, source.CellCount).ToArray();
        field[0] = float.NaN; // one 5° cell of the first target cell's four
        var output = new float[target.CellCount];
        var covered = new float[target.CellCount];
        w.Apply(field, output, covered);
        Assert.Equal(1f, output[0]);
        // the missing cell (−90…−85°, 0…5°) against the target cell (−90…−80°, 0…10°): areas ∝ Δλ (sin φ₂ − sin φ₁)
        double missing = 5 * (Math.Sin(-85 * Math.PI / 180) + 1) / (10 * (Math.Sin(-80 * Math.PI / 180) + 1));
        Assert.True(Math.Abs(covered[0] - (1 - missing)) < 1e-6, $"covered {covered[0]}, expected {1 - missing}");
    }

    [Fact]
    public void Bilinear_reproduces_a_function_linear_in_latitude_and_longitude()
    {
        var source = Regular(4);
        var target = Regular(3);
        var w = BilinearRemap.Build(source, target);
        var field = Enumerable.Range(0, source.CellCount).Select(c => (float)(2 * source.CenterLat[c] + 0.25 * source.CenterLon[c])).ToArray();
        var output = new float[target.CellCount];
        w.Apply(field, output, []);
        for (int t = 0; t < target.CellCount; t++)
        {
            double lat = target.CenterLat[t], lon = target.CenterLon[t];
            if (Math.Abs(lat) > 88 || lon < 2 || lon > 358) continue; // beyond the outermost rows, and the wrap where lon is not linear
            Assert.True(Math.Abs(output[t] - (2 * lat + 0.25 * lon)) < 1e-4, $"({lat}, {lon}): {output[t]}");
        }
    }

    [InteropFact(Needs.PythonScipy)]
    public void Bilinear_equals_scipy_RegularGridInterpolator_across_the_date_line()
    {
        var source = Regular(5);
        var target = Regular(3);
        var rng = new Random(6);
        var field = Enumerable.Range(0, source.CellCount).Select(_ => (float)(200 + 100 * rng.NextDouble())).ToArray();
        var w = BilinearRemap.Build(source, target);
        var output = new float[target.CellCount];
        w.Apply(field, output, []);
        var lat = Enumerable.Range(0, source.Rows).Select(j => source.CenterLat[j * source.Columns]).ToArray();
        var lon = Enumerable.Range(0, source.Columns).Select(i => source.CenterLon[i]).ToArray();
        var rows = Enumerable.Range(0, source.Rows).Select(j => Enumerable.Range(0, source.Columns).Select(i => (double)field[j * source.Columns + i]).ToArray()).ToArray();
        var inside = Enumerable.Range(0, target.CellCount).Where(t => Math.Abs(target.CenterLat[t]) <= 87.5).ToArray();
        var points = inside.Select(t => new[] { target.CenterLat[t], target.CenterLon[t] }).ToArray();
        var reference = JsonDocument.Parse(ExternalTools.RunPythonWithInput("bilinear_reference.py", JsonSerializer.Serialize(new { lat, lon, field = rows, points }))).RootElement;
        var expected = reference.GetProperty("values").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        for (int k = 0; k < inside.Length; k++)
            Assert.True(Math.Abs(expected[k] - output[inside[k]]) < 1e-4, $"({points[k][0]}, {points[k][1]}): scipy {expected[k]:R}, ours {output[inside[k]]:R}");
    }
}
