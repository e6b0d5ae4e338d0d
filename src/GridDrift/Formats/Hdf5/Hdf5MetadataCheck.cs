using System.Buffers.Binary;
using Microsoft.Win32.SafeHandles;

namespace GridDrift.Formats.Hdf5;

/// <summary>
/// Checks an HDF5 file's metadata the way the HDF5 library checks it on open, before anything is
/// read from it: the superblock's checksum and that the file is as long as the superblock says,
/// and for every object read, the checksums of its header chunks and of the checksummed indexes
/// its messages point to (dense link and attribute storage: fractal heaps and version-2 B-trees;
/// chunk indexes: fixed and extensible array headers, version-2 B-trees). PureHDF does not verify
/// checksums, so without this a flipped bit in a header (a renamed <c>add_offset</c>, a changed
/// dimension) would be read as if it were true. Layouts follow the HDF5 File Format Specification
/// version 3.0, sections II–IV; the checksum is <see cref="Lookup3"/>.
/// </summary>
internal sealed class Hdf5MetadataCheck : IDisposable
{
    const int MaxBlock = 64 << 20;      // no metadata block of a real file comes near this
    const int MaxStructures = 1 << 20;  // bounds the walk over a corrupt file that points in circles

    readonly string _path;
    readonly SafeFileHandle _handle;
    readonly long _length;
    readonly HashSet<long> _checked = [];
    long _base;
    int _offsetSize, _lengthSize;

    /// <summary>Every checksummed structure verified so far: its kind (signature), where it starts, and the bytes its checksum covers.</summary>
    public List<(string Kind, long At, int Covered)> Verified { get; } = [];

    /// <summary>The root group's object header address, relative to the base address.</summary>
    public ulong RootAddress { get; private set; }

