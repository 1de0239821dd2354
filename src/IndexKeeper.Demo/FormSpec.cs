namespace IndexKeeper.Demo;

/// <summary>One filled-in inspection form.</summary>
internal sealed record FormSpec(string Code, string Title, DemoTopic Topic, string Site, DateOnly Date, string Inspector, int PageCount);
