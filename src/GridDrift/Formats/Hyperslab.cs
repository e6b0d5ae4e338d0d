namespace GridDrift.Formats;

/// <summary>Validation shared by every reader's hyperslab read.</summary>
internal static class Hyperslab
{
    public static void Validate(string path, NcVariable variable, ReadOnlySpan<long> shape,
        ReadOnlySpan<long> start, ReadOnlySpan<long> count, int destinationBytes, int elementSize)
    {
        if (start.Length != shape.Length || count.Length != shape.Length)
            throw new ArgumentException($"{variable.Name} has rank {shape.Length}; start/count have {start.Length}/{count.Length}");
        long elements = 1;
        for (int d = 0; d < shape.Length; d++)
        {
            if (start[d] < 0 || count[d] < 0 || start[d] + count[d] > shape[d])
                throw new BadInputException(path, variable.Name,
                    $"hyperslab [{start[d]}, {start[d] + count[d]}) outside dimension {variable.Dimensions[d].Name} of length {shape[d]}");
            elements = checked(elements * count[d]);
        }
        if (elements * elementSize != destinationBytes)
            throw new ArgumentException($"buffer of {destinationBytes} bytes for {elements} elements of {elementSize} bytes");
    }
}
