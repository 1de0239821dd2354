using IndexKeeper.Service.Configuration;
using Npgsql;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// The workers <c>plan</c> counts when no daemon answers (docs/work-queue.md, "Observing"): read from PostgreSQL
/// in read-only transactions, creating nothing. Without Queue:Connection there are none.
/// </summary>
public static class PlanWorkers
{
    /// <summary>
    /// The workers seen in the last day; null with <paramref name="problem"/> set when the database is out of reach
    /// (the plan then uses the local history). A login PostgreSQL refuses is a <see cref="ConfigurationException"/>.
    /// </summary>
    public static IReadOnlyList<WorkerFigures>? Read(QueueOptions queue, out string? problem)
    {
        ArgumentNullException.ThrowIfNull(queue);
        problem = null;
        if (string.IsNullOrWhiteSpace(queue.Connection))
        {
            return null;
        }

        using var database = QueueDatabase.Create(queue, "indexkeeper-plan", readOnly: true);
        try
        {
            return new WorkerTable(database).All();
        }
        catch (PostgresException ex) when (QueueDatabase.IsSettingProblem(ex))
        {
            throw QueueDatabase.AsConfiguration(ex);
        }
        catch (PostgresException ex) when (ex.SqlState is "42P01" or "3F000")
        {
            // No queue tables yet (undefined table or schema, PostgreSQL's "Error Codes" appendix): no coordinator ran, so no worker.
            return [];
        }
        catch (Exception ex) when (QueueDatabase.IsUnreachable(ex))
        {
            problem = $"Queue:Connection: PostgreSQL is out of reach ({ex.Message}); the plan counts no workers.";
            return null;
        }
    }
}
