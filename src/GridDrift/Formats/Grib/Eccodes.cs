using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using System.Text;

namespace GridDrift.Formats.Grib;

/// <summary>
/// ecCodes, the WMO-standard GRIB decoder maintained at ECMWF (Debian: libeccodes0 with
/// libeccodes-data), through its C API, loaded the first time a GRIB file is opened. Without it a
/// GRIB file is bad input naming the package. Each message gets its own handle, so messages are
/// decoded on several threads at once.
/// </summary>
internal static unsafe partial class Eccodes
{
    public const string Missing = "GRIB files need the ecCodes library (Debian packages libeccodes0 and libeccodes-data)";

    const string Name = "griddrift-eccodes";

    static readonly Lazy<bool> Loaded = new(() =>
    {
        WaitWithoutSpinning();
        if (!NativeLibraries.TryBind(Name, ["libeccodes.so.0", "libeccodes.so", "eccodes"], out _)) return false;
        KeepLargeBlocksOnTheHeap();
        codes_context_set_logging_proc(codes_context_get_default(), &Log);
        return true;
    });

    /// <summary>
    /// ecCodes allocates a message's buffers with malloc, megabytes each; glibc serves blocks over
    /// its threshold by fresh mappings whose pages fault in one by one, every message. Raising the
    /// threshold to 32 MB (mallopt M_MMAP_THRESHOLD) lets freed blocks be reused: a handle and its
    /// values took 2.4 ms instead of 3.6 ms for 1 M points here. Only where glibc is the C library.
    /// </summary>
    static void KeepLargeBlocksOnTheHeap()
    {
        if (!OperatingSystem.IsLinux() || !NativeLibrary.TryLoad("libc.so.6", out var libc) || !NativeLibrary.TryGetExport(libc, "mallopt", out var mallopt)) return;
        const int MmapThreshold = -3;
        ((delegate* unmanaged<int, int, int>)mallopt)(MmapThreshold, 32 << 20);
    }

    /// <summary>
    /// ecCodes guards its shared tables (key names, definitions) with OpenMP locks, taken many
    /// times per message. libgomp's default is to wait for a lock by spinning, and with one
    /// decoding thread per core the spinning took the cores from the decoding: two threads
    /// decoded a 1 M-point frame every 1.4 ms, against 1.0 ms when waiting threads sleep
    /// (OMP_WAIT_POLICY=PASSIVE). Set before the library loads, as libgomp reads it then, and
    /// only when the user has not chosen a policy.
    /// </summary>
    static void WaitWithoutSpinning()
    {
        if (Environment.GetEnvironmentVariable("OMP_WAIT_POLICY") is not null) return;
        if (!OperatingSystem.IsLinux() || !NativeLibrary.TryLoad("libc.so.6", out var libc) || !NativeLibrary.TryGetExport(libc, "setenv", out var setenv)) return;
        fixed (byte* name = "OMP_WAIT_POLICY\0"u8)
        fixed (byte* value = "PASSIVE\0"u8)
            ((delegate* unmanaged<byte*, byte*, int, int>)setenv)(name, value, 0);
    }

    public static bool Available => Loaded.Value;

    [ThreadStatic] static string? _lastError; // the first since ForgetError

    /// <summary>
    /// ecCodes' own messages, which it would print to stderr: bad input must end in one line, so
    /// the first error on each thread (the cause; later ones follow from it) is kept for the line
    /// GridDrift writes, and the rest is dropped.
    /// </summary>
    [System.Runtime.InteropServices.UnmanagedCallersOnly]
    static void Log(void* context, int level, byte* message)
    {
        const int Error = 2, Fatal = 3; // GRIB_LOG_ERROR, GRIB_LOG_FATAL; higher bits are flags
        if ((level & 0xFF) is Error or Fatal && message != null) _lastError ??= Marshal.PtrToStringUTF8((IntPtr)message)?.Trim();
    }

    /// <summary>The first error ecCodes reported on this thread since <see cref="ForgetError"/>, as " (ecCodes: …)", or empty.</summary>
    static string LastError() => _lastError is { Length: > 0 } e ? $" (ecCodes: {e})" : "";

    static void ForgetError() => _lastError = null;

    static void Require()
    {
        if (!Available) throw new InvalidDataException(Missing);
    }

