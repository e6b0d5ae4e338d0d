using System.Reflection;
using PureHDF;

namespace GridDrift.Formats.Hdf5;

/// <summary>
/// Big-endian netCDF-4 data (files from big-endian machines, or variables created with
/// endian = "big"): PureHDF 2.2.0 refuses them ("Byte order conversion is not (yet)
/// supported"). GridDrift reads such values as raw bytes and swaps them itself: attributes from
/// the attribute message's raw bytes, datasets by marking the type little-endian for PureHDF and
/// swapping after every read. Both go through PureHDF internals, found by reflection; where
/// they are missing, big-endian data stay refused with PureHDF's message.
/// </summary>
internal static class Hdf5ByteOrder
{
    const BindingFlags Internal = BindingFlags.NonPublic | BindingFlags.Public | BindingFlags.Instance;

    static object? BitField(IH5DataType type)
    {
        var message = type.GetType().GetField("_dataType", Internal)?.GetValue(type);
        return message?.GetType().GetProperty("BitField", Internal)?.GetValue(message);
    }

    public static bool IsBigEndian(IH5DataType type) =>
        BitField(type)?.GetType().GetProperty("ByteOrder", Internal)?.GetValue(BitField(type))?.ToString() == "BigEndian";

    /// <summary>Relabels the type little-endian so PureHDF hands over the bytes unchanged; true on success.</summary>
    public static bool RelabelLittleEndian(IH5DataType type)
    {
        var bits = BitField(type);
        var field = bits?.GetType().GetField("<ByteOrder>k__BackingField", Internal);
        if (bits is null || field is null) return false;
        field.SetValue(bits, Enum.Parse(field.FieldType, "LittleEndian"));
        return !IsBigEndian(type);
    }

    /// <summary>The raw (file-order) bytes of an attribute's values, or null when unavailable.</summary>
    public static byte[]? AttributeBytes(IH5Attribute attribute)
    {
        var message = attribute.GetType().GetProperty("Message", Internal)?.GetValue(attribute);
        var data = message?.GetType().GetProperty("InputData", Internal)?.GetValue(message);
        return data is Memory<byte> memory ? memory.ToArray() : null;
    }
}
