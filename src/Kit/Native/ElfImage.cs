using System.Buffers.Binary;
using System.Text;

namespace Kit.Native;

/// <summary>
/// A minimal reader for 64-bit little-endian ELF shared objects: just enough of the symbol-versioning
/// sections (.dynsym, .gnu.version, .gnu.version_r, .gnu.version_d) to decide whether a library can load
/// against the C++ runtime of this machine, and to relax one requirement in a copy.
/// Layouts follow the System V ABI (gABI) and the LSB "Symbol Versioning" chapter.
/// </summary>
internal sealed class ElfImage
{
    const uint ShtDynsym = 11;
    const uint ShtGnuVerdef = 0x6ffffffd;
    const uint ShtGnuVerneed = 0x6ffffffe;
    const uint ShtGnuVersym = 0x6fffffff;

    public const ushort VerFlagWeak = 0x2;

    readonly byte[] _bytes;
    readonly List<Section> _sections = new();

    public string Path { get; }
    public IReadOnlyList<VersionNeed> Needs { get; }
    public IReadOnlyList<string> DefinedVersions { get; }
    public IReadOnlyList<DynamicSymbol> Symbols { get; }

    ElfImage(byte[] bytes, string path)
    {
        _bytes = bytes;
        Path = path;
        ReadSectionHeaders();
        Symbols = ReadSymbols();
        Needs = ReadNeeds();
        DefinedVersions = ReadDefinitions();
    }

    public static ElfImage Read(string path) => Parse(File.ReadAllBytes(path), path);

    public static ElfImage Parse(byte[] bytes, string path)
    {
        if (bytes.Length < 64 || bytes[0] != 0x7f || bytes[1] != (byte)'E' || bytes[2] != (byte)'L' || bytes[3] != (byte)'F')
            throw new EngineLoadException($"{path}: not an ELF file");
        if (bytes[4] != 2) throw new EngineLoadException($"{path}: only 64-bit ELF is supported (EI_CLASS={bytes[4]})");
        if (bytes[5] != 1) throw new EngineLoadException($"{path}: only little-endian ELF is supported (EI_DATA={bytes[5]})");
        return new ElfImage(bytes, path);
    }

    /// <summary>Versions this image requires from <paramref name="library"/> (e.g. "libstdc++.so.6").</summary>
    public IEnumerable<VersionNeedAux> RequiredFrom(string library) =>
        Needs.Where(n => n.File == library).SelectMany(n => n.Versions);

    /// <summary>Dynamic symbols whose .gnu.version entry points at <paramref name="versionIndex"/>.</summary>
    public IEnumerable<DynamicSymbol> SymbolsBoundTo(ushort versionIndex) =>
        Symbols.Where(s => (s.VersionIndex & 0x7fff) == versionIndex);

    void ReadSectionHeaders()
    {
        ulong shoff = U64(0x28);
        ushort shentsize = U16(0x3A);
        ushort shnum = U16(0x3C);
        if (shoff == 0 || shnum == 0) throw new EngineLoadException($"{Path}: ELF file has no section headers");
        if (shentsize != 64) throw new EngineLoadException($"{Path}: unexpected section header size {shentsize}");
        if (shoff + (ulong)shnum * 64 > (ulong)_bytes.Length) throw new EngineLoadException($"{Path}: truncated ELF section table");
        for (int i = 0; i < shnum; i++)
        {
            int b = checked((int)shoff + i * 64);
            var s = new Section(U32(b + 4), U64(b + 24), U64(b + 32), U32(b + 40), U32(b + 44), U64(b + 56));
            if (s.Type != 8 /* SHT_NOBITS */ && s.Offset + s.Size > (ulong)_bytes.Length)
                throw new EngineLoadException($"{Path}: section {i} runs past the end of the file");
            _sections.Add(s);
        }
    }

    Section? Find(uint type) => _sections.FirstOrDefault(s => s.Type == type);

