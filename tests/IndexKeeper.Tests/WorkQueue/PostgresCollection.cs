namespace IndexKeeper.Tests.WorkQueue;

/// <summary>The tests that share one throwaway PostgreSQL server (<see cref="PostgresServer"/>).</summary>
[CollectionDefinition(Name)]
public sealed class PostgresCollection : ICollectionFixture<PostgresServer>
{
    public const string Name = "PostgreSQL";
}
