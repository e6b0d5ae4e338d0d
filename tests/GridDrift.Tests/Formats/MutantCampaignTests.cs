using System.Text.Json;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;
using Xunit.Abstractions;

namespace GridDrift.Tests.Formats;

/// <summary>
/// The mutation campaign over every reader: seeds of every kind GridDrift reads (classic CDF-1,
/// CDF-2 and CDF-5 from GridDrift's writer; packed int16 classic, deflate+shuffle netCDF-4 and
/// netCDF-4 with strings and groups from python netCDF4) are truncated, bit-flipped, overwritten
/// and given huge lengths, in the header and in the data, from a fixed seed. Each mutant is read
/// by GridDrift (every variable, raw) and by python netCDF4 (the witness, also raw); the outcome
/// is refused, accepted and equal to netCDF4, accepted and different, a fault of GridDrift's own
/// (exit 3), or a hang. 300 mutants per seed in CI; GRIDDRIFT_CAMPAIGN_CASES=N for the on-demand campaign.
/// </summary>
public class MutantCampaignTests(ITestOutputHelper output)
{
    static readonly int Cases = int.TryParse(Environment.GetEnvironmentVariable("GRIDDRIFT_CAMPAIGN_CASES"), out var n) && n > 0 ? n : 300;

    enum Outcome { Refused, AcceptedEqual, AcceptedDifferent, AcceptedWhereNetcdfRefuses, Fault, Hang }

    [InteropFact(Needs.PythonNetcdf)]
    public void Mutants_are_refused_or_read_as_netCDF4_reads_them_and_never_crash_or_hang()
    {
        using var dir = new TempFolder();
        ExternalTools.RunPython("make_mutation_seeds.py", dir.Path);
        var seeds = new Dictionary<string, string>
        {
            ["classic CDF-1"] = SampleFiles.Record(dir.File("cdf1.nc"), ClassicVariant.Cdf1, frames: 4, nlat: 6, nlon: 8),
            ["classic CDF-2"] = SampleFiles.Record(dir.File("cdf2.nc"), ClassicVariant.Cdf2, frames: 4, nlat: 6, nlon: 8),
            ["classic CDF-5"] = SampleFiles.Record(dir.File("cdf5.nc"), ClassicVariant.Cdf5, frames: 4, nlat: 6, nlon: 8),
            ["packed int16"] = dir.File("packed.nc"),
            ["netCDF-4 deflate"] = dir.File("deflate.nc"),
            ["netCDF-4 strings"] = dir.File("strings.nc"),
        };
        var random = new Random(20261202);
        var mutants = new List<(string Seed, string Path)>();
        foreach (var (kind, seed) in seeds)
        {
            mutants.Add((kind, seed)); // the seed itself: must read as netCDF4 reads it
            var bytes = File.ReadAllBytes(seed);
            for (int k = 0; k < Cases; k++)
            {
                string path = dir.File($"{Path.GetFileNameWithoutExtension(seed)}_{k}.nc");
                File.WriteAllBytes(path, Mutate(bytes, random));
                mutants.Add((kind, path));
            }
        }
        var witness = NetcdfWitness.Digests(dir.File("list.txt"), mutants.Select(m => m.Path).ToList());

        var counts = seeds.Keys.ToDictionary(k => k, _ => new int[Enum.GetValues<Outcome>().Length]);
        var examples = new List<string>();
        foreach (var (kind, path) in mutants)
        {
            var outcome = Judge(path, witness[path], out string why);
            counts[kind][(int)outcome]++;
            if (outcome is Outcome.Fault or Outcome.Hang or Outcome.AcceptedDifferent or Outcome.AcceptedWhereNetcdfRefuses)
            {
                if (examples.Count < 10 && outcome != Outcome.AcceptedWhereNetcdfRefuses) examples.Add($"{outcome} {Path.GetFileName(path)}: {why}");
                // GRIDDRIFT_CAMPAIGN_KEEP=DIR keeps the mutants that went wrong, to look into
                if (Environment.GetEnvironmentVariable("GRIDDRIFT_CAMPAIGN_KEEP") is { Length: > 0 } keep)
                {
                    Directory.CreateDirectory(keep);
                    File.Copy(path, Path.Combine(keep, Path.GetFileName(path)), overwrite: true);
                }
            }
            if (path == seeds[kind]) Assert.True(outcome == Outcome.AcceptedEqual, $"the seed {kind} itself: {outcome} {why}");
        }
        output.WriteLine($"{"seed",-18} {"refused",8} {"equal",8} {"different",10} {"netCDF4 refuses",16} {"exit 3",7} {"hang",5}");
        foreach (var (kind, c) in counts)
            output.WriteLine($"{kind,-18} {c[0],8} {c[1],8} {c[2],10} {c[3],16} {c[4],7} {c[5],5}");
        foreach (var e in examples) output.WriteLine(e);
        Assert.Equal(0, counts.Values.Sum(c => c[(int)Outcome.Fault]));
        Assert.Equal(0, counts.Values.Sum(c => c[(int)Outcome.Hang]));
    }

