using System.Runtime.InteropServices;
using Kit.Data;

namespace Kit.Experiments;

/// <summary>What an n-gram is made of: characters (or bytes) inside word boundaries, or whole words.</summary>
public enum NgramUnit { Character, Word }

/// <summary>How an n-gram's count in a row becomes its feature value.</summary>
public enum NgramWeighting { Count, TfIdf }

/// <summary>
/// The n-grams a baseline reads and how they are weighted. <see cref="ForTokenizer"/> gives the usual choice:
/// character 1–5-grams with word-boundary marks for character and byte tokens, word 1–2-grams for word tokens,
/// tf-idf with sublinear term frequency.
/// </summary>
public sealed record NgramScheme(NgramUnit Unit, int MinN, int MaxN, NgramWeighting Weighting = NgramWeighting.TfIdf, bool SublinearTf = true)
{
    public static NgramScheme ForTokenizer(TokenizerKind tokenizer) => tokenizer == TokenizerKind.Word
        ? new NgramScheme(NgramUnit.Word, 1, 2)
        : new NgramScheme(NgramUnit.Character, 1, 5);

    public NgramScheme Validate()
    {
        if (MinN < 1 || MaxN < MinN) throw new ArgumentException($"n-gram range {MinN}..{MaxN} is empty or starts below 1");
        if (!Enum.IsDefined(Unit) || !Enum.IsDefined(Weighting)) throw new ArgumentException("unknown n-gram unit or weighting");
        return this;
    }

    public override string ToString() =>
        $"{(Unit == NgramUnit.Word ? "word" : "character")} {MinN}–{MaxN}-grams, " +
        (Weighting == NgramWeighting.Count ? "counts" : SublinearTf ? "tf-idf (sublinear tf)" : "tf-idf");
}

/// <summary>Rows of a sparse matrix (compressed rows): row r's columns are Columns[Starts[r] .. Starts[r+1]).</summary>
public sealed record SparseRows(int[] Starts, int[] Columns, double[] Values, int Width)
{
    public int Count => Starts.Length - 1;
    public ReadOnlySpan<int> ColumnsOf(int row) => Columns.AsSpan(Starts[row], Starts[row + 1] - Starts[row]);
    public ReadOnlySpan<double> ValuesOf(int row) => Values.AsSpan(Starts[row], Starts[row + 1] - Starts[row]);
}

/// <summary>
/// Token sequences → sparse n-gram feature rows, with the n-gram vocabulary (and document frequencies) taken from
/// the training rows only; n-grams never seen there are ignored later.
///
/// Character n-grams are cut inside words: each maximal run of non-space tokens gets a boundary mark (a space) on
/// both sides, and every window of n units of that marked word is an n-gram, so prefixes and suffixes are features
/// of their own. Word n-grams are windows of n consecutive word tokens.
///
/// tf-idf: tf = count, or 1 + ln(count) when sublinear (Manning, Raghavan and Schütze 2008, Introduction to
/// Information Retrieval, §6.4.1); idf = ln((1 + n) / (1 + df)) + 1, the smoothed form that keeps every training
/// n-gram's weight positive (as the general-purpose library scikit-learn defines it, TfidfTransformer); each row is
/// then scaled to unit Euclidean length (§6.3.1). Counts are used raw.
/// </summary>
public sealed class NgramFeatures
{
    const char Mark = ' ';
    /// <summary>The unigram of the word-boundary mark.</summary>
    public const string BoundaryMark = " ";
    const char Joint = '\u0001';

    public NgramScheme Scheme { get; }
    readonly Dictionary<string, int> _index;
    readonly string[] _ngrams;
    readonly double[] _idf;

    NgramFeatures(NgramScheme scheme, string[] ngrams, double[] idf)
    {
        Scheme = scheme;
        _ngrams = ngrams;
        _idf = idf;
        _index = new Dictionary<string, int>(ngrams.Length, StringComparer.Ordinal);
        for (int i = 0; i < ngrams.Length; i++) _index[ngrams[i]] = i;
    }

    public int Count => _ngrams.Length;
    /// <summary>Column of an n-gram, or −1 when it was not seen in training.</summary>
    public int IndexOf(string ngram) => _index.TryGetValue(ngram, out int j) ? j : -1;
    public IReadOnlyList<string> Ngrams => _ngrams;
    /// <summary>idf of each n-gram (all 1 under count weighting).</summary>
    public IReadOnlyList<double> Idf => _idf;

