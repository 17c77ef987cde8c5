namespace Kit.Common;

/// <summary>
/// Writes a file so that a reader (or a process killed half way) sees either the old content or the new,
/// never a torn one: write a temporary file in the same folder, flush it to disk, then rename over the target.
/// </summary>
internal static class AtomicFile
{
    public static void WriteAllBytes(string path, ReadOnlySpan<byte> content)
    {
        string temp = TempBeside(path);
        try
        {
            using (var fs = new FileStream(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None))
            {
                fs.Write(content);
                fs.Flush(flushToDisk: true);
            }
            File.Move(temp, path, overwrite: true);
        }
        finally
        {
            if (File.Exists(temp)) File.Delete(temp);
        }
    }

    public static void WriteAllText(string path, string content) =>
        WriteAllBytes(path, new System.Text.UTF8Encoding(false).GetBytes(content));

    /// <summary>Streams content through a callback, with the same all-or-nothing guarantee.</summary>
    public static void Write(string path, Action<Stream> write)
    {
        string temp = TempBeside(path);
        try
        {
            using (var fs = new FileStream(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None))
            {
                write(fs);
                fs.Flush(flushToDisk: true);
            }
            File.Move(temp, path, overwrite: true);
        }
        finally
        {
            if (File.Exists(temp)) File.Delete(temp);
        }
    }

    static string TempBeside(string path)
    {
        string dir = Path.GetDirectoryName(Path.GetFullPath(path))!;
        Directory.CreateDirectory(dir);
        return Path.Combine(dir, $".{Path.GetFileName(path)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
    }
}
