namespace GridDrift.Cli;

/// <summary>The exit codes of DESIGN.md.</summary>
public static class ExitCodes
{
    public const int Success = 0;
    public const int Usage = 1;
    public const int BadInput = 2;
    public const int InternalFault = 3;
    /// <summary>griddrift submit --wait: a batch job failed, or was never run because one before it failed.</summary>
    public const int JobsFailed = 4;
}
