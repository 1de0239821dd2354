namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// Cuts a token sequence into overlapping windows of at most <c>capacity</c> tokens and picks, for every
/// token, the one window whose state for it is used: the window where the token is most central (most
/// context on its nearer side), the earlier window on a tie. Every window of a long sequence is full, the
/// last one aligned to the end, so long pages give windows of one length that batch without padding.
/// </summary>
internal sealed class TokenWindowPlan
{
    private TokenWindowPlan(TokenWindow[] windows, int[] windowOfToken)
    {
        Windows = windows;
        WindowOfToken = windowOfToken;
    }

    public IReadOnlyList<TokenWindow> Windows { get; }

    /// <summary>For each token, the index of the window whose state is used for it.</summary>
    public IReadOnlyList<int> WindowOfToken { get; }

    public static TokenWindowPlan Create(int tokenCount, int capacity, int overlap)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(tokenCount);
        ArgumentOutOfRangeException.ThrowIfLessThan(capacity, 1);
        ArgumentOutOfRangeException.ThrowIfNegative(overlap);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(overlap, capacity);
        if (tokenCount == 0)
        {
            return new TokenWindowPlan([], []);
        }

        var windows = new List<TokenWindow>();
        if (tokenCount <= capacity)
        {
            windows.Add(new TokenWindow(0, tokenCount));
        }
        else
        {
            var stride = capacity - overlap;
            for (var start = 0; start + capacity < tokenCount; start += stride)
            {
                windows.Add(new TokenWindow(start, capacity));
            }

            windows.Add(new TokenWindow(tokenCount - capacity, capacity));
        }

        var owner = new int[tokenCount];
        var first = 0;
        for (var token = 0; token < tokenCount; token++)
        {
            // Windows are ordered by start (and end), so the candidates for a token are a contiguous run.
            while (windows[first].End <= token)
            {
                first++;
            }

            var best = first;
            var bestMargin = Margin(windows[first], token);
            for (var w = first + 1; w < windows.Count && windows[w].Start <= token; w++)
            {
                var margin = Margin(windows[w], token);
                if (margin > bestMargin)
                {
                    best = w;
                    bestMargin = margin;
                }
            }

            owner[token] = best;
        }

        return new TokenWindowPlan(windows.ToArray(), owner);
    }

    private static int Margin(TokenWindow window, int token) => Math.Min(token - window.Start, window.End - 1 - token);
}
