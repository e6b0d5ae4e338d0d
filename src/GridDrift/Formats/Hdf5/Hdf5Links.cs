using System.Reflection;
using PureHDF;
using PureHDF.VOL.Native;

namespace GridDrift.Formats.Hdf5;

/// <summary>
/// A group's links, each opened on its own. PureHDF 2.2.0's public <c>Children()</c> opens every
/// object in one sweep, so one object header it cannot decode (it rejects some attribute
/// messages netCDF-C writes on dimension scales, with "The dataspace message version must be
/// in the range of 1..2") hides the whole file. Its internal link enumeration lets each object
/// fail alone; where that internal member is missing (another PureHDF version), this falls
/// back to the public sweep.
/// </summary>
internal static class Hdf5Links
{
    internal sealed record Link(string Name, ulong Address, NativeObject? Object, Exception? Error);

    const BindingFlags Internal = BindingFlags.NonPublic | BindingFlags.Public | BindingFlags.Instance;
    static readonly MethodInfo? EnumerateReferences = typeof(NativeGroup).GetMethod("EnumerateReferences", Internal);
    static readonly PropertyInfo? ObjectReference = typeof(NativeObject).GetProperty("Reference", Internal);
    static readonly FieldInfo? ReferenceAddress = typeof(NativeObjectReference1).GetField("Value", Internal);

    public static List<Link> Children(NativeGroup group)
    {
        if (EnumerateReferences is null)
            return group.Children().OfType<NativeObject>().Select(o => new Link(o.Name, AddressOf(o), o, null)).ToList();
        var access = Activator.CreateInstance(EnumerateReferences.GetParameters()[0].ParameterType);
        var links = new List<Link>();
        foreach (var reference in (System.Collections.IEnumerable)EnumerateReferences.Invoke(group, [access])!)
        {
            var type = reference.GetType();
            string name = (string)type.GetProperty("Name", Internal)!.GetValue(reference)!;
            ulong address = (ulong)type.GetProperty("Value", Internal)!.GetValue(reference)!;
            try
            {
                var obj = (NativeObject)type.GetMethod("Dereference", Internal)!.Invoke(reference, null)!;
                links.Add(new Link(name, address, obj, null));
            }
            catch (TargetInvocationException e) when (e.InnerException is not OutOfMemoryException)
            {
                links.Add(new Link(name, address, null, e.InnerException ?? e));
            }
        }
        return links;
    }

    public static ulong AddressOf(NativeObject obj)
    {
        if (ObjectReference?.GetValue(obj) is { } reference)
            return (ulong)reference.GetType().GetProperty("Value", Internal)!.GetValue(reference)!;
        return 0;
    }

    public static ulong AddressOf(NativeObjectReference1 reference) =>
        ReferenceAddress?.GetValue(reference) is ulong a ? a : 0;

    /// <summary>
    /// Whether a variable-length type is a string (HDF5 keeps the distinction in the type's bit
    /// field, which PureHDF 2.2.0 does not expose). Fallback: netCDF-4 writes variable-length
    /// one-byte sequences only for NC_STRING in practice.
    /// </summary>
    public static bool IsVariableLengthString(IH5DataType type)
    {
        var message = type.GetType().GetField("_dataType", Internal)?.GetValue(type);
        var bitField = message?.GetType().GetProperty("BitField", Internal)?.GetValue(message);
        var kind = bitField?.GetType().GetProperty("Type", Internal)?.GetValue(bitField);
        if (kind is not null) return kind.ToString() == "String";
        return type.VariableLength.BaseType.Class == H5DataTypeClass.FixedPoint && type.VariableLength.BaseType.Size == 1;
    }
}
