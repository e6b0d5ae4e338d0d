using System.Text.Json;
using CsCheck;
using GridDrift.Operators.Climatology;
using GridDrift.Formats;
using GridDrift.Frames;
using GridDrift.Outputs.Fields;
using GridDrift.Pipeline;
using GridDrift.Tests.Support;
using GridDrift.Workflows;
using GridDrift.Products;

namespace GridDrift.Tests.Pipeline;

/// <summary>
/// Sharded runs: N shards (`griddrift run --shard I/N`) plus `griddrift gather` give the
/// products of a one-machine run. Series are compared value for value and the climatology to
/// float32 rounding, both read by python netCDF4 (Interop/scripts/compare_products.py), and the
/// Parquet tables through DuckDB; merged partial climatology states are compared with numpy's
/// float64 group statistics of the record at 1e-12 relative.
/// </summary>
public class ShardTests
{
    [Fact]
    public void Shard_slices_tile_the_record() =>
        Gen.Select(Gen.Int[0, 100_000], Gen.Int[1, 64]).Sample((frames, shards) =>
        {
            int next = 0;
            for (int i = 1; i <= shards; i++)
            {
                var s = FrameSlice.OfShard(i, shards, frames);
                if (s.First != next) return false;
                if (Math.Abs(s.Count - (double)frames / shards) >= 1) return false;
                next = s.End;
            }
            return next == frames;
        });

    [Theory]
    [InlineData("2/4", 2, 4)]
    [InlineData("1/1", 1, 1)]
    public void Shard_spec_parses(string text, int index, int count) => Assert.Equal(new ShardSpec(index, count), ShardSpec.Parse(text));

    [Theory]
    [InlineData("0/4")]
    [InlineData("5/4")]
    [InlineData("2")]
    [InlineData("a/b")]
    public void A_bad_shard_is_a_usage_error(string text)
    {
        using var dir = new TempFolder();
        File.WriteAllText(dir.File("r.toml"), "[input]\nfiles = [\"x.nc\"]\nvariable = \"v\"\n");
        var outcome = CliRun.Run("run", dir.File("r.toml"), "--shard", text);
        Assert.Equal(1, outcome.ExitCode);
        Assert.Contains("I/N", outcome.Stderr);
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void Merged_partial_states_equal_numpy_moments_of_the_whole_record()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 400, nlat: 5, nlon: 7, stepHours: 24, missing: (t, c) => (t * 7 + c) % 13 == 0);
        var partials = new List<string>();
        for (int i = 1; i <= 3; i++)
        {
            string part = dir.File($"part{i}.nc");
            var slice = FrameSlice.OfShard(i, 3, 400);
            var s = ClimatologyStep.Run(new ClimatologyOptions([input], "tcwv", ClimatologyKind.Month, dir.File("unused.nc"), Slice: slice, PartialOut: part));
            Assert.Equal(slice.Count, s.FramesUsed);
            partials.Add(part);
        }
        using var merged = new MomentState(12, 35);
        foreach (var p in partials) PartialClimatologyFile.MergeInto(p, merged, "month");
        PartialClimatologyFile.Write(dir.File("merged.nc"), merged, new Dictionary<string, string> { ["climatology_kind"] = "month" });

        var json = JsonDocument.Parse(ExternalTools.RunPython("partial_state_reference.py", input, "tcwv", dir.File("merged.nc"))).RootElement;
        int compared = 0;
        foreach (var quantity in new[] { "mean", "std", "count" })
        {
            var expected = json.GetProperty("reference").GetProperty(quantity).EnumerateArray().ToArray();
            var ours = json.GetProperty("ours").GetProperty(quantity).EnumerateArray().ToArray();
            Assert.Equal(expected.Length, ours.Length);
            for (int i = 0; i < expected.Length; i++)
            {
                Assert.Equal(expected[i].ValueKind, ours[i].ValueKind);
                if (expected[i].ValueKind == JsonValueKind.Null) continue;
                double e = expected[i].GetDouble(), o = ours[i].GetDouble();
                Assert.True(Math.Abs(o - e) <= 1e-12 * Math.Abs(e), $"{quantity}[{i}]: numpy {e:R}, merged shards {o:R}");
                compared++;
            }
        }
        Assert.True(compared > 3 * 12 * 35 * 3 / 4, $"only {compared} values compared");
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void Four_shards_gathered_equal_a_one_machine_run()
    {
        using var dir = new TempFolder();
        Assert.Equal(0, CliRun.Run("demo", "--size", "small", "--out", dir.Path, "--quiet").ExitCode);
        string recipe = dir.File("sharded.toml");
        File.WriteAllText(recipe, File.ReadAllText(dir.File("recipe.toml")).Replace("out = \"products\"", "out = \"sharded\""));
        string sharded = dir.File("sharded");
        string[] Folders() => Enumerable.Range(1, 4).Select(i => new ShardSpec(i, 4).Folder(sharded)).ToArray();

        for (int stage = 0; stage < 2; stage++)
        {
            for (int i = 1; i <= 4; i++)
            {
                var shard = CliRun.Run("run", recipe, "--shard", $"{i}/4");
                Assert.True(shard.ExitCode == 0, shard.Stderr);
            }
            var gather = CliRun.Run(["gather", .. Folders()]);
            Assert.True(gather.ExitCode == 0, gather.Stderr);
            Assert.Contains(stage == 0 ? "anomalies: no shard has run it yet" : "anomalies: gathered 4 shards", gather.Stderr);
        }
        var finish = CliRun.Run("run", recipe);
        Assert.True(finish.ExitCode == 0, finish.Stderr);
        foreach (var step in new[] { "stats", "similarity", "climatology", "anomalies" }) Assert.Contains($"{step}: up to date, skipped", finish.Stderr);

        AssertSameProducts(dir.File("products"), sharded);
        // each shard hashed only the files of its slice: the record is four yearly files, a shard about a year of frames
        foreach (var folder in Folders())
        {
            using var piece = DatasetFiles.Open(Path.Combine(folder, "stats.nc"));
            Assert.InRange(piece.Attributes.Text("input_files")!.Split('\n').Length, 1, 2);
        }
    }

