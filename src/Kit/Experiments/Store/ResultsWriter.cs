using System.Text;

namespace Kit.Experiments;

/// <summary>
/// Appends finished runs to one store file. Each record goes out as one write of a whole line, then the file is
/// flushed to disk (fsync) before the call returns, so a kill at any moment loses at most the line being
/// written, and a torn line can only ever be the last one. Opening repairs such a tail before appending, so
/// the next record never glues onto a fragment. One writer per file: each shard writes its own.
/// </summary>
public sealed class ResultsWriter : IDisposable
{
    readonly FileStream _stream;
    readonly object _gate = new();

    public string Path { get; }
    /// <summary>Bytes of a torn final line removed when the file was opened (0 when the tail was whole).</summary>
    public long RepairedBytes { get; }

    public ResultsWriter(string path)
    {
        Path = path;
        Directory.CreateDirectory(System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(path))!);
        _stream = new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.Read);
        RepairedBytes = TrimTornTail(_stream);
        _stream.Seek(0, SeekOrigin.End);
    }

    public void Append(RunRecord record) => AppendLine(record.ToJsonLine());

    /// <summary>One line of JSON (a search's decisions use the same crash-safe append as its runs).</summary>
    internal void AppendLine(string json)
    {
        var bytes = Encoding.UTF8.GetBytes(json + "\n");
        lock (_gate)
        {
            _stream.Write(bytes);
            _stream.Flush(flushToDisk: true);
        }
    }

    /// <summary>Cuts the file back to just after its last newline; returns how many bytes went.</summary>
    static long TrimTornTail(FileStream stream)
    {
        long length = stream.Length;
        if (length == 0) return 0;
        const int chunk = 64 * 1024;
        var buffer = new byte[chunk];
        long end = length;
        while (end > 0)
        {
            int size = (int)Math.Min(chunk, end);
            stream.Seek(end - size, SeekOrigin.Begin);
            stream.ReadExactly(buffer, 0, size);
            int nl = Array.LastIndexOf(buffer, (byte)'\n', size - 1, size);
            if (nl >= 0)
            {
                long keep = end - size + nl + 1;
                if (keep < length) { stream.SetLength(keep); stream.Flush(flushToDisk: true); }
                return length - keep;
            }
            end -= size;
        }
        stream.SetLength(0);
        stream.Flush(flushToDisk: true);
        return length;
    }

    public void Dispose() => _stream.Dispose();
}
