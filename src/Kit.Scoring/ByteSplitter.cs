using System.Text;

namespace Kit.Scoring;

/// <summary>One token per UTF-8 byte, spelled "&lt;XX&gt;" (two upper-case hex digits); no normalisation.</summary>
internal sealed class ByteSplitter : TokenSplitter
{
    static readonly string[] Spelled = Enumerable.Range(0, 256).Select(b => "<" + b.ToString("X2") + ">").ToArray();

    public override IReadOnlyList<string> Split(string text) => Encoding.UTF8.GetBytes(text).Select(b => Spelled[b]).ToArray();
}