    [InteropFact(Needs.PythonNetcdf | Needs.Ncdump)]
    public void Anomaly_fields_of_three_shards_join_into_those_of_a_one_machine_run()
    {
        using var dir = new TempFolder();
        SampleFiles.Record(dir.File("in.nc"), frames: 60, nlat: 4, nlon: 6, stepHours: 24, missing: (t, c) => (t + 2 * c) % 9 == 0);
        string body = "variable = \"tcwv\"\nregions = [\"global\"]\n\n[climatology]\nby = \"month\"\n\n[anomalies]\nfields = true\n";
        File.WriteAllText(dir.File("one.toml"), "[input]\nfiles = [\"in.nc\"]\nout = \"one\"\n" + body);
        File.WriteAllText(dir.File("sharded.toml"), "[input]\nfiles = [\"in.nc\"]\nout = \"sharded\"\n" + body);
        Assert.Equal(0, CliRun.Run("run", dir.File("one.toml"), "--quiet").ExitCode);
        string[] folders = Enumerable.Range(1, 3).Select(i => new ShardSpec(i, 3).Folder(dir.File("sharded"))).ToArray();
        for (int stage = 0; stage < 2; stage++)
        {
            for (int i = 1; i <= 3; i++) Assert.Equal(0, CliRun.Run("run", dir.File("sharded.toml"), "--shard", $"{i}/3", "--quiet").ExitCode);
            var gather = CliRun.Run(["gather", .. folders, "--quiet"]);
            Assert.True(gather.ExitCode == 0, gather.Stderr);
        }
        var header = ExternalTools.Run("ncdump", $"-h {dir.File("sharded/anomalies_fields.nc")}");
        Assert.Equal(0, header.ExitCode);
        Assert.Contains("time = UNLIMITED ; // (60 currently)", header.Stdout);
        Assert.Contains(":griddrift_shards = \"shard 1/3: frames 0..19", header.Stdout);
        var json = JsonDocument.Parse(ExternalTools.RunPython("compare_products.py", dir.File("one"), dir.File("sharded"), "anomalies_fields.nc")).RootElement;
        var variables = json.GetProperty("anomalies_fields.nc").GetProperty("variables");
        foreach (var name in new[] { "time", "lat", "lon" }) Assert.True(variables.GetProperty(name).GetProperty("identical").GetBoolean(), name);
        // the values reach 1,430; the climatology's float32 step there is 2^-13, and each anomaly inherits it
        var field = variables.GetProperty("tcwv");
        Assert.True(field.GetProperty("same_shape").GetBoolean());
        Assert.True(field.GetProperty("same_missing").GetBoolean(), "the anomaly fields are missing in other places");
        Assert.True(field.GetProperty("max_abs").GetDouble() <= Math.Pow(2, -12), $"anomaly fields differ by {field.GetProperty("max_abs").GetDouble():R}");
    }

    [Fact]
    public void Gather_refuses_a_missing_a_repeated_or_an_unfinished_shard()
    {
        using var dir = new TempFolder();
        SampleFiles.Record(dir.File("in.nc"), frames: 40, stepHours: 24);
        string recipe = dir.File("r.toml");
        File.WriteAllText(recipe, "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"products\"\n\n[stats]\nout = \"stats.nc\"\n\n[climatology]\nby = \"month\"\n");
        for (int i = 1; i <= 3; i++) Assert.Equal(0, CliRun.Run("run", recipe, "--shard", $"{i}/3", "--quiet").ExitCode);
        string F(int i) => new ShardSpec(i, 3).Folder(dir.File("products"));

        var missing = CliRun.Run("gather", F(1), F(3));
        Assert.Equal(2, missing.ExitCode);
        Assert.Contains("shards 2 of 3 are missing", missing.Stderr);
        var repeated = CliRun.Run("gather", F(1), F(2), F(2), F(3));
        Assert.Equal(2, repeated.ExitCode);
        Assert.Contains("shard 2 is given twice", repeated.Stderr);

        File.Delete(Path.Combine(F(2), ".griddrift-run", "stats.json"));
        var unfinished = CliRun.Run("gather", F(1), F(2), F(3));
        Assert.Equal(2, unfinished.ExitCode);
        Assert.Contains("shards 2 of 3 have not finished stats", unfinished.Stderr);
        Assert.False(File.Exists(dir.File("products/stats.nc")));
    }