    /// <summary>Vocabulary (in ordinal order, so it does not depend on the order of rows) and idf from training rows.</summary>
    public static NgramFeatures Fit(IReadOnlyList<IReadOnlyList<string>> rows, NgramScheme scheme)
    {
        scheme.Validate();
        if (rows.Count == 0) throw new ArgumentException("no training rows to take n-grams from");
        var df = new Dictionary<string, int>(StringComparer.Ordinal);
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var row in rows)
        {
            seen.Clear();
            foreach (var g in Extract(row, scheme))
                if (seen.Add(g)) CollectionsMarshal.GetValueRefOrAddDefault(df, g, out _)++;
        }
        var ngrams = df.Keys.ToArray();
        Array.Sort(ngrams, StringComparer.Ordinal);
        double n = rows.Count;
        var idf = ngrams.Select(g => scheme.Weighting == NgramWeighting.TfIdf ? Math.Log((1 + n) / (1 + df[g])) + 1 : 1.0).ToArray();
        return new NgramFeatures(scheme, ngrams, idf);
    }

    /// <summary>Rebuilds fitted features from their stored n-grams and idf (see <see cref="NgramModelFile"/>).</summary>
    public static NgramFeatures FromParts(NgramScheme scheme, string[] ngrams, double[] idf)
    {
        if (ngrams.Length != idf.Length) throw new ArgumentException($"{ngrams.Length} n-grams but {idf.Length} idf values");
        return new NgramFeatures(scheme.Validate(), ngrams, idf);
    }

    /// <summary>Feature rows for token sequences; each row's columns are in increasing order.</summary>
    public SparseRows Transform(IReadOnlyList<IReadOnlyList<string>> rows)
    {
        var starts = new int[rows.Count + 1];
        var columns = new List<int>();
        var values = new List<double>();
        var counts = new Dictionary<int, int>();
        for (int r = 0; r < rows.Count; r++)
        {
            counts.Clear();
            foreach (var g in Extract(rows[r], Scheme))
                if (_index.TryGetValue(g, out int j)) CollectionsMarshal.GetValueRefOrAddDefault(counts, j, out _)++;
            var keys = counts.Keys.ToArray();
            Array.Sort(keys);
            int at = values.Count;
            double norm = 0;
            foreach (int j in keys)
            {
                double v = counts[j];
                if (Scheme.Weighting == NgramWeighting.TfIdf)
                {
                    v = (Scheme.SublinearTf ? 1 + Math.Log(v) : v) * _idf[j];
                    norm += v * v;
                }
                columns.Add(j);
                values.Add(v);
            }
            if (Scheme.Weighting == NgramWeighting.TfIdf && norm > 0)
            {
                double scale = 1 / Math.Sqrt(norm);
                for (int k = at; k < values.Count; k++) values[k] *= scale;
            }
            starts[r + 1] = values.Count;
        }
        return new SparseRows(starts, columns.ToArray(), values.ToArray(), Count);
    }

    /// <summary>Every n-gram of one token sequence under a scheme, with repeats (a row's counts).</summary>
    public static IEnumerable<string> Extract(IReadOnlyList<string> tokens, NgramScheme scheme) =>
        scheme.Unit == NgramUnit.Word ? WordNgrams(tokens, scheme.MinN, scheme.MaxN) : CharacterNgrams(tokens, scheme.MinN, scheme.MaxN);

    static IEnumerable<string> WordNgrams(IReadOnlyList<string> tokens, int minN, int maxN)
    {
        for (int n = minN; n <= maxN; n++)
            for (int i = 0; i + n <= tokens.Count; i++)
                yield return n == 1 ? tokens[i] : string.Join(Joint, tokens.Skip(i).Take(n));
    }

    static IEnumerable<string> CharacterNgrams(IReadOnlyList<string> tokens, int minN, int maxN)
    {
        var word = new List<string>();
        for (int i = 0; i <= tokens.Count; i++)
        {
            bool boundary = i == tokens.Count || string.IsNullOrWhiteSpace(tokens[i]);
            if (!boundary) { word.Add(tokens[i]); continue; }
            if (word.Count == 0) continue;
            var marked = new string[word.Count + 2];
            marked[0] = marked[^1] = Mark.ToString();
            for (int k = 0; k < word.Count; k++) marked[k + 1] = word[k];
            for (int n = minN; n <= maxN; n++)
                for (int s = 0; s + n <= marked.Length; s++)
                    yield return n == 1 ? marked[s] : string.Concat(marked.AsSpan(s, n));
            word.Clear();
        }
    }
}
