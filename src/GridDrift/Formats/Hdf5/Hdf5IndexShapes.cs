using System.Numerics;

namespace GridDrift.Formats.Hdf5;

/// <summary>
/// The geometry of a version-2 B-tree's nodes, which the file does not store but the HDF5 library
/// derives from the header (node size, record size, depth): how many records a node at each depth
/// can hold, and how wide the child pointers and their record counts are. HDF5 File Format
/// Specification III.A.2; the derivation follows the library's B-tree header set-up.
/// </summary>
internal sealed class BTreeShape
{
    const int Prefix = 10; // signature, version, type, checksum
    readonly long[] _maxRecords;
    readonly int[] _cumulativeSize;
    readonly int _offsetSize;

    public int RecordSize { get; }

    /// <summary>Width of a child's record count: enough bytes for the most records a leaf holds.</summary>
    public int RecordCountSize { get; }

    public BTreeShape(int nodeSize, int recordSize, int depth, int offsetSize)
    {
        RecordSize = recordSize;
        _offsetSize = offsetSize;
        _maxRecords = new long[depth + 1];
        _cumulativeSize = new int[depth + 1];
        var cumulative = new long[depth + 1];
        _maxRecords[0] = (nodeSize - Prefix) / recordSize;
        cumulative[0] = _maxRecords[0];
        RecordCountSize = EncodedSize(_maxRecords[0]);
        for (int d = 1; d <= depth; d++)
        {
            int pointer = PointerSize(d);
            _maxRecords[d] = Math.Max(0, (nodeSize - (Prefix + pointer)) / (recordSize + pointer));
            cumulative[d] = (_maxRecords[d] + 1) * cumulative[d - 1] + _maxRecords[d];
            _cumulativeSize[d] = EncodedSize(cumulative[d]);
        }
    }

    public long MaxRecords(int depth) => _maxRecords[depth];

    /// <summary>A child pointer in a node at this depth: address, record count, and below depth 1 the subtree's total.</summary>
    public int PointerSize(int depth) => _offsetSize + RecordCountSize + (depth > 1 ? _cumulativeSize[depth - 1] : 0);

    // bytes to store any count up to the limit, as the library encodes counts
    static int EncodedSize(long limit) => (limit <= 0 ? 0 : BitOperations.Log2((ulong)limit)) / 8 + 1;
}

/// <summary>
/// The geometry of a fractal heap's doubling table: rows of blocks whose sizes double from the
/// second row on, direct blocks up to the largest direct size, indirect blocks beyond. HDF5 File
/// Format Specification III.G.
/// </summary>
internal sealed record HeapShape(int Width, ulong StartSize, ulong MaxDirectSize, int OffsetSize, bool ChecksummedBlocks, bool Filtered)
{
    public int MaxDirectRows => BitOperations.Log2(MaxDirectSize) - BitOperations.Log2(StartSize) + 2;

    public ulong RowBlockSize(int row) => row == 0 ? StartSize : StartSize << (row - 1);

    /// <summary>Rows of an indirect block that spans blocks of this size.</summary>
    public int RowsOfIndirect(ulong blockSize) =>
        BitOperations.Log2(blockSize) - (BitOperations.Log2(StartSize) + BitOperations.Log2((ulong)Width)) + 1;
}