    /// <summary>The sharded products against the one-machine ones: series identical, the climatology to float32 rounding, the tables row for row.</summary>
    internal static void AssertSameProducts(string oneMachine, string sharded)
    {
        var json = JsonDocument.Parse(ExternalTools.RunPython("compare_products.py", oneMachine, sharded,
            "stats.nc", "similarity.nc", "climatology.nc", "anomalies.nc")).RootElement;
        foreach (var file in new[] { "stats.nc", "similarity.nc" })
            foreach (var v in json.GetProperty(file).GetProperty("variables").EnumerateObject())
                Assert.True(v.Value.GetProperty("identical").GetBoolean(), $"{file}:{v.Name} differs from the one-machine run by {v.Value.GetProperty("max_abs").GetDouble():R}");
        // the climatology is stored in float32: merged and one-pass moments agree to 1e-12 in float64, so at most one float32 step apart
        var clim = json.GetProperty("climatology.nc").GetProperty("variables");
        foreach (var name in new[] { "tb", "tb_std" })
        {
            var v = clim.GetProperty(name);
            Assert.True(v.GetProperty("same_shape").GetBoolean());
            Assert.True(v.GetProperty("same_missing").GetBoolean(), $"climatology {name} is missing in other places");
            Assert.True(v.GetProperty("max_abs").GetDouble() <= v.GetProperty("max_value").GetDouble() * Math.Pow(2, -23), $"climatology {name} differs by {v.GetProperty("max_abs").GetDouble():R}");
        }
        Assert.True(clim.GetProperty("tb_count").GetProperty("identical").GetBoolean());
        // anomalies inherit that float32 step of the climatology mean (Tb near 300 K: 2^-15 K)
        var anomaly = json.GetProperty("anomalies.nc").GetProperty("variables").GetProperty("anomaly");
        Assert.True(anomaly.GetProperty("same_missing").GetBoolean(), "the anomaly series are missing in other places");
        Assert.True(anomaly.GetProperty("max_abs").GetDouble() <= 320 * Math.Pow(2, -23), $"anomalies differ by {anomaly.GetProperty("max_abs").GetDouble():R}");
        // the gathered products name the same inputs with the same checksums, though each shard hashed only the files it read
        // (the anomalies also name their own folder's climatology, last)
        foreach (var file in new[] { "stats.nc", "similarity.nc", "climatology.nc", "anomalies.nc" })
            foreach (var key in new[] { "input_files", "input_sha256" })
            {
                string[] Lines(string which) => json.GetProperty(file).GetProperty(which).GetProperty(key).GetString()!.Split('\n');
                var (one, gathered) = (Lines("attributes_a"), Lines("attributes"));
                int record = file == "anomalies.nc" ? one.Length - 1 : one.Length;
                Assert.Equal(one.Length, gathered.Length);
                Assert.Equal(one[..record], gathered[..record]);
                if (file == "anomalies.nc" && key == "input_files") Assert.Equal(Path.Combine(sharded, "climatology.nc"), gathered[^1]);
            }
        var shardsAttribute = json.GetProperty("stats.nc").GetProperty("attributes").GetProperty("griddrift_shards").GetString()!;
        Assert.Equal(4, shardsAttribute.Split('\n').Length);
        for (int i = 1; i <= 4; i++) Assert.Contains($"shard {i}/4: frames", shardsAttribute);

        using var db = DuckDb.Open();
        foreach (var table in new[] { "stats.parquet", "similarity.parquet", "events_changepoints.parquet", "events.parquet" })
        {
            string a = Path.Combine(oneMachine, table), b = Path.Combine(sharded, table);
            long rows = Convert.ToInt64(DuckDb.Query(db, $"SELECT count(*) FROM read_parquet('{a}')")[0][0]);
            Assert.True(rows > 0, table);
            var differing = DuckDb.Query(db, $"SELECT count(*) FROM ((SELECT * FROM read_parquet('{a}') EXCEPT ALL SELECT * FROM read_parquet('{b}')) UNION ALL (SELECT * FROM read_parquet('{b}') EXCEPT ALL SELECT * FROM read_parquet('{a}')))");
            Assert.Equal(0L, Convert.ToInt64(differing[0][0]));
        }
    }
}
