using System.Text;
using GridDrift.Formats;
using GridDrift.Formats.Hdf5;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Formats;

/// <summary>
/// HDF5 metadata checksums (HDF5 File Format Specification 3.0: superblock version 2+, version-2
/// object headers and their continuation chunks, version-2 B-tree headers and nodes, fractal heap
/// headers and blocks, chunk index headers; all with Jenkins' lookup3). Files the HDF5 library
/// wrote must verify; a flipped bit inside any structure verified must be refused, as python
/// netCDF4 (netCDF-C over the HDF5 library) refuses it.
/// </summary>
public class Hdf5ChecksumTests
{
    /// <summary>Test values printed by the self-test of Bob Jenkins' lookup3.c (driver5), quoted from memory.</summary>
    [Theory]
    [InlineData("", 0u, 0xdeadbeefu)]
    [InlineData("", 0xdeadbeefu, 0xbd5b7ddeu)]
    [InlineData("Four score and seven years ago", 0u, 0x17770551u)]
    [InlineData("Four score and seven years ago", 1u, 0xcd628161u)]
    public void Lookup3_gives_the_published_test_values(string text, uint initial, uint expected) =>
        Assert.Equal(expected, Lookup3.Hash(Encoding.ASCII.GetBytes(text), initial));

    static string[] SharedHdf5Files() =>
        SharedData.InteropFiles().Append(SharedData.Reanalysis("basin_mask.nc"))
            .Where(f => File.ReadAllBytes(f) is [0x89, (byte)'H', (byte)'D', (byte)'F', ..]).ToArray();

    /// <summary>
    /// Every HDF5 file netCDF-C's own test suite ships (and the shared reanalysis mask) that python
    /// netCDF4 opens verifies, and the walk reaches every checksummed kind those files hold: the
    /// kinds present are counted from the files' bytes by signature, independently of the walk.
    /// </summary>
    [InteropFact(Needs.PythonNetcdf | Needs.SharedData)]
    public void Files_the_HDF5_library_wrote_verify_and_every_checksummed_kind_is_reached()
    {
        using var dir = new TempFolder();
        var files = SharedHdf5Files();
        var witness = NetcdfWitness.Digests(dir.File("witness.txt"), files);
        var reached = new HashSet<string>();
        var present = new HashSet<string>();
        int opened = 0;
        foreach (var file in files.Where(f => !NetcdfWitness.Refuses(witness[f])))
        {
            using var reader = (Hdf5Reader)DatasetFiles.Open(file);
            opened++;
            reached.UnionWith(reader.VerifiedMetadata.Select(v => v.Kind));
            var bytes = File.ReadAllBytes(file);
            foreach (var kind in new[] { "OHDR", "OCHK", "BTHD", "BTIN", "BTLF", "FRHP", "FHIB", "FHDB" })
                if (bytes.AsSpan().IndexOf(Encoding.ASCII.GetBytes(kind)) >= 0) present.Add(kind);
        }
        Assert.True(opened >= 8, $"only {opened} shared HDF5 files open in python netCDF4");
        Assert.Subset(reached, present);
        Assert.Contains("superblock", reached);
    }

    /// <summary>
    /// One bit flipped at a random place inside each checksummed structure GridDrift verifies (up to
    /// 40 per file, seeded) is refused, and python netCDF4 refuses the same file.
    /// </summary>
    [InteropFact(Needs.PythonNetcdf | Needs.SharedData)]
    public void A_flipped_bit_in_any_verified_structure_is_refused_as_netCDF_C_refuses_it()
    {
        using var dir = new TempFolder();
        ExternalTools.RunPython("make_mutation_seeds.py", dir.Path);
        var sources = new[] { dir.File("deflate.nc"), dir.File("strings.nc"), SharedData.Interop("nctest_netcdf4_classic.nc"), SharedData.Interop("ref_tst_interops4.nc") };
        var random = new Random(20261203);
        var mutants = new List<(string Path, string Kind, long At)>();
        foreach (var source in sources)
        {
            List<(string Kind, long At, int Covered)> structures;
            using (var reader = (Hdf5Reader)DatasetFiles.Open(source)) structures = reader.VerifiedMetadata.ToList();
            var bytes = File.ReadAllBytes(source);
            foreach (var (kind, at, covered) in structures.OrderBy(_ => random.Next()).Take(40))
            {
                var copy = (byte[])bytes.Clone();
                long where = at + random.Next(covered);
                copy[where] ^= (byte)(1 << random.Next(8));
                string path = dir.File($"{Path.GetFileNameWithoutExtension(source)}_{kind}_{where}.nc");
                File.WriteAllBytes(path, copy);
                mutants.Add((path, kind, where));
            }
        }
        Assert.Contains(mutants, m => m.Kind == "BTIN");
        Assert.Contains(mutants, m => m.Kind == "FHDB");
        var witness = NetcdfWitness.Digests(dir.File("witness.txt"), mutants.Select(m => m.Path).ToArray());
        var accepted = new List<string>();
        var netcdfReads = new List<string>();
        foreach (var (path, kind, at) in mutants)
        {
            var e = Record.Exception(() => DatasetFiles.Open(path).Dispose());
            if (e is not BadInputException) accepted.Add($"{kind} byte {at}: {e?.Message ?? "read"}");
            if (!NetcdfWitness.Refuses(witness[path])) netcdfReads.Add($"{kind} byte {at}");
        }
        Assert.Empty(accepted);
        // netCDF-C does not read the name-index B-trees of dense groups when it opens a file (seen here: flips there
        // pass it unseen); GridDrift refuses the damaged file all the same. Every other structure it reads, and refuses.
        Assert.DoesNotContain(netcdfReads, m => !m.StartsWith("BT", StringComparison.Ordinal));
    }
}
