using GridDrift.Frames;

namespace GridDrift.Tests.Frames;

public class WorkerTeamTests
{
    [Fact]
    public void Every_index_of_every_job_runs_exactly_once()
    {
        using var team = new WorkerTeam(3);
        var hits = new int[7];
        for (int job = 0; job < 2000; job++)
        {
            int count = 1 + job % 7;
            team.Run(count, i => Interlocked.Increment(ref hits[i]));
        }
        // index i takes part in the jobs whose count exceeds i: count = 1 + job % 7
        for (int i = 0; i < 7; i++) Assert.Equal(2000 / 7 * (7 - i) + Math.Max(0, 2000 % 7 - i), hits[i]);
    }

    [Fact]
    public void A_fault_in_a_worker_reaches_the_caller_and_the_team_keeps_working()
    {
        using var team = new WorkerTeam(2);
        var fault = Assert.Throws<InvalidOperationException>(() => team.Run(4, i => { if (i == 3) throw new InvalidOperationException("job 3"); }));
        Assert.Equal("job 3", fault.Message);
        int sum = 0;
        team.Run(4, i => Interlocked.Add(ref sum, i));
        Assert.Equal(6, sum);
    }

    [Fact]
    public void A_job_on_part_of_the_team_runs_on_no_more_threads_than_asked()
    {
        using var team = new WorkerTeam(3);
        for (int workers = 1; workers <= 3; workers++)
        {
            var threads = new System.Collections.Concurrent.ConcurrentDictionary<int, bool>();
            var hits = new int[64];
            // each index waits a little, so that every released helper gets a share
            team.Run(64, i => { threads[Environment.CurrentManagedThreadId] = true; Interlocked.Increment(ref hits[i]); Thread.Sleep(1); }, workers);
            Assert.All(hits, h => Assert.Equal(1, h));
            Assert.InRange(threads.Count, 1, workers);
        }
    }
}
