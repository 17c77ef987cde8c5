using Kit.Cli;
using Kit.Training;

namespace Kit.Tests.Training;

public class ConsoleProgressTests
{
    [Fact]
    public void The_progress_line_is_plain_words_with_time_left()
    {
        string line = ConsoleProgress.Line(new TrainingProgress(3, 8, 120, 217, 0.18523, 0.93, TimeSpan.FromSeconds(40)));
        Assert.Equal("epoch 3 of 8, batch 120 of 217 (55 %), loss 0.1852, val acc 93.0 %, left 0:40", line);
        Assert.DoesNotContain("[", line);
        Assert.DoesNotContain("eta", line);
        Assert.Equal("epoch 1 of 2, batch 0 of 0 (0 %), loss 1.0000, left 0:00",
            ConsoleProgress.Line(new TrainingProgress(1, 2, 0, 0, 1, null, TimeSpan.FromSeconds(-3))));
    }

    [Fact]
    public void Time_left_reads_minutes_and_seconds_then_hours()
    {
        Assert.Equal("0:12", ConsoleProgress.Left(TimeSpan.FromSeconds(12)));
        Assert.Equal("12:05", ConsoleProgress.Left(TimeSpan.FromSeconds(725)));
        Assert.Equal("1:02:03", ConsoleProgress.Left(new TimeSpan(1, 2, 3)));
        Assert.Equal("26:00:00", ConsoleProgress.Left(TimeSpan.FromHours(26)));
    }
}
