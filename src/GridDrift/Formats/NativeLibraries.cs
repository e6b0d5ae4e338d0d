using System.Collections.Concurrent;
using System.Runtime.InteropServices;

namespace GridDrift.Formats;

/// <summary>
/// The optional C libraries (netCDF-C, ecCodes, blosc, zstd), each loaded the first time it is
/// needed and only if present, then bound to its declared imports by a logical name. One
/// resolver serves them all: the runtime takes one per assembly.
/// </summary>
/// <remarks>
/// Imports are declared (<see cref="LibraryImportAttribute"/>) rather than called through
/// function pointers because the runtime's import stubs clear the upper halves of the vector
/// registers (vzeroupper) before entering native code. Through a function pointer called from
/// code not yet optimized they could stay dirty, and C libraries built for plain SSE2 then paid
/// the AVX-to-SSE penalty on every instruction: ecCodes decoded a 1 M-point frame in 4.4 ms
/// instead of 1.5 ms for a record's first ~40 frames.
/// </remarks>
internal static class NativeLibraries
{
    static readonly ConcurrentDictionary<string, IntPtr> Bound = new(StringComparer.Ordinal);

    static NativeLibraries() =>
        NativeLibrary.SetDllImportResolver(typeof(NativeLibraries).Assembly, (name, _, _) => Bound.TryGetValue(name, out var handle) ? handle : IntPtr.Zero);

    /// <summary>Loads the first of <paramref name="files"/> the loader finds and binds it to <paramref name="logicalName"/>; false when none loads.</summary>
    public static bool TryBind(string logicalName, IEnumerable<string> files, out string loaded)
    {
        foreach (var file in files)
            if (NativeLibrary.TryLoad(file, out var handle))
            {
                Bound[logicalName] = handle;
                loaded = file;
                return true;
            }
        loaded = "";
        return false;
    }
}
