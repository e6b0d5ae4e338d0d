using System.Runtime.InteropServices;
using System.Text;

namespace GridDrift.Formats.Grib;

/// <summary>
/// ecCodes, the WMO-standard GRIB decoder maintained at ECMWF (Debian: libeccodes0 with
/// libeccodes-data), through its C API, loaded the first time a GRIB file is opened. Without it a
/// GRIB file is bad input naming the package. Each message gets its own handle, so messages are
/// decoded on several threads at once.
/// </summary>
internal static unsafe class Eccodes
{
    public const string Missing = "GRIB files need the ecCodes library (Debian packages libeccodes0 and libeccodes-data)";

    static readonly Lazy<IntPtr> Library = new(() =>
    {
        if (!(NativeLibrary.TryLoad("libeccodes.so.0", out var h) || NativeLibrary.TryLoad("libeccodes.so", out h) || NativeLibrary.TryLoad("eccodes", out h))) return IntPtr.Zero;
        KeepLargeBlocksOnTheHeap();
        return h;
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

    public static bool Available => Library.Value != IntPtr.Zero;

    static readonly Lazy<Api> Functions = new(() =>
    {
        if (!Available) throw new InvalidDataException(Missing);
        IntPtr F(string name) => NativeLibrary.GetExport(Library.Value, name);
        return new Api
        {
            NewFromMessage = (delegate* unmanaged<void*, void*, nuint, void*>)F("codes_handle_new_from_message"),
            Delete = (delegate* unmanaged<void*, int>)F("codes_handle_delete"),
            GetLong = (delegate* unmanaged<void*, byte*, long*, int>)F("codes_get_long"),
            GetDouble = (delegate* unmanaged<void*, byte*, double*, int>)F("codes_get_double"),
            GetString = (delegate* unmanaged<void*, byte*, byte*, nuint*, int>)F("codes_get_string"),
            GetSize = (delegate* unmanaged<void*, byte*, nuint*, int>)F("codes_get_size"),
            GetDoubles = (delegate* unmanaged<void*, byte*, double*, nuint*, int>)F("codes_get_double_array"),
            IsDefined = (delegate* unmanaged<void*, byte*, int>)F("codes_is_defined"),
            SetDouble = (delegate* unmanaged<void*, byte*, double, int>)F("codes_set_double"),
        };
    });

    sealed class Api
    {
        public delegate* unmanaged<void*, void*, nuint, void*> NewFromMessage;
        public delegate* unmanaged<void*, int> Delete;
        public delegate* unmanaged<void*, byte*, long*, int> GetLong;
        public delegate* unmanaged<void*, byte*, double*, int> GetDouble;
        public delegate* unmanaged<void*, byte*, byte*, nuint*, int> GetString;
        public delegate* unmanaged<void*, byte*, nuint*, int> GetSize;
        public delegate* unmanaged<void*, byte*, double*, nuint*, int> GetDoubles;
        public delegate* unmanaged<void*, byte*, int> IsDefined;
        public delegate* unmanaged<void*, byte*, double, int> SetDouble;
    }

    /// <summary>A decoded view of one message, over bytes that outlive it; ecCodes does not copy them.</summary>
    public sealed class Message : IDisposable
    {
        void* _handle;
        readonly string _where;

        public Message(byte* bytes, long length, string where)
        {
            _where = where;
            _handle = Functions.Value.NewFromMessage(null, bytes, (nuint)length);
            if (_handle == null) throw new InvalidDataException($"{where}: ecCodes cannot decode the message");
        }

        static byte[] Key(string key) => Encoding.ASCII.GetBytes(key + "\0");

        public bool Has(string key)
        {
            fixed (byte* k = Key(key)) return Functions.Value.IsDefined(_handle, k) != 0;
        }

        public long Long(string key) => LongOrNull(key) ?? throw new InvalidDataException($"{_where}: the message has no '{key}'");

        public long? LongOrNull(string key)
        {
            long value;
            fixed (byte* k = Key(key))
                return Functions.Value.GetLong(_handle, k, &value) == 0 ? value : null;
        }

        public double Double(string key)
        {
            double value;
            fixed (byte* k = Key(key))
                return Functions.Value.GetDouble(_handle, k, &value) == 0 ? value : throw new InvalidDataException($"{_where}: the message has no '{key}'");
        }

        public string? Text(string key)
        {
            var buffer = new byte[256];
            nuint length = (nuint)buffer.Length;
            fixed (byte* k = Key(key))
            fixed (byte* b = buffer)
            {
                if (Functions.Value.GetString(_handle, k, b, &length) != 0) return null;
            }
            int end = Array.IndexOf(buffer, (byte)0);
            return Encoding.ASCII.GetString(buffer, 0, end < 0 ? (int)length : end);
        }

        public double[] Doubles(string key)
        {
            nuint size;
            fixed (byte* k = Key(key))
            {
                if (Functions.Value.GetSize(_handle, k, &size) != 0) throw new InvalidDataException($"{_where}: the message has no '{key}'");
                var values = new double[(int)size];
                fixed (double* v = values)
                    if (Functions.Value.GetDoubles(_handle, k, v, &size) != 0) throw new InvalidDataException($"{_where}: ecCodes cannot decode '{key}'");
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
                fixed (byte* k = Key("missingValue")) Functions.Value.SetDouble(_handle, k, Marker);
            nuint size = (nuint)target.Length;
            if (scratch.Length < target.Length) throw new ArgumentException("scratch too small", nameof(scratch));
            fixed (byte* k = Key("values"))
            fixed (double* v = scratch)
            {
                // ecCodes refuses a buffer too small and gives back how many values it wrote
                if (Functions.Value.GetDoubles(_handle, k, v, &size) != 0 || size != (nuint)target.Length)
                    throw new InvalidDataException($"{_where}: the message's values do not fill its grid of {target.Length} points");
            }
            var values = scratch.AsSpan(0, target.Length);
            System.Numerics.Tensors.TensorPrimitives.ConvertTruncating<double, float>(values, target);
            if (bitmap)
                for (int i = 0; i < values.Length; i++)
                    if (values[i] == Marker) target[i] = float.NaN;
        }

        public void Dispose()
        {
            if (_handle == null) return;
            Functions.Value.Delete(_handle);
            _handle = null;
        }
    }
}
