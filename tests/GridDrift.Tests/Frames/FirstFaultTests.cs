using GridDrift.Tests.Support;

namespace GridDrift.Tests.Frames;

/// <summary>
/// A fault while reading inside the two-worker frame loop ends the run: every worker stops at the
/// first fault, the command exits 2 with one line, and nothing hangs. The corrupt files are
/// copies of a deflate netCDF-4 record made by python netCDF4, each with one bit flipped; python
/// netCDF4 says which of them it can still read.
/// </summary>
public class FirstFaultTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void A_corrupt_chunk_read_by_two_workers_is_refused_without_hanging()
    {
        using var dir = new TempFolder();
        var copies = ExternalTools.RunPython("make_corrupt_chunks.py", dir.Path, "8")
            .Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l => l.Split(' ')).ToArray();
        int refused = 0;
        for (int round = 0; round < 3; round++)
            foreach (var copy in copies)
                foreach (var command in new[] { "stats", "similarity" })
                {
                    // CliRun fails the test if a run takes longer than its time limit
                    var outcome = CliRun.Run(command, copy[0], "--var", "tb", "--regions", "global", "--out", dir.File($"{command}.nc"), "--quiet");
                    if (copy[1] == "error")
                    {
                        Assert.True(outcome.ExitCode == 2, $"{command} {copy[0]}: exit {outcome.ExitCode}, {outcome.Stderr}");
                        Assert.Single(outcome.StderrLines);
                        refused++;
                    }
                    else Assert.True(outcome.ExitCode is 0 or 2, $"{command} {copy[0]}: exit {outcome.ExitCode}, {outcome.Stderr}");
                }
        Assert.True(refused > 0, "no copy was corrupt enough for python netCDF4 to refuse it: the test checked nothing");
    }

    [Fact]
    public void The_first_fault_of_a_job_stops_the_workers_from_starting_more()
    {
        using var team = new GridDrift.Frames.WorkerTeam(2);
        int started = 0;
        var fault = Assert.Throws<InvalidOperationException>(() => team.Run(10_000, i =>
        {
            Interlocked.Increment(ref started);
            if (i == 3) throw new InvalidOperationException("fault at 3");
            Thread.Sleep(1);
        }));
        Assert.Equal("fault at 3", fault.Message);
        Assert.True(started < 100, $"{started} indices started after the fault"); // each worker finishes at most the index it holds
    }
}