    /// <summary>One mutation: a truncation, 1–3 bit flips, a run of overwritten bytes, or a huge 32-bit length, in the header (first kilobyte) or in the data.</summary>
    static byte[] Mutate(byte[] original, Random random)
    {
        var bytes = (byte[])original.Clone();
        bool header = random.Next(2) == 0 || bytes.Length <= 1024;
        int lo = header ? 4 : 1024, hi = header ? Math.Min(1024, bytes.Length) : bytes.Length;
        int at = random.Next(lo, hi);
        switch (random.Next(4))
        {
            case 0: return bytes[..Math.Max(1, at)];
            case 1:
                for (int i = random.Next(1, 4); i > 0; i--) { int p = random.Next(lo, hi); bytes[p] ^= (byte)(1 << random.Next(8)); }
                return bytes;
            case 2:
                for (int i = 0, run = random.Next(1, 9); i < run && at + i < bytes.Length; i++) bytes[at + i] = (byte)random.Next(256);
                return bytes;
            default:
                at -= at % 4;
                if (at + 4 <= bytes.Length) System.Buffers.Binary.BinaryPrimitives.WriteUInt32BigEndian(bytes.AsSpan(at), random.Next(2) == 0 ? 0x7FFFFFFFu : 0xFFFFFFFFu);
                return bytes;
        }
    }

    static Outcome Judge(string path, JsonElement witness, out string why)
    {
        why = "";
        Dictionary<string, (long[] Shape, double Sum, long NonFinite, string[]? Text)>? ours = null;
        Exception? fault = null;
        var task = Task.Run(() =>
        {
            try { ours = Digest(path); }
            catch (BadInputException) { }
            catch (Exception e) { fault = e; }
        });
        if (!task.Wait(TimeSpan.FromSeconds(20))) { why = "no answer in 20 s"; return Outcome.Hang; }
        if (fault is not null) { why = $"{fault.GetType().Name}: {fault.Message}"; return Outcome.Fault; }
        bool netcdfRefuses = NetcdfWitness.Refuses(witness);
        if (ours is null) return Outcome.Refused;
        if (netcdfRefuses) return Outcome.AcceptedWhereNetcdfRefuses;
        foreach (var v in witness.GetProperty("variables").EnumerateObject())
        {
            if (!ours.TryGetValue(v.Name, out var mine)) { why = $"variable {v.Name} missing"; return Outcome.AcceptedDifferent; }
            var shape = v.Value.GetProperty("shape").EnumerateArray().Select(e => e.GetInt64()).ToArray();
            if (!shape.SequenceEqual(mine.Shape)) { why = $"{v.Name} shape {string.Join("x", mine.Shape)} against {string.Join("x", shape)}"; return Outcome.AcceptedDifferent; }
            if (v.Value.TryGetProperty("text", out var text))
            {
                if (mine.Text is null || !text.EnumerateArray().Select(t => t.GetString()).SequenceEqual(mine.Text)) { why = $"{v.Name} text differs"; return Outcome.AcceptedDifferent; }
                continue;
            }
            double sum = v.Value.GetProperty("sum").GetDouble();
            long nonFinite = v.Value.GetProperty("nonfinite").GetInt64();
            if (nonFinite != mine.NonFinite || Math.Abs(sum - mine.Sum) > 1e-9 * Math.Max(1, Math.Abs(sum)))
            {
                why = $"{v.Name} sum {mine.Sum:R} ({mine.NonFinite} non-finite) against {sum:R} ({nonFinite})";
                return Outcome.AcceptedDifferent;
            }
        }
        return Outcome.AcceptedEqual;
    }

    /// <summary>GridDrift's reading of every variable, raw: shape, sum of finite values, count of non-finite ones, or the text.</summary>
    static Dictionary<string, (long[] Shape, double Sum, long NonFinite, string[]? Text)> Digest(string path)
    {
        using var reader = DatasetFiles.Open(path);
        var result = new Dictionary<string, (long[], double, long, string[]?)>();
        foreach (var v in reader.Variables)
        {
            if (v.Type is NcType.String || v.Type is NcType.Char) { result[v.Name] = (v.Shape, 0, 0, v.Type == NcType.String ? reader.ReadStrings(v) : null); continue; }
            if (v.ElementCount > 1 << 24) throw new BadInputException(path, v.Name, "larger than any seed");
            var values = reader.ReadAllDoubles(v);
            double sum = 0;
            long nonFinite = 0;
            foreach (var x in values) if (double.IsFinite(x)) sum += x; else nonFinite++;
            result[v.Name] = (v.Shape, sum, nonFinite, null);
        }
        return result;
    }
}
