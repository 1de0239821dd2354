namespace IndexKeeper.Demo;

/// <summary>The words of one topic that the phrase generator fills its templates with.</summary>
internal sealed record TopicWords(
    string Name,
    IReadOnlyList<string> Equipment,
    IReadOnlyList<string> Parts,
    IReadOnlyList<string> Conditions,
    IReadOnlyList<ReadingPattern> Readings,
    IReadOnlyList<string> Sections,
    IReadOnlyList<string> Procedures,
    IReadOnlyList<(string Symptom, string Cause, string Action)> Faults,
    IReadOnlyList<(string Task, string Interval)> Tasks);
