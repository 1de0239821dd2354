namespace IndexKeeper.Core.Search;

/// <summary>Choices of one search; setters reject bad values at once.</summary>
public sealed class SearchOptions
{
    private int top = 10;
    private int candidates;
    private int parallelism = Environment.ProcessorCount;

    /// <summary>Number of hits to return (k).</summary>
    public int Top
    {
        get => top;
        set
        {
            ArgumentOutOfRangeException.ThrowIfLessThan(value, 1, nameof(Top));
            top = value;
        }
    }

    /// <summary>
    /// Pages the sign-code stage hands to the exact re-rank; 0 means max(10·k, 100). At or above the number of
    /// pages the first stage is skipped and every page is scored exactly.
    /// </summary>
    public int Candidates
    {
        get => candidates;
        set
        {
            ArgumentOutOfRangeException.ThrowIfNegative(value, nameof(Candidates));
            candidates = value;
        }
    }

    /// <summary>Threads that score pages at once.</summary>
    public int Parallelism
    {
        get => parallelism;
        set
        {
            ArgumentOutOfRangeException.ThrowIfLessThan(value, 1, nameof(Parallelism));
            parallelism = value;
        }
    }

    internal int EffectiveCandidates => candidates > 0 ? Math.Max(candidates, top) : Math.Max(10 * top, 100);
}
