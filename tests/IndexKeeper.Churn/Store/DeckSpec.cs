using IndexKeeper.Demo;

namespace IndexKeeper.Churn.Store;

/// <summary>A slide deck of the simulated drive: a briefing on one topic at one site.</summary>
internal sealed record DeckSpec(string Code, string Title, DemoTopic Topic, string Site, string Author, DateOnly Date);
