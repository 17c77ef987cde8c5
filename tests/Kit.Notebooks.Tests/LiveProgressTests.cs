namespace Kit.Notebooks.Tests;

public class LiveProgressTests
{
    /// <summary>A clock the test moves by hand.</summary>
    sealed class ManualClock : TimeProvider
    {
        long _ticks;
        public override long TimestampFrequency => TimeSpan.TicksPerSecond;
        public override long GetTimestamp() => _ticks;
        public void Advance(TimeSpan by) => _ticks += by.Ticks;
    }

    [Theory]
    [InlineData(1, 4, 0, 10, 0.0)]
    [InlineData(2, 4, 5, 10, 0.375)]
    [InlineData(4, 4, 10, 10, 1.0)]
    [InlineData(3, 4, 0, 0, 0.75)]
    public void Fraction_counts_finished_epochs_plus_the_share_of_the_current_one(int epoch, int epochs, int batch, int batches, double expected)
    {
        Assert.Equal(expected, new ProgressSnapshot(epoch, epochs, batch, batches, 1.0).Fraction, 12);
    }

    [Fact]
    public void Training_progress_maps_to_a_snapshot_field_by_field()
    {
        var p = new Kit.Training.TrainingProgress(2, 5, 7, 9, 0.375, 0.8125, TimeSpan.FromSeconds(12));
        var s = LiveProgress.FromTraining(p);
        Assert.Equal(new ProgressSnapshot(2, 5, 7, 9, 0.375, 0.8125, TimeSpan.FromSeconds(12), "validation accuracy"), s);
        var live = LiveProgress.ForTraining("t", new ManualClock());
        live.Report(p);
        Assert.Equal(s, live.Last);
    }

    [Fact]
    public void Time_left_scales_elapsed_time_by_the_share_still_to_do()
    {
        var clock = new ManualClock();
        var live = LiveProgress.Start("t", clock);
        clock.Advance(TimeSpan.FromSeconds(10));
        var quarter = new ProgressSnapshot(1, 4, 10, 10, 0.5);
        // 10 s for a quarter of the work leaves 30 s for the other three quarters.
        Assert.Equal(TimeSpan.FromSeconds(30), live.EstimatedRemaining(quarter));
        Assert.Equal(TimeSpan.FromSeconds(5), live.EstimatedRemaining(quarter with { Eta = TimeSpan.FromSeconds(5) }));
        Assert.Null(live.EstimatedRemaining(new ProgressSnapshot(1, 4, 0, 10, 0.5)));
    }

    [Fact]
    public void Drawing_is_throttled_within_an_epoch_but_every_new_epoch_and_the_end_are_drawn()
    {
        var clock = new ManualClock();
        var live = new LiveProgress<ProgressSnapshot>(s => s, "t", clock) { MinInterval = TimeSpan.FromSeconds(1) };
        for (int batch = 1; batch <= 9; batch++) live.Report(new ProgressSnapshot(1, 2, batch, 10, 1.0 / batch));
        Assert.Equal(1, live.Draws);
        clock.Advance(TimeSpan.FromSeconds(1));
        live.Report(new ProgressSnapshot(1, 2, 10, 10, 0.1));
        Assert.Equal(2, live.Draws);
        live.Report(new ProgressSnapshot(2, 2, 1, 10, 0.09));
        Assert.Equal(3, live.Draws);
        live.Report(new ProgressSnapshot(2, 2, 10, 10, 0.05));
        Assert.Equal(4, live.Draws);
        Assert.Equal(12, live.LossHistory.Count);
    }

    [Fact]
    public void A_mapper_adapts_another_progress_record()
    {
        var live = LiveProgress.Start<(int Step, double Loss)>(p => new ProgressSnapshot(1, 1, p.Step, 4, p.Loss), "mapped");
        live.Report((2, 0.25));
        Assert.Equal(0.25, live.Last!.Loss);
        Assert.Equal(0.5, live.Last.Fraction);
    }

    [Fact]
    public void The_card_shows_epoch_loss_metric_and_time_and_escapes_the_title()
    {
        var clock = new ManualClock();
        var live = LiveProgress.Start("GRU <64>", clock);
        clock.Advance(TimeSpan.FromSeconds(90));
        live.Report(new ProgressSnapshot(2, 4, 5, 10, 0.123456, 0.875, MetricName: "accuracy"));
        string html = live.ToHtml();
        Assert.Contains("GRU &lt;64&gt;", html);
        Assert.Contains("epoch <span data-kit-epoch=\"2\">2/4</span>", html);
        Assert.Contains("batch 5/10", html);
        Assert.Contains("loss 0.1235", html);
        Assert.Contains("accuracy 0.8750", html);
        Assert.Contains("elapsed 1 min 30 s", html);
        // 90 s for 37.5 % leaves 150 s.
        Assert.Contains("left 2 min 30 s", html);
        Assert.Contains("width:37.5%", html);
        Assert.Contains("<svg class=\"kit-spark\"", html);
    }

    [Fact]
    public async Task In_a_kernel_it_is_one_output_updated_in_place_ending_in_the_final_state()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("live.ipynb", TestNotebook.ReferenceBuiltKit(),
            "var live = Kit.Notebooks.LiveProgress.Start(\"Run\");\n" +
            "for (int e = 1; e <= 3; e++) for (int b = 1; b <= 5; b++) live.Report(new Kit.Notebooks.ProgressSnapshot(e, 3, b, 5, 1.0 / (e * 5 + b), b == 5 ? 0.6 + 0.1 * e : null));\n" +
            "live.Draws");

        var result = await new NotebookRunner().RunAsync(path);

        Assert.True(result.Succeeded, result.FailureMessage);
        var outputs = result.Cells[1].Outputs;
        var card = Assert.Single(outputs, o => o.Kind == CellOutput.Display);
        Assert.Contains("data-kit-epoch=\"3\"", card.Html);
        Assert.Contains("· done", card.Html);
        Assert.Contains("validation 0.9000", card.Html);
        int draws = int.Parse(outputs.Single(o => o.Kind == CellOutput.Result).Text!);
        Assert.InRange(draws, 3, 15);
    }
}