    List<DynamicSymbol> ReadSymbols()
    {
        var result = new List<DynamicSymbol>();
        var dynsym = Find(ShtDynsym);
        if (dynsym is null) return result;
        var strtab = _sections[(int)dynsym.Link];
        var versym = Find(ShtGnuVersym);
        int count = (int)(dynsym.Size / 24);
        for (int i = 0; i < count; i++)
        {
            int b = (int)dynsym.Offset + i * 24;
            string name = CString(strtab, U32(b));
            int versymOffset = versym is null ? -1 : (int)versym.Offset + 2 * i;
            ushort ver = versymOffset < 0 ? (ushort)1 : U16(versymOffset);
            result.Add(new DynamicSymbol(i, name, ver, versymOffset));
        }
        return result;
    }

    List<VersionNeed> ReadNeeds()
    {
        var result = new List<VersionNeed>();
        var sec = Find(ShtGnuVerneed);
        if (sec is null) return result;
        var strtab = _sections[(int)sec.Link];
        int at = (int)sec.Offset;
        int end = (int)(sec.Offset + sec.Size);
        for (int guard = 0; guard < 10_000; guard++)
        {
            if (at + 16 > end) throw new EngineLoadException($"{Path}: .gnu.version_r entry out of bounds");
            ushort cnt = U16(at + 2);
            string file = CString(strtab, U32(at + 4));
            uint aux = U32(at + 8);
            uint next = U32(at + 12);
            var versions = new List<VersionNeedAux>();
            int a = at + (int)aux;
            for (int j = 0; j < cnt; j++)
            {
                if (a + 16 > end) throw new EngineLoadException($"{Path}: .gnu.version_r aux entry out of bounds");
                versions.Add(new VersionNeedAux(CString(strtab, U32(a + 8)), U16(a + 4), U16(a + 6), a));
                uint anext = U32(a + 12);
                if (anext == 0) break;
                a += (int)anext;
            }
            result.Add(new VersionNeed(file, versions));
            if (next == 0) break;
            at += (int)next;
        }
        return result;
    }

    List<string> ReadDefinitions()
    {
        var result = new List<string>();
        var sec = Find(ShtGnuVerdef);
        if (sec is null) return result;
        var strtab = _sections[(int)sec.Link];
        int at = (int)sec.Offset;
        int end = (int)(sec.Offset + sec.Size);
        for (int guard = 0; guard < 100_000; guard++)
        {
            if (at + 20 > end) throw new EngineLoadException($"{Path}: .gnu.version_d entry out of bounds");
            uint aux = U32(at + 12);
            uint next = U32(at + 16);
            // The first aux entry names the version itself; later ones name its parents.
            result.Add(CString(strtab, U32(at + (int)aux)));
            if (next == 0) break;
            at += (int)next;
        }
        return result;
    }

    string CString(Section strtab, uint offset)
    {
        int start = checked((int)(strtab.Offset + offset));
        int limit = (int)(strtab.Offset + strtab.Size);
        int end = start;
        while (end < limit && _bytes[end] != 0) end++;
        return Encoding.ASCII.GetString(_bytes, start, end - start);
    }

    ushort U16(int at) => BinaryPrimitives.ReadUInt16LittleEndian(_bytes.AsSpan(at));
    uint U32(int at) => BinaryPrimitives.ReadUInt32LittleEndian(_bytes.AsSpan(at));
    ulong U64(int at) => BinaryPrimitives.ReadUInt64LittleEndian(_bytes.AsSpan(at));

    sealed record Section(uint Type, ulong Offset, ulong Size, uint Link, uint Info, ulong EntSize);
}

internal sealed record VersionNeed(string File, IReadOnlyList<VersionNeedAux> Versions);

/// <summary>One Vernaux entry; <see cref="FileOffset"/> is where the entry starts in the file.</summary>
internal sealed record VersionNeedAux(string Name, ushort Flags, ushort Index, int FileOffset)
{
    public int FlagsOffset => FileOffset + 4;
}

/// <summary>A .dynsym entry; <see cref="VersionOffset"/> is its .gnu.version slot in the file, or -1.</summary>
internal sealed record DynamicSymbol(int Index, string Name, ushort VersionIndex, int VersionOffset);