    [LibraryImport(Name)] private static partial void* codes_handle_new_from_message(void* context, void* data, nuint length);
    [LibraryImport(Name)] private static partial void* codes_handle_new_from_partial_message(void* context, void* data, nuint length);
    [LibraryImport(Name)] private static partial int codes_handle_delete(void* handle);
    [LibraryImport(Name)] private static partial long codes_get_api_version();
    [LibraryImport(Name)] private static partial void* codes_context_get_default();
    [LibraryImport(Name)] private static partial void codes_context_set_logging_proc(void* context, delegate* unmanaged<void*, int, byte*, void> log);
    [LibraryImport(Name)] private static partial void* codes_handle_new_from_file(void* context, IntPtr file, int product, int* error);
    [LibraryImport(Name)] private static partial int codes_get_message_size(void* handle, nuint* size);
    [LibraryImport(Name)] private static partial int codes_get_message_offset(void* handle, long* offset);
    [LibraryImport("libc.so.6", StringMarshalling = StringMarshalling.Utf8)] private static partial IntPtr fopen(string path, string mode);
    [LibraryImport("libc.so.6")] private static partial int fseeko(IntPtr stream, long offset, int whence);
    [LibraryImport("libc.so.6")] private static partial int fclose(IntPtr stream);
    [LibraryImport(Name)] private static partial int codes_get_long(void* handle, byte* key, long* value);
    [LibraryImport(Name)] private static partial int codes_get_double(void* handle, byte* key, double* value);
    [LibraryImport(Name)] private static partial int codes_get_string(void* handle, byte* key, byte* value, nuint* length);
    [LibraryImport(Name)] private static partial int codes_get_size(void* handle, byte* key, nuint* size);
    [LibraryImport(Name)] private static partial int codes_get_double_array(void* handle, byte* key, double* values, nuint* length);
    [LibraryImport(Name)] private static partial int codes_is_defined(void* handle, byte* key);
    [LibraryImport(Name)] private static partial int codes_set_double(void* handle, byte* key, double value);

    /// <summary>ecCodes' version and where its definitions come from: what its names and keys depend on besides the message.</summary>
    public static string Identity()
    {
        Require();
        return codes_get_api_version().ToString(System.Globalization.CultureInfo.InvariantCulture) + "\t" + Environment.GetEnvironmentVariable("ECCODES_DEFINITION_PATH");
    }

    /// <summary>
    /// The length of the message at byte <paramref name="offset"/> as ecCodes' own reader finds it.
    /// GRIB 1 messages over 8 MB do not fit the 3-byte length field; ECMWF's coding of them scales
    /// the field and needs the data section to resolve, which ecCodes does as it reads the message.
    /// </summary>
    public static long MessageLengthAt(string path, long offset)
    {
        Require();
        const int ProductGrib = 1, FromStart = 0;
        var file = fopen(path, "rb");
        if (file == IntPtr.Zero) throw new InvalidDataException("ecCodes cannot open the file");
        try
        {
            if (fseeko(file, offset, FromStart) != 0) throw new InvalidDataException($"message at byte {offset}: ecCodes cannot seek to it");
            int error;
            void* handle = codes_handle_new_from_file(null, file, ProductGrib, &error);
            if (handle == null) throw new InvalidDataException($"message at byte {offset}: ecCodes cannot read it (error {error})");
            try
            {
                nuint size;
                long at;
                if (codes_get_message_size(handle, &size) != 0 || codes_get_message_offset(handle, &at) != 0 || at != offset)
                    throw new InvalidDataException($"message at byte {offset}: ecCodes reads another extent");
                return (long)size;
            }
            finally { codes_handle_delete(handle); }
        }
        finally { fclose(file); }
    }

    /// <summary>A decoded view of one message, over bytes that outlive it; ecCodes does not copy them.</summary>
    public sealed class Message : IDisposable
    {
        void* _handle;
        readonly string _where;

        /// <param name="headersOnly">
        /// The bytes are a GRIB 2 message's sections before its data (a partial handle): every
        /// key but the values and the grid's coordinates, at half the cost of a whole handle.
        /// </param>
        public Message(byte* bytes, long length, string where, bool headersOnly = false)
        {
            _where = where;
            Require();
            ForgetError();
            _handle = headersOnly ? codes_handle_new_from_partial_message(null, bytes, (nuint)length) : codes_handle_new_from_message(null, bytes, (nuint)length);
            if (_handle == null) throw new InvalidDataException($"{where}: ecCodes cannot decode the message{LastError()}");
        }

