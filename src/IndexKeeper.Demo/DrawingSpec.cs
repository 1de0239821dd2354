namespace IndexKeeper.Demo;

/// <summary>One engineering drawing of one or more A3 sheets.</summary>
internal sealed record DrawingSpec(string Number, string Title, DemoTopic Topic, string Site, string Revision, DateOnly Date, string DrawnBy, int Sheets);
