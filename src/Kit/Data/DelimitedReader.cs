namespace Kit.Data;

/// <summary>
/// CSV and TSV after RFC 4180: fields separated by one delimiter, records by CRLF (LF or a lone CR also
/// accepted), a field may be enclosed in double quotes, inside which delimiters and line breaks are data and
/// a doubled quote is one quote. The first record is the header. Stricter than many readers on purpose:
/// a quote inside an unquoted field, text after a closing quote, a blank line and a record with the wrong
/// number of fields are reported rather than guessed at.
/// </summary>
internal sealed class DelimitedReader
{
    readonly string _source;
    readonly string _s;
    readonly char _delimiter;
    int _pos, _line = 1, _lineStart;

    // Field i of the current record: where it starts in _s, its raw length (quotes included), and its column.
    readonly List<(int Start, int Length, bool Quoted, int Column)> _fields = new();

    DelimitedReader(string source, string text, char delimiter)
    {
        _source = source;
        _s = text;
        _delimiter = delimiter;
    }

    public static LabelledTable Read(string source, string text, char delimiter, ColumnSpec spec, RowPolicy policy)
    {
        var reader = new DelimitedReader(source, text, delimiter);
        return reader.ReadAll(spec, policy);
    }

    LabelledTable ReadAll(ColumnSpec spec, RowPolicy policy)
    {
        if (_s.Length > 0 && (_s[0] == '\n' || _s[0] == '\r'))
            throw new DataError(_source, 1, "missing header: the first line is blank");
        var (headerProblem, headerColumn) = NextRecord();
        if (headerProblem is not null) throw new DataError(_source, 1, headerColumn, $"header: {headerProblem}");
        var header = _fields.Select(Value).ToArray();
        int[] index = spec.Required().Select(name => Find(header, name)).ToArray();
        int textAt = index[0], labelAt = index[1];
        int groupAt = spec.Group is null ? -1 : index[2];
        int splitAt = spec.Split is null ? -1 : index[spec.Group is null ? 2 : 3];

        var rows = new RowCollector(_source, spec, policy);
        while (_pos < _s.Length)
        {
            int line = _line;
            if (_s[_pos] == '\n' || _s[_pos] == '\r')
            {
                SkipLineBreak();
                rows.Problem(line, null, "blank line", "blank line (a record must have " + header.Length + " field(s))");
                continue;
            }
            var (problem, column) = NextRecord();
            if (problem is not null)
            {
                rows.Problem(line, column, "malformed quoting", problem);
                continue;
            }
            if (_fields.Count != header.Length)
            {
                rows.Problem(line, null, "ragged row", $"ragged row: expected {header.Length} field(s) as in the header, found {_fields.Count}");
                continue;
            }
            rows.Add(line, Value(_fields[textAt]), Span(labelAt), Span(groupAt), Span(splitAt),
                _fields[textAt].Column, _fields[labelAt].Column,
                groupAt < 0 ? null : _fields[groupAt].Column, splitAt < 0 ? null : _fields[splitAt].Column);
        }
        return rows.Build(1);
    }

    int Find(string[] header, string name)
    {
        int at = Array.IndexOf(header, name);
        if (at < 0)
            throw new DataError(_source, 1, $"missing column '{name}' (header has: {string.Join(", ", header.Select(h => $"'{h}'"))})");
        int again = Array.IndexOf(header, name, at + 1);
        if (again >= 0) throw new DataError(_source, 1, $"column '{name}' appears twice in the header (fields {at + 1} and {again + 1})");
        return at;
    }

    ReadOnlySpan<char> Span(int field)
    {
        if (field < 0) return default;
        var f = _fields[field];
        return f.Quoted && _s.AsSpan(f.Start + 1, f.Length - 2).IndexOf('"') >= 0 ? Value(f).AsSpan() : Inner(f);
    }

    ReadOnlySpan<char> Inner((int Start, int Length, bool Quoted, int Column) f) =>
        f.Quoted ? _s.AsSpan(f.Start + 1, f.Length - 2) : _s.AsSpan(f.Start, f.Length);

    string Value((int Start, int Length, bool Quoted, int Column) f)
    {
        var inner = Inner(f);
        return f.Quoted && inner.IndexOf('"') >= 0 ? inner.ToString().Replace("\"\"", "\"", StringComparison.Ordinal) : inner.ToString();
    }

    /// <summary>
    /// Reads one record into _fields and consumes its line break. Returns a problem (and its column) for a
    /// malformed record, having skipped to the end of its physical line so reading can go on. An unterminated
    /// quote is thrown: it swallows the rest of the file, so nothing after it can be trusted.
    /// </summary>
    (string? Problem, int? Column) NextRecord()
    {
        _fields.Clear();
        while (true)
        {
            int start = _pos, column = _pos - _lineStart + 1;
            if (_pos < _s.Length && _s[_pos] == '"')
            {
                int openLine = _line;
                _pos++;
                while (true)
                {
                    int q = _s.IndexOf('"', _pos);
                    if (q < 0) throw new DataError(_source, openLine, column, "unterminated quote: the quoted field opened here never closes");
                    CountLineBreaks(_pos, q);
                    _pos = q + 1;
                    if (_pos < _s.Length && _s[_pos] == '"') { _pos++; continue; }
                    break;
                }
                _fields.Add((start, _pos - start, true, column));
                if (_pos < _s.Length && _s[_pos] != _delimiter && _s[_pos] != '\n' && _s[_pos] != '\r')
                {
                    int at = _pos - _lineStart + 1;
                    SkipToLineEnd();
                    return ("malformed quoting: text after the closing quote of a quoted field", at);
                }
            }
            else
            {
                int end = _s.AsSpan(_pos).IndexOfAny(_delimiter, '\n', '\r');
                end = end < 0 ? _s.Length : _pos + end;
                int quote = _s.AsSpan(_pos, end - _pos).IndexOf('"');
                if (quote >= 0)
                {
                    int at = _pos + quote - _lineStart + 1;
                    SkipToLineEnd();
                    return ("malformed quoting: a double quote inside an unquoted field (enclose the field in quotes and double the quote)", at);
                }
                _fields.Add((start, end - start, false, column));
                _pos = end;
            }
            if (_pos >= _s.Length) return (null, null);
            if (_s[_pos] == _delimiter) { _pos++; continue; }
            SkipLineBreak();
            return (null, null);
        }
    }

    void SkipLineBreak()
    {
        if (_s[_pos] == '\r' && _pos + 1 < _s.Length && _s[_pos + 1] == '\n') _pos++;
        _pos++;
        _line++;
        _lineStart = _pos;
    }

    void SkipToLineEnd()
    {
        int end = _s.AsSpan(_pos).IndexOfAny('\n', '\r');
        if (end < 0) { _pos = _s.Length; return; }
        _pos += end;
        SkipLineBreak();
    }

    void CountLineBreaks(int from, int to)
    {
        int p = from;
        while (true)
        {
            int i = _s.AsSpan(p, to - p).IndexOfAny('\n', '\r');
            if (i < 0) return;
            int at = p + i;
            if (_s[at] == '\r' && at + 1 < to && _s[at + 1] == '\n') at++;
            _line++;
            _lineStart = p = at + 1;
        }
    }
}
