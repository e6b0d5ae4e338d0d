using CsCheck;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Formats;

/// <summary>
/// Property: flipping bytes of a valid classic header gives either a clean refusal
/// (<see cref="BadInputException"/>) or a file whose every variable reads within bounds — never
/// another exception, a hang or an allocation sized by a corrupt count. A few hundred cases in
/// CI; GRIDDRIFT_MUTATION_CASES=10000 for the on-demand run.
/// </summary>
public class MutatedHeaderPropertyTests
{
    static readonly int Cases = int.TryParse(Environment.GetEnvironmentVariable("GRIDDRIFT_MUTATION_CASES"), out var n) ? n : 300;

    static byte[] ValidFile(ClassicVariant variant)
    {
        using var dir = new TempFolder();
        string path = dir.File("base.nc");
        using (var w = ClassicWriter.Create(path, variant, headerReserve: 0))
        {
            var time = w.AddDimension("time", 0, unlimited: true);
            var y = w.AddDimension("y", 3);
            var x = w.AddDimension("x", 2);
            w.AddAttribute(NcAttribute.Text("title", "mutation base"));
            var t = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "days since 2031-01-01")]);
            var a = w.AddVariable("a", NcType.Short, [time, y, x], [NcAttribute.Of("scale_factor", 0.5f)]);
            var b = w.AddVariable("b", NcType.Float, [y, x]);
            w.EndDefinitions();
            w.Write<float>(b, [1, 2, 3, 4, 5, 6]);
            for (int r = 0; r < 3; r++)
            {
                w.WriteRecord<double>(t, r, [r]);
                w.WriteRecord<short>(a, r, [1, 2, 3, 4, 5, (short)r]);
            }
            w.Commit();
        }
        return File.ReadAllBytes(path);
    }

    [Theory]
    [InlineData(ClassicVariant.Cdf1)]
    [InlineData(ClassicVariant.Cdf2)]
    [InlineData(ClassicVariant.Cdf5)]
    public void Mutated_headers_are_refused_cleanly_or_read_within_bounds(ClassicVariant variant)
    {
        var original = ValidFile(variant);
        int headerLength;
        using (var dir = new TempFolder())
        {
            File.WriteAllBytes(dir.File("h.nc"), original);
            using var r = ClassicReader.Open(dir.File("h.nc"));
            headerLength = (int)Math.Min(original.Length, 4 + r.Variables.Count * 64 + 128);
        }
        using var scratch = new TempFolder();
        var mutation = Gen.Select(Gen.Int[4, headerLength - 1].Array[1, 6], Gen.Byte.Array[6]);
        int refused = 0, read = 0;
        mutation.Sample((positions, values) =>
        {
            var bytes = (byte[])original.Clone();
            for (int i = 0; i < positions.Length; i++) bytes[positions[i]] = values[i];
            string path = scratch.File($"m{Environment.CurrentManagedThreadId}.nc");
            File.WriteAllBytes(path, bytes);
            long before = GC.GetAllocatedBytesForCurrentThread();
            try
            {
                using var reader = DatasetFiles.Open(path);
                foreach (var v in reader.Variables)
                {
                    long bytesNeeded = v.ElementCount * NcTypes.SizeOf(v.Type);
                    Assert.True(bytesNeeded <= bytes.Length, $"{v.Name} claims {bytesNeeded} bytes in a {bytes.Length}-byte file and was not refused");
                    var buffer = new byte[bytesNeeded];
                    reader.ReadRaw(v, new long[v.Rank], v.Shape, buffer);
                }
                Interlocked.Increment(ref read);
            }
            catch (BadInputException)
            {
                Interlocked.Increment(ref refused);
            }
            long allocated = GC.GetAllocatedBytesForCurrentThread() - before;
            Assert.True(allocated < 4 << 20, $"a {bytes.Length}-byte file made {allocated} bytes of allocations");
        }, iter: Cases, threads: 1);
        Assert.True(refused > 0, "no mutation was refused: the property test exercised nothing");
        Assert.True(read > 0, "no mutation left a readable file: the property test never checked a read");
    }
}