    Hdf5MetadataCheck(string path)
    {
        _path = path;
        _handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read);
        _length = RandomAccess.GetLength(_handle);
    }

    /// <summary>Checks the superblock and the root group's header; bad input if either is corrupt or the file is truncated.</summary>
    public static Hdf5MetadataCheck Open(string path)
    {
        var check = new Hdf5MetadataCheck(path);
        try
        {
            check.Superblock();
            check.Object(check.RootAddress);
            return check;
        }
        catch
        {
            check.Dispose();
            throw;
        }
    }

    /// <summary>Checks one object's header, by its address relative to the base address (as links and references give it).</summary>
    public void Object(ulong address)
    {
        if (IsUndefined(address)) return;
        if (!_checked.Add((long)Math.Min(address, long.MaxValue))) return;
        Header(Absolute(address));
    }

    void Superblock()
    {
        long at = Locate();
        var fixedPart = Read(at, 16, "superblock");
        int version = fixedPart[8];
        if (version >= 2)
        {
            _offsetSize = fixedPart[9];
            _lengthSize = fixedPart[10];
            CheckSizes();
            int size = 12 + 4 * _offsetSize + 4;
            var block = Read(at, size, "superblock");
            Checksum(block, size - 4, "superblock", at);
            var r = new Fields(block, 12, _offsetSize);
            _base = (long)r.Address();
            ulong extension = r.Address(); // the superblock extension is an object header
            ulong eof = r.Address();
            RootAddress = r.Address();
            CheckEndOfFile(eof);
            if (!IsUndefined(extension)) Object(extension);
        }
        else if (version <= 1)
        {
            _offsetSize = fixedPart[13];
            _lengthSize = fixedPart[14];
            CheckSizes();
            int start = version == 0 ? 24 : 28;
            var block = Read(at, start + 6 * _offsetSize, "superblock");
            var r = new Fields(block, start, _offsetSize);
            _base = (long)r.Address();
            _ = r.Address(); // free-space information
            ulong eof = r.Address();
            _ = r.Address(); // driver information
            _ = r.Address(); // root entry: link name offset
            RootAddress = r.Address();
            CheckEndOfFile(eof);
        }
        else throw Fault($"unknown HDF5 superblock version {version}");
        if (_base < 0 || _base > _length) throw Fault("superblock base address lies outside the file");
    }

    long Locate()
    {
        Span<byte> head = stackalloc byte[8];
        for (long at = 0; at + 8 <= _length; at = at == 0 ? 512 : at * 2)
        {
            if (RandomAccess.Read(_handle, head, at) == 8 && head.SequenceEqual(Signature)) return at;
        }
        throw Fault("no HDF5 superblock");
    }

    static ReadOnlySpan<byte> Signature => [0x89, (byte)'H', (byte)'D', (byte)'F', (byte)'\r', (byte)'\n', 0x1A, (byte)'\n'];

    void CheckSizes()
    {
        if (_offsetSize is not (2 or 4 or 8) || _lengthSize is not (2 or 4 or 8))
            throw Fault($"superblock gives offsets of {_offsetSize} and lengths of {_lengthSize} bytes");
    }

    // The HDF5 library refuses a file shorter than the end-of-file address its superblock records ("truncated file").
    void CheckEndOfFile(ulong eof)
    {
        if (!IsUndefined(eof) && (ulong)_base + eof > (ulong)_length)
            throw Fault($"truncated: the superblock records {eof} bytes, the file holds {_length - _base}");
    }

    void Header(long at)
    {
        var signature = Read(at, 4, "object header");
        if (signature.AsSpan().SequenceEqual("OHDR"u8)) HeaderVersion2(at);
        else if (signature[0] == 1) HeaderVersion1(at);
        else throw Fault($"no object header at byte {at} (version byte {signature[0]})");
    }

    void HeaderVersion2(long at)
    {
        var prefix = Read(at, 6, "object header");
        if (prefix[4] != 2) throw Fault($"object header at byte {at} has version {prefix[4]}");
        byte flags = prefix[5];
        int position = 6 + ((flags & 0x20) != 0 ? 16 : 0) + ((flags & 0x10) != 0 ? 4 : 0);
        int width = 1 << (flags & 3);
        var sizeField = Read(at + position, width, "object header");
        ulong chunk = Unsigned(sizeField, 0, width);
        long total = position + width + (long)Math.Min(chunk, MaxBlock) + 4;
        if (chunk > MaxBlock) throw Fault($"object header at byte {at} declares a {chunk}-byte chunk");
        var block = Read(at, total, "object header");
        Checksum(block, block.Length - 4, "object header", at);
        int messageHeader = (flags & 0x04) != 0 ? 6 : 4;
        Messages(block, position + width, block.Length - 4, messageHeader, version: 2, at);
    }

    void HeaderVersion1(long at)
    {
        var prefix = Read(at, 16, "object header");
        uint size = BinaryPrimitives.ReadUInt32LittleEndian(prefix.AsSpan(8));
        if (size > MaxBlock) throw Fault($"object header at byte {at} declares {size} bytes of messages");
        var block = Read(at + 16, size, "object header");
        Messages(block, 0, block.Length, 8, version: 1, at);
    }

    int _structures;

    void Messages(byte[] block, int start, int end, int headerSize, int version, long at)
    {
        if (++_structures > MaxStructures) throw Fault("metadata refers to itself without end");
        int p = start;
        while (end - p >= headerSize)
        {
            int type = version == 2 ? block[p] : BinaryPrimitives.ReadUInt16LittleEndian(block.AsSpan(p));
            int size = BinaryPrimitives.ReadUInt16LittleEndian(block.AsSpan(p + (version == 2 ? 1 : 2)));
            byte flags = block[p + (version == 2 ? 3 : 4)];
            int data = p + headerSize;
            if (data + size > end) throw Fault($"a message of the object header at byte {at} runs past its chunk");
            bool shared = (flags & 0x02) != 0;
            if (!shared) Message(type, block.AsSpan(data, size), version, at);
            p = data + size;
        }
    }

    void Message(int type, ReadOnlySpan<byte> data, int headerVersion, long at)
    {
        switch (type)
        {
            case 0x10 when data.Length >= _offsetSize + _lengthSize: // continuation
                ulong offset = Address(data, 0);
                ulong length = Unsigned(data, _offsetSize, _lengthSize);
                if (length > MaxBlock) throw Fault($"object header at byte {at} continues in a {length}-byte block");
                long where = Absolute(offset);
                if (!_checked.Add(-1 - where)) return;
                var block = Read(where, (long)length, "object header continuation");
                if (headerVersion == 2)
                {
                    if (block.Length < 8 || !block.AsSpan(0, 4).SequenceEqual("OCHK"u8))
                        throw Fault($"object header continuation at byte {where} lacks its signature");
                    Checksum(block, block.Length - 4, "object header continuation", where);
                    Messages(block, 4, block.Length - 4, MessageHeaderOf(at), 2, at);
                }
                else Messages(block, 0, block.Length, 8, 1, at);
                break;
            case 0x02 or 0x15 when data.Length >= 2: // link info, attribute info: dense storage
                int p = 2 + ((data[1] & 1) != 0 ? (type == 0x02 ? 8 : 2) : 0);
                if (data.Length < p + 2 * _offsetSize) throw Fault($"object header at byte {at} has a truncated {(type == 2 ? "link" : "attribute")} info message");
                FractalHeap(Address(data, p));
                BTree(Address(data, p + _offsetSize));
                if ((data[1] & 2) != 0 && data.Length >= p + 3 * _offsetSize) BTree(Address(data, p + 2 * _offsetSize));
                break;
            case 0x08 when data.Length >= 2 && data[0] == 4 && data[1] == 2: // data layout version 4, chunked
                ChunkIndex(data, at);
                break;
        }
    }

    // Version-2 headers store the creation-order flag in their prefix; continuation chunks follow it.
    int MessageHeaderOf(long headerAt) => (Read(headerAt + 5, 1, "object header")[0] & 0x04) != 0 ? 6 : 4;

    void ChunkIndex(ReadOnlySpan<byte> data, long at)
    {
        if (data.Length < 5) throw Fault($"object header at byte {at} has a truncated layout message");
        byte flags = data[2];
        int p = 5 + data[3] * data[4];
        if (data.Length < p + 1) throw Fault($"object header at byte {at} has a truncated layout message");
        int indexType = data[p++];
        p += indexType switch
        {
            1 => (flags & 2) != 0 ? _lengthSize + 4 : 0,
            3 => 1,
            4 => 5,
            5 => 6,
            _ => 0,
        };
        if (data.Length < p + _offsetSize) throw Fault($"object header at byte {at} has a truncated layout message");
        ulong address = Address(data, p);
        switch (indexType)
        {
            case 3: FixedSizeHeader(address, "FAHD", 8 + _lengthSize + _offsetSize + 4, "fixed array header"); break;
            case 4: FixedSizeHeader(address, "EAHD", 12 + 6 * _lengthSize + _offsetSize + 4, "extensible array header"); break;
            case 5: BTree(address); break;
        }
    }

    void FixedSizeHeader(ulong address, string signature, int size, string what)
    {
        if (IsUndefined(address) || !_checked.Add(Absolute(address))) return;
        long at = Absolute(address);
        var block = Read(at, size, what);
        if (!block.AsSpan(0, 4).SequenceEqual(System.Text.Encoding.ASCII.GetBytes(signature))) throw Fault($"{what} at byte {at} lacks its signature");
        Checksum(block, size - 4, what, at);
    }

    /// <summary>A version-2 B-tree: header, then every node (HDF5 File Format Specification III.A.2).</summary>
    void BTree(ulong address)
    {
        if (IsUndefined(address) || !_checked.Add(Absolute(address))) return;
        long at = Absolute(address);
        int size = 16 + _offsetSize + 2 + _lengthSize + 4;
        var header = Read(at, size, "B-tree header");
        if (!header.AsSpan(0, 4).SequenceEqual("BTHD"u8)) throw Fault($"B-tree header at byte {at} lacks its signature");
        Checksum(header, size - 4, "B-tree header", at);
        uint nodeSize = BinaryPrimitives.ReadUInt32LittleEndian(header.AsSpan(6));
        int recordSize = BinaryPrimitives.ReadUInt16LittleEndian(header.AsSpan(10));
        int depth = BinaryPrimitives.ReadUInt16LittleEndian(header.AsSpan(12));
        ulong root = Address(header, 16);
        int rootRecords = BinaryPrimitives.ReadUInt16LittleEndian(header.AsSpan(16 + _offsetSize));
        if (nodeSize is < 16 or > MaxBlock || recordSize == 0 || depth > 32) throw Fault($"B-tree header at byte {at} has impossible node sizes");
        var shape = new BTreeShape((int)nodeSize, recordSize, depth, _offsetSize);
        if (!IsUndefined(root)) BTreeNode(root, depth, rootRecords, shape);
    }

    void BTreeNode(ulong address, int depth, long records, BTreeShape shape)
    {
        if (++_structures > MaxStructures) throw Fault("metadata refers to itself without end");
        long at = Absolute(address);
        if (records > shape.MaxRecords(depth)) throw Fault($"B-tree node at byte {at} holds more records than fit");
        long used = 6 + records * shape.RecordSize + (depth > 0 ? (records + 1) * shape.PointerSize(depth) : 0) + 4;
        var node = Read(at, used, "B-tree node");
        if (!node.AsSpan(0, 4).SequenceEqual(depth == 0 ? "BTLF"u8 : "BTIN"u8)) throw Fault($"B-tree node at byte {at} lacks its signature");
        Checksum(node, node.Length - 4, "B-tree node", at);
        if (depth == 0) return;
        int p = 6 + (int)records * shape.RecordSize;
        for (long child = 0; child <= records; child++)
        {
            ulong childAddress = Address(node, p);
            long childRecords = (long)Unsigned(node, p + _offsetSize, shape.RecordCountSize);
            p += shape.PointerSize(depth);
            BTreeNode(childAddress, depth - 1, childRecords, shape);
        }
    }

    /// <summary>A fractal heap: header, then the root block and its children (HDF5 File Format Specification III.G).</summary>
    void FractalHeap(ulong address)
    {
        if (IsUndefined(address) || !_checked.Add(Absolute(address))) return;
        long at = Absolute(address);
        int fixedPart = 14 + 10 * _lengthSize + 2 * _offsetSize + 2 + 2 * _lengthSize + 4 + _offsetSize + 2;
        var head = Read(at, fixedPart, "fractal heap header");
        if (!head.AsSpan(0, 4).SequenceEqual("FRHP"u8)) throw Fault($"fractal heap header at byte {at} lacks its signature");
        int filterLength = BinaryPrimitives.ReadUInt16LittleEndian(head.AsSpan(7));
        byte flags = head[9];
        int size = fixedPart + (filterLength > 0 ? _lengthSize + 4 + filterLength : 0) + 4;
        var header = Read(at, size, "fractal heap header");
        Checksum(header, size - 4, "fractal heap header", at);
        int p = 14 + 10 * _lengthSize + 2 * _offsetSize;
        int width = BinaryPrimitives.ReadUInt16LittleEndian(header.AsSpan(p));
        ulong startSize = Unsigned(header, p + 2, _lengthSize);
        ulong maxDirect = Unsigned(header, p + 2 + _lengthSize, _lengthSize);
        int maxHeapBits = BinaryPrimitives.ReadUInt16LittleEndian(header.AsSpan(p + 2 + 2 * _lengthSize));
        ulong root = Address(header, p + 6 + 2 * _lengthSize);
        int rootRows = BinaryPrimitives.ReadUInt16LittleEndian(header.AsSpan(p + 6 + 2 * _lengthSize + _offsetSize));
        if (width == 0 || startSize == 0 || !ulong.IsPow2(startSize) || !ulong.IsPow2(maxDirect) || maxDirect < startSize
            || maxDirect > MaxBlock || !int.IsPow2(width) || maxHeapBits is 0 or > 64)
            throw Fault($"fractal heap header at byte {at} has impossible block sizes");
        var heap = new HeapShape(width, startSize, maxDirect, (maxHeapBits + 7) / 8, ChecksummedBlocks: (flags & 2) != 0 && filterLength == 0, Filtered: filterLength > 0);
        if (IsUndefined(root)) return;
        if (rootRows == 0) DirectBlock(root, startSize, heap);
        else IndirectBlock(root, rootRows, heap, nesting: 0);
    }

    void IndirectBlock(ulong address, int rows, HeapShape heap, int nesting)
    {
        if (++_structures > MaxStructures || nesting > 64) throw Fault("metadata refers to itself without end");
        long at = Absolute(address);
        if (rows > 64) throw Fault($"fractal heap indirect block at byte {at} declares {rows} rows");
        int directRows = Math.Min(rows, heap.MaxDirectRows);
        int indirectRows = Math.Max(0, rows - heap.MaxDirectRows);
        int entry = _offsetSize + (heap.Filtered ? _lengthSize + 4 : 0);
        long size = 5 + _offsetSize + heap.OffsetSize + (long)directRows * heap.Width * entry + (long)indirectRows * heap.Width * _offsetSize + 4;
        var block = Read(at, size, "fractal heap indirect block");
        if (!block.AsSpan(0, 4).SequenceEqual("FHIB"u8)) throw Fault($"fractal heap indirect block at byte {at} lacks its signature");
        Checksum(block, block.Length - 4, "fractal heap indirect block", at);
        int p = 5 + _offsetSize + heap.OffsetSize;
        for (int row = 0; row < rows; row++)
        {
            ulong rowSize = heap.RowBlockSize(row);
            for (int column = 0; column < heap.Width; column++)
            {
                ulong child = Address(block, p);
                p += row < heap.MaxDirectRows ? entry : _offsetSize;
                if (IsUndefined(child)) continue;
                if (row < heap.MaxDirectRows) DirectBlock(child, rowSize, heap);
                else if (heap.RowsOfIndirect(rowSize) is > 0 and var childRows) IndirectBlock(child, childRows, heap, nesting + 1);
                else throw Fault($"fractal heap indirect block at byte {at} has a row no block fits");
            }
        }
    }

    void DirectBlock(ulong address, ulong size, HeapShape heap)
    {
        if (!heap.ChecksummedBlocks) return;
        long at = Absolute(address);
        var block = Read(at, (long)size, "fractal heap direct block");
        if (!block.AsSpan(0, 4).SequenceEqual("FHDB"u8)) throw Fault($"fractal heap direct block at byte {at} lacks its signature");
        // the checksum sits in the block's prefix and is computed over the whole block with that field zeroed
        int field = 5 + _offsetSize + heap.OffsetSize;
        uint stored = BinaryPrimitives.ReadUInt32LittleEndian(block.AsSpan(field));
        block.AsSpan(field, 4).Clear();
        if (Lookup3.Hash(block) != stored) throw Fault($"metadata checksum mismatch in the fractal heap direct block at byte {at}");
        Verified.Add(("FHDB", at, block.Length));
    }

    void Checksum(byte[] block, int covered, string what, long at)
    {
        uint stored = BinaryPrimitives.ReadUInt32LittleEndian(block.AsSpan(covered));
        if (Lookup3.Hash(block.AsSpan(0, covered)) != stored) throw Fault($"metadata checksum mismatch in the {what} at byte {at}");
        Verified.Add((KindOf(block), at, covered));
    }

    static string KindOf(byte[] block) =>
        block.Length >= 4 && block[0] != 0x89 ? System.Text.Encoding.ASCII.GetString(block, 0, 4) : "superblock";

    byte[] Read(long at, long count, string what)
    {
        if (at < 0 || count < 0 || count > MaxBlock || at > _length - count)
            throw Fault($"the {what} at byte {at} ({count} bytes) lies beyond the end of the {_length}-byte file");
        var bytes = new byte[count];
        int n = RandomAccess.Read(_handle, bytes, at);
        if (n != count) throw Fault($"the {what} at byte {at} could not be read whole");
        return bytes;
    }

    long Absolute(ulong address) =>
        address > (ulong)(_length - _base) ? throw Fault($"an address ({address}) points beyond the end of the {_length}-byte file") : _base + (long)address;

    bool IsUndefined(ulong address) => _offsetSize < 8 ? address == (1UL << (8 * _offsetSize)) - 1 : address == ulong.MaxValue;

    ulong Address(ReadOnlySpan<byte> bytes, int at) => Unsigned(bytes, at, _offsetSize);

    static ulong Unsigned(ReadOnlySpan<byte> bytes, int at, int width)
    {
        ulong value = 0;
        for (int i = width - 1; i >= 0; i--) value = value << 8 | bytes[at + i];
        return value;
    }

    BadInputException Fault(string message) => new(_path, null, message);

    public void Dispose() => _handle.Dispose();

    /// <summary>Addresses read one after another.</summary>
    ref struct Fields(ReadOnlySpan<byte> bytes, int at, int offsetSize)
    {
        readonly ReadOnlySpan<byte> _bytes = bytes;
        int _at = at;
        public ulong Address() { ulong v = Unsigned(_bytes, _at, offsetSize); _at += offsetSize; return v; }
    }
}
