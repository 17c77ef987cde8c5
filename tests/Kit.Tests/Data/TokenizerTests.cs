using System.Text;
using Kit.Data;

namespace Kit.Tests.Data;

public class TokenizerTests
{
    // RFC 3629 ("UTF-8, a transformation format of ISO 10646", Yergeau, 2003), section 7, all four examples.
    [Theory]
    [InlineData("A\u2262\u0391.", "41 E2 89 A2 CE 91 2E")]
    [InlineData("\uD55C\uAD6D\uC5B4", "ED 95 9C EA B5 AD EC 96 B4")]
    [InlineData("\u65E5\u672C\u8A9E", "E6 97 A5 E6 9C AC E8 AA 9E")]
    [InlineData("\uFEFF\U000233B4", "EF BB BF F0 A3 8E B4")]
    public void ByteTokenizerMatchesRfc3629Examples(string text, string hex)
    {
        var expected = hex.Split(' ').Select(h => Convert.ToByte(h, 16)).ToArray();
        var tokens = new ByteTokenizer().Split(text);
        Assert.Equal(expected.Select(ByteTokenizer.Spelling), tokens);
        var vocab = ByteTokenizer.FixedVocabulary();
        Assert.Equal(expected.Select(b => b + ByteTokenizer.ByteOffset), vocab.Ids(tokens));
    }

    [Fact]
    public void ByteVocabularyIsClosedAndOrdered()
    {
        var vocab = ByteTokenizer.FixedVocabulary();
        Assert.Equal(258, vocab.Count);
        Assert.Equal("<00>", vocab.Token(2));
        Assert.Equal("<FF>", vocab.Token(257));
        Assert.Equal(Vocabulary.PadToken, vocab.Token(Vocabulary.PadId));
    }

    [Fact]
    public void CharacterTokenizerKeepsTextElementsTogether()
    {
        var t = new CharacterTokenizer();
        // U+1F600 is a surrogate pair in UTF-16; "e" + U+0301 is one letter with a combining accent.
        Assert.Equal(["a", "\U0001F600", "\u00E9", "x"], t.Split("a\U0001F600e\u0301x"));
        // The decomposed e + U+0301 is put in NFC, so it equals the precomposed U+00E9 (Unicode UAX #15).
        Assert.Equal(t.Split("caf\u00E9"), t.Split("cafe\u0301"));
        // A combining mark with no precomposed form stays attached: q + U+0307 is one text element (UAX #29).
        Assert.Equal(["q\u0307", "r"], t.Split("q\u0307r"));
        // A regional-indicator pair (a flag) is one extended grapheme cluster (UAX #29, rule GB12).
        Assert.Single(t.Split("\U0001F1EB\U0001F1F7"));
    }

    [Fact]
    public void CharacterTokenizerFoldsCaseOnlyWhenAsked()
    {
        Assert.Equal(["A", "b"], new CharacterTokenizer().Split("Ab"));
        Assert.Equal(["a", "b", "\u00E9"], new CharacterTokenizer(foldCase: true).Split("AB\u00C9"));
    }

    [Fact]
    public void WordTokenizerSplitsOnSpaceAndPunctuation()
    {
        Assert.Equal(["don", "'", "t", "stop", "!", "v2", "_x", "3", ".", "5"], new WordTokenizer().Split("Don't  STOP!\tv2 _x 3.5"));
        Assert.Equal(["Relay", "K1", "tripped"], new WordTokenizer(lowerCase: false).Split(" Relay K1\ntripped "));
        Assert.Empty(new WordTokenizer().Split(" \t "));
        // A combining mark stays inside its word; the accented form is put in NFC.
        Assert.Equal(["caf\u00E9", "ok"], new WordTokenizer().Split("cafe\u0301 ok"));
    }

    [Fact]
    public void DelegateTokenizerRoundTripsThroughItsSpecByName()
    {
        var dashes = new DelegateTokenizer("dash", s => s.Split('-'));
        Assert.Equal(["a", "b"], dashes.Split("a-b"));
        var spec = TokenizerSpec.FromJson(TokenizerSpec.Of(dashes).ToJson());
        Assert.Equal(TokenizerSpec.Delegate, spec.Kind);
        Assert.Throws<InvalidOperationException>(() => spec.Create());
        Assert.Same(dashes, spec.Create(name => dashes));
        Assert.Throws<InvalidOperationException>(() => spec.Create(_ => new DelegateTokenizer("other", s => [s])));
    }

    [Fact]
    public void SpecsRebuildEquivalentTokenizers()
    {
        ITokenizer[] all = [new CharacterTokenizer(), new CharacterTokenizer(true), new ByteTokenizer(), new WordTokenizer(), new WordTokenizer(false)];
        const string sample = "Héllo, Wörld! \U0001F600";
        foreach (var t in all)
        {
            var json = TokenizerSpec.Of(t).ToJson();
            var rebuilt = TokenizerSpec.FromJson(json).Create();
            Assert.Equal(t.Name, rebuilt.Name);
            Assert.Equal(t.Split(sample), rebuilt.Split(sample));
        }
        Assert.Throws<InvalidDataException>(() => TokenizerSpec.FromJson("{\"version\":9,\"kind\":\"byte\"}"));
    }

    [Fact]
    public void DotNetUtf8AgreesWithTheRfcTable()
    {
        // RFC 3629 §3 table: U+0080..U+07FF take two bytes, U+0800..U+FFFF three, U+10000..U+10FFFF four.
        Assert.Equal(2, new ByteTokenizer().Split("\u07FF").Count);
        Assert.Equal(3, new ByteTokenizer().Split("\u0800").Count);
        Assert.Equal(4, new ByteTokenizer().Split("\U0010FFFF").Count);
        Assert.Equal(Encoding.UTF8.GetBytes("\U0010FFFF"), ByteTokenizer.Bytes("\U0010FFFF"));
    }
}

public class CharacterTokenizerPathTests
{
    [Fact]
    public void AsciiFastPathAgreesWithTextElementSegmentation()
    {
        // The ASCII shortcut must give what StringInfo's UAX #29 segmentation gives, CR LF included.
        var t = new CharacterTokenizer();
        foreach (var s in new[] { "abc-01.x", "a\tb\nc", "a\r\nb", "\u007F\u0001z", "mixé" })
        {
            var expected = new List<string>();
            var e = System.Globalization.StringInfo.GetTextElementEnumerator(s.Normalize(System.Text.NormalizationForm.FormC));
            while (e.MoveNext()) expected.Add((string)e.Current);
            Assert.Equal(expected, t.Split(s));
        }
        Assert.Equal(["a", "\r\n", "b"], t.Split("a\r\nb"));
    }
}
