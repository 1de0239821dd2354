namespace IndexKeeper.Core.Detect;

/// <summary>A regular file under a root that the root's selection did not take: counted, never silently dropped.</summary>
/// <param name="ReadableType">True when a reader could read it (an include or exclude glob left it out); false: a type no reader takes.</param>
public sealed record PassedOverFile(string Root, string RelativePath, bool ReadableType);
