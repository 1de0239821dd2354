using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Pipeline;

/// <summary>What a scan pass needs to know, already validated by the host.</summary>
/// <param name="Settle">Files modified more recently than this are waited for once at the end of the walk.</param>
/// <param name="BatchSize">Documents per catalog transaction; a crash loses at most one batch of work, never consistency.</param>
/// <param name="OfficeConverter">
/// The office converter the reader runs (<see cref="ReaderSettings.OfficeConverter"/>); documents it drew in
/// another version are read again. Null: the pass does not track the converter.
/// </param>
public sealed record ScanSettings(IReadOnlyList<RootSpec> Roots, ReadLimits Limits, TimeSpan Settle, int BatchSize = 256, string? OfficeConverter = null);
