namespace IndexKeeper.Churn.Report;

/// <summary>One strategy's cost on one day.</summary>
/// <param name="EncoderCalls">Encoder page calls.</param>
/// <param name="HashedTermSeconds">Encoder seconds with the hashed-term encoder: measured for (c); calls × (c)'s measured mean for (a) and (b).</param>
/// <param name="MiniLmSeconds">Encoder seconds with the minilm encoder: calls × the per-page time measured on a sample in the same run.</param>
/// <param name="BytesWritten">Vector bytes written (for (c): segment bytes appended plus compaction rewrites).</param>
/// <param name="BytesOnDisk">Vector bytes held at the end of the day (for (c): the whole index directory).</param>
/// <param name="Misses">Pages whose content changed but that are not served with vectors of it.</param>
/// <param name="StaleServed">Vectors or catalog pages served for content no file holds any more.</param>
internal sealed record StrategyDay(long EncoderCalls, double HashedTermSeconds, double MiniLmSeconds, long BytesWritten, long BytesOnDisk, long Misses, long StaleServed);
