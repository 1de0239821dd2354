namespace IndexKeeper.Core.Storage;

/// <summary>When an open segment should be sealed, and how the writer buffers.</summary>
public sealed class SegmentWriterOptions
{
    /// <summary>Seal once the segment holds this many bytes (soft: the record that crosses it is kept whole).</summary>
    public long SealAtBytes { get; init; } = 256L * 1024 * 1024;

    /// <summary>Seal once the segment is this old, so a quiet index still gets immutable, compactable files.</summary>
    public TimeSpan SealAtAge { get; init; } = TimeSpan.FromHours(1);

    public int WriteBufferBytes { get; init; } = 1024 * 1024;

    /// <summary>Every problem with these options, each naming its setting; empty when they are valid.</summary>
    public IReadOnlyList<string> Validate()
    {
        var problems = new List<string>();
        if (SealAtBytes < 64 * 1024)
        {
            problems.Add($"{nameof(SealAtBytes)} must be at least 65536 (got {SealAtBytes}).");
        }

        if (SealAtAge <= TimeSpan.Zero)
        {
            problems.Add($"{nameof(SealAtAge)} must be positive (got {SealAtAge}).");
        }

        if (WriteBufferBytes is < 4096 or > 64 * 1024 * 1024)
        {
            problems.Add($"{nameof(WriteBufferBytes)} must be from 4096 to 67108864 (got {WriteBufferBytes}).");
        }

        return problems;
    }

    internal void ThrowIfInvalid()
    {
        var problems = Validate();
        if (problems.Count > 0)
        {
            throw new ArgumentException(string.Join(" ", problems));
        }
    }
}
