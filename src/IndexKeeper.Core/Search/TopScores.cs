namespace IndexKeeper.Core.Search;

/// <summary>
/// The best <c>capacity</c> (score, ordinal) pairs seen, kept in a min-heap. Higher scores win and equal
/// scores go to the lower ordinal, a total order, so any split of the work across threads gives one answer.
/// </summary>
internal sealed class TopScores
{
    private readonly (float Score, int Ordinal)[] heap;
    private int count;

    public TopScores(int capacity) => heap = new (float, int)[capacity];

    public int Count => count;

    public void Offer(float score, int ordinal)
    {
        if (count < heap.Length)
        {
            heap[count] = (score, ordinal);
            SiftUp(count++);
        }
        else if (heap.Length > 0 && Worse(heap[0], (score, ordinal)))
        {
            heap[0] = (score, ordinal);
            SiftDown(0);
        }
    }

    public void AddTo(TopScores other)
    {
        for (var i = 0; i < count; i++)
        {
            other.Offer(heap[i].Score, heap[i].Ordinal);
        }
    }

    /// <summary>Best first.</summary>
    public (float Score, int Ordinal)[] ToSorted()
    {
        var sorted = heap[..count];
        Array.Sort(sorted, static (a, b) => Worse(a, b) ? 1 : Worse(b, a) ? -1 : 0);
        return sorted;
    }

    private static bool Worse((float Score, int Ordinal) a, (float Score, int Ordinal) b) =>
        a.Score < b.Score || (a.Score == b.Score && a.Ordinal > b.Ordinal);

    private void SiftUp(int i)
    {
        while (i > 0)
        {
            var parent = (i - 1) / 2;
            if (!Worse(heap[i], heap[parent]))
            {
                return;
            }

            (heap[i], heap[parent]) = (heap[parent], heap[i]);
            i = parent;
        }
    }

    private void SiftDown(int i)
    {
        while (true)
        {
            var worst = i;
            var left = (2 * i) + 1;
            var right = left + 1;
            if (left < count && Worse(heap[left], heap[worst]))
            {
                worst = left;
            }

            if (right < count && Worse(heap[right], heap[worst]))
            {
                worst = right;
            }

            if (worst == i)
            {
                return;
            }

            (heap[i], heap[worst]) = (heap[worst], heap[i]);
            i = worst;
        }
    }
}
