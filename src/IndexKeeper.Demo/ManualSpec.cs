namespace IndexKeeper.Demo;

/// <summary>What one operation and maintenance manual is about and how long it is.</summary>
internal sealed record ManualSpec(
    string Code,
    string Title,
    DemoTopic Topic,
    string Site,
    string Revision,
    string Author,
    DateOnly Issued,
    int PageCount);
