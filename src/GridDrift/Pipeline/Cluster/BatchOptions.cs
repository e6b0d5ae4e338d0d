namespace GridDrift.Pipeline.Cluster;

/// <summary>What `griddrift submit` passes to every batch job: the scheduler's own options, unchanged.</summary>
internal sealed record BatchOptions(string? Partition = null, string? Time = null, string? Memory = null, string? Account = null, IReadOnlyList<string>? Extra = null)
{
    public IEnumerable<string> Directives()
    {
        if (Partition is not null) yield return $"--partition={Partition}";
        if (Time is not null) yield return $"--time={Time}";
        if (Memory is not null) yield return $"--mem={Memory}";
        if (Account is not null) yield return $"--account={Account}";
        foreach (var e in Extra ?? []) yield return e;
    }
}
