namespace IndexKeeper.Core.Search;

/// <summary>
/// The serving view's lock: searches and the view's writing to disk share it (they only read), a change to the view
/// takes it alone. A search never waits for the minutes a large view takes to write, only for a change's inserts.
/// Recursive, so a reader may read a figure that locks again.
/// </summary>
internal sealed class ViewGate
{
    private readonly ReaderWriterLockSlim gate = new(LockRecursionPolicy.SupportsRecursion);

    public Held Read()
    {
        gate.EnterReadLock();
        return new Held(gate, write: false);
    }

    public Held Write()
    {
        gate.EnterWriteLock();
        return new Held(gate, write: true);
    }

    /// <summary>Held until disposed.</summary>
    public readonly struct Held(ReaderWriterLockSlim gate, bool write) : IDisposable
    {
        public void Dispose()
        {
            if (write)
            {
                gate.ExitWriteLock();
            }
            else
            {
                gate.ExitReadLock();
            }
        }
    }
}
