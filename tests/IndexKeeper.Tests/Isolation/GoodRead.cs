using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;

namespace IndexKeeper.Tests.Isolation;

/// <summary>The check after every bad read: a good file through the isolated reader reads as in-process.</summary>
internal static class GoodRead
{
    public static void AssertWorks(IIsolatedDocumentReader reader, string goodPath)
    {
        var inProcess = ReadOutcome.Of(() => DocumentReaderFactory.Create().Read(goodPath, ReadLimits.Default, CancellationToken.None));
        var isolated = NoHang.Run(() => ReadOutcome.Of(() => reader.Read(goodPath, ReadLimits.Default, CancellationToken.None)));
        Assert.Equal(inProcess, isolated);
    }
}
