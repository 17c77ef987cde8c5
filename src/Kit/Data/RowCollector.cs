namespace Kit.Data;

/// <summary>
/// The checks every source shares (empty text, missing label, missing group, unknown split value) and the row
/// policy: under Refuse the first problem throws; under Skip it is counted. Repeated label, group and split
/// values share one string, so a million rows with a handful of classes keep a handful of label strings.
/// </summary>
internal sealed class RowCollector
{
    readonly string _source;
    readonly ColumnSpec _spec;
    readonly RowPolicy _policy;
    readonly SkipReport _skips = new();
    readonly List<string> _texts = new();
    readonly List<string> _labels = new();
    readonly List<string>? _groups;
    readonly List<string>? _splits;
    readonly List<int> _lines = new();
    readonly Dictionary<string, string> _pool = new(StringComparer.Ordinal);
    readonly Dictionary<string, string>.AlternateLookup<ReadOnlySpan<char>> _poolLookup;

    public RowCollector(string source, ColumnSpec spec, RowPolicy policy)
    {
        _source = source;
        _spec = spec;
        _policy = policy;
        _groups = spec.Group is null ? null : new List<string>();
        _splits = spec.Split is null ? null : new List<string>();
        _poolLookup = _pool.GetAlternateLookup<ReadOnlySpan<char>>();
    }

    public string Source => _source;
    public int Accepted => _texts.Count;

    /// <summary>A row-level problem: throws under Refuse, otherwise counts the row as skipped.</summary>
    public void Problem(int line, int? column, string reason, string detail)
    {
        if (_policy == RowPolicy.Refuse) throw new DataError(_source, line, column, detail);
        _skips.Add(reason, line);
    }

    /// <summary>Checks one row's values and keeps it, or reports why not. Columns are 1-based character columns, null when unknown.</summary>
    public void Add(int line, string text, ReadOnlySpan<char> label, ReadOnlySpan<char> group, ReadOnlySpan<char> split,
        int? textColumn = null, int? labelColumn = null, int? groupColumn = null, int? splitColumn = null)
    {
        if (text.AsSpan().IsWhiteSpace())
        {
            Problem(line, textColumn, "empty text", text.Length == 0 ? $"empty text in column '{_spec.Text}'" : $"text in column '{_spec.Text}' is only white space");
            return;
        }
        if (text.Contains('\0'))
        {
            Problem(line, textColumn, "NUL character", $"NUL character in column '{_spec.Text}'");
            return;
        }
        if (label.IsWhiteSpace())
        {
            Problem(line, labelColumn, "missing label", $"missing label in column '{_spec.Label}'");
            return;
        }
        if (_groups is not null && group.IsWhiteSpace())
        {
            Problem(line, groupColumn, "missing group", $"missing group in column '{_spec.Group}'");
            return;
        }
        string? splitName = null;
        if (_splits is not null)
        {
            splitName = SplitNames.Canonical(split);
            if (splitName is null)
            {
                Problem(line, splitColumn, "unknown split value",
                    $"split value '{split}' in column '{_spec.Split}' is not one of {SplitNames.Accepted}");
                return;
            }
        }
        _texts.Add(text);
        _labels.Add(Intern(label));
        _groups?.Add(Intern(group));
        _splits?.Add(splitName!);
        _lines.Add(line);
    }

    string Intern(ReadOnlySpan<char> value)
    {
        if (_poolLookup.TryGetValue(value, out var s)) return s;
        s = value.ToString();
        _pool[s] = s;
        return s;
    }

    public LabelledTable Build(int headerLine)
    {
        if (_texts.Count == 0)
            throw new DataError(_source, headerLine, _skips.IsEmpty ? "empty file: no data rows" : $"no usable rows: {_skips}");
        return new LabelledTable(_source, _texts.ToArray(), _labels.ToArray(), _groups?.ToArray(), _splits?.ToArray(),
            _lines.ToArray(), _skips);
    }
}

/// <summary>The accepted spellings of predefined split values, mapped to train / validation / test.</summary>
internal static class SplitNames
{
    public const string Train = "train", Validation = "validation", Test = "test";
    public const string Accepted = "train, validation (or valid, val, dev), test";

    public static string? Canonical(ReadOnlySpan<char> value)
    {
        var v = value.Trim();
        if (v.Equals("train", StringComparison.OrdinalIgnoreCase) || v.Equals("training", StringComparison.OrdinalIgnoreCase)) return Train;
        if (v.Equals("validation", StringComparison.OrdinalIgnoreCase) || v.Equals("valid", StringComparison.OrdinalIgnoreCase)
            || v.Equals("val", StringComparison.OrdinalIgnoreCase) || v.Equals("dev", StringComparison.OrdinalIgnoreCase)) return Validation;
        if (v.Equals("test", StringComparison.OrdinalIgnoreCase) || v.Equals("testing", StringComparison.OrdinalIgnoreCase)) return Test;
        return null;
    }
}
