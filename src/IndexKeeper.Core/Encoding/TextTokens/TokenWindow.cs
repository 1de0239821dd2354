namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>A run of a page's word-piece tokens that goes through the model at once ([CLS] and [SEP] are added around it).</summary>
internal readonly record struct TokenWindow(int Start, int Length)
{
    public int End => Start + Length;
}
