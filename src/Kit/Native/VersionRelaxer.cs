using System.Buffers.Binary;

namespace Kit.Native;

/// <summary>One byte range changed by <see cref="VersionRelaxer"/>, with the old and new little-endian value.</summary>
internal sealed record ByteEdit(int Offset, int Length, ulong Before, ulong After, string Why);

/// <summary>
/// Makes a copy of a shared object loadable against an older C++ runtime when the only thing it needs from
/// the newer one is a symbol it references but never calls.
///
/// Two edits are needed, both in the copy only:
/// 1. every dynamic symbol bound to the missing version gets version index 1 (global, unversioned), so the
///    loader does not look for that version when it binds the symbol;
/// 2. the version's Vernaux entry in .gnu.version_r gets VER_FLG_WEAK, because the loader checks every
///    non-weak requirement there at load time even when no symbol uses it.
/// Anything else bound to the version makes the edit unsafe, and it is refused.
/// </summary>
internal static class VersionRelaxer
{
    public static (byte[] Patched, IReadOnlyList<ByteEdit> Edits) Relax(
        byte[] original, string path, string library, string version, IReadOnlySet<string> allowedSymbols)
    {
        var image = ElfImage.Parse(original, path);
        var need = image.RequiredFrom(library).FirstOrDefault(v => v.Name == version)
            ?? throw new EngineLoadException($"{path}: does not require {version} from {library}");

        var bound = image.SymbolsBoundTo(need.Index).ToList();
        var unexpected = bound.Where(s => !allowedSymbols.Contains(s.Name)).Select(s => s.Name).ToList();
        if (unexpected.Count > 0)
            throw new EngineLoadException(
                $"{path}: {version} binds symbols that the kit cannot safely relax: {string.Join(", ", unexpected.Take(5))}");

        var patched = (byte[])original.Clone();
        var edits = new List<ByteEdit>();
        foreach (var s in bound)
        {
            ushort before = BinaryPrimitives.ReadUInt16LittleEndian(patched.AsSpan(s.VersionOffset));
            // Keep the hidden bit (0x8000) as it was; only the index changes.
            ushort after = (ushort)((before & 0x8000) | 1);
            BinaryPrimitives.WriteUInt16LittleEndian(patched.AsSpan(s.VersionOffset), after);
            edits.Add(new ByteEdit(s.VersionOffset, 2, before, after, $".gnu.version of {s.Name}: {version} -> global"));
        }

        ushort flagsBefore = need.Flags;
        ushort flagsAfter = (ushort)(flagsBefore | ElfImage.VerFlagWeak);
        if (flagsAfter != flagsBefore)
        {
            BinaryPrimitives.WriteUInt16LittleEndian(patched.AsSpan(need.FlagsOffset), flagsAfter);
            edits.Add(new ByteEdit(need.FlagsOffset, 2, flagsBefore, flagsAfter, $".gnu.version_r {version}: mark weak"));
        }
        return (patched, edits);
    }
}
