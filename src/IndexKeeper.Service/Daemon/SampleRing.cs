namespace IndexKeeper.Service.Daemon;

/// <summary>The last day of samples in memory (a fixed ring: the daemon runs all year in bounded memory). Thread-safe.</summary>
internal sealed class SampleRing(int capacity)
{
    private readonly Sample[] samples = new Sample[capacity];
    private int next;
    private int count;

    public void Add(Sample sample)
    {
        lock (samples)
        {
            samples[next] = sample;
            next = (next + 1) % samples.Length;
            count = Math.Min(count + 1, samples.Length);
        }
    }

    /// <summary>Samples oldest first.</summary>
    public IReadOnlyList<Sample> Snapshot()
    {
        lock (samples)
        {
            var list = new List<Sample>(count);
            for (var i = 0; i < count; i++)
            {
                list.Add(samples[(next - count + i + samples.Length) % samples.Length]);
            }

            return list;
        }
    }
}