        static byte[] Key(string key) => Encoding.ASCII.GetBytes(key + "\0");

        public bool Has(string key)
        {
            fixed (byte* k = Key(key)) return codes_is_defined(_handle, k) != 0;
        }

        public long Long(string key) => LongOrNull(key) ?? throw new InvalidDataException($"{_where}: the message has no '{key}'{LastError()}");

        public long? LongOrNull(string key)
        {
            long value;
            fixed (byte* k = Key(key))
                return codes_get_long(_handle, k, &value) == 0 ? value : null;
        }

        public double Double(string key)
        {
            double value;
            fixed (byte* k = Key(key))
                return codes_get_double(_handle, k, &value) == 0 ? value : throw new InvalidDataException($"{_where}: the message has no '{key}'{LastError()}");
        }

        public string? Text(string key)
        {
            var buffer = new byte[256];
            nuint length = (nuint)buffer.Length;
            fixed (byte* k = Key(key))
            fixed (byte* b = buffer)
            {
                if (codes_get_string(_handle, k, b, &length) != 0) return null;
            }
            int end = Array.IndexOf(buffer, (byte)0);
            return Encoding.ASCII.GetString(buffer, 0, end < 0 ? (int)length : end);
        }

        public double[] Doubles(string key)
        {
            nuint size;
            fixed (byte* k = Key(key))
            {
                if (codes_get_size(_handle, k, &size) != 0) throw new InvalidDataException($"{_where}: the message has no '{key}'{LastError()}");
                var values = new double[(int)size];
                fixed (double* v = values)
                    if (codes_get_double_array(_handle, k, v, &size) != 0) throw new InvalidDataException($"{_where}: ecCodes cannot decode '{key}'{LastError()}");
                return values;
            }
        }

        /// <summary>
        /// The message's values in its own scanning order, as float32; with a bitmap, the points it
        /// leaves out are NaN (ecCodes gives them the missing value, set first to a number no
        /// packing produces for a present point). <paramref name="scratch"/> holds the doubles.
        /// </summary>
        public void Values(Span<float> target, double[] scratch, bool bitmap)
        {
            const double Marker = 9.9989e300;
            if (bitmap)
                fixed (byte* k = Key("missingValue")) codes_set_double(_handle, k, Marker);
            nuint size = (nuint)target.Length;
            if (scratch.Length < target.Length) throw new ArgumentException("scratch too small", nameof(scratch));
            fixed (byte* k = Key("values"))
            fixed (double* v = scratch)
            {
                // ecCodes refuses a buffer too small and gives back how many values it wrote
                if (codes_get_double_array(_handle, k, v, &size) != 0 || size != (nuint)target.Length)
                    throw new InvalidDataException($"{_where}: the message's values do not fill its grid of {target.Length} points{LastError()}");
            }
            Narrow(scratch.AsSpan(0, target.Length), target, bitmap ? Marker : double.NaN);
        }

        /// <summary>
        /// The doubles as float32, <paramref name="missing"/> as NaN, in vector lanes; compiled
        /// optimized from its first call, as it runs once a frame over every point.
        /// </summary>
        [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
        static void Narrow(ReadOnlySpan<double> values, Span<float> target, double missing)
        {
            int i = 0;
            if (Vector256.IsHardwareAccelerated)
            {
                var marker = Vector256.Create(missing);
                var nan = Vector256.Create(float.NaN);
                for (; i + 8 <= values.Length; i += 8)
                {
                    var low = Vector256.Create(values.Slice(i, 4));
                    var high = Vector256.Create(values.Slice(i + 4, 4));
                    var gone = Vector256.Narrow(Vector256.Equals(low, marker).AsInt64(), Vector256.Equals(high, marker).AsInt64());
                    Vector256.ConditionalSelect(gone.AsSingle(), nan, Vector256.Narrow(low, high)).CopyTo(target.Slice(i, 8));
                }
            }
            for (; i < values.Length; i++) target[i] = values[i] == missing ? float.NaN : (float)values[i];
        }

        public void Dispose()
        {
            if (_handle == null) return;
            codes_handle_delete(_handle);
            _handle = null;
        }
    }
}
