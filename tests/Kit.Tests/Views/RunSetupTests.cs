using Kit.Training;
using Kit.Views;

namespace Kit.Tests.Views;

public class RunSetupTests
{
    [Fact]
    public void The_setup_names_the_optimiser_that_ran()
    {
        Assert.Equal("Adam lr 0.003", RunReport.Optimiser(new TrainingOptions()));
        Assert.Equal("AdamW lr 0.001, weight decay 0.01",
            RunReport.Optimiser(new TrainingOptions { Optimizer = OptimizerKind.AdamW, LearningRate = 1e-3, WeightDecay = 0.01 }));
        string sgd = RunReport.Optimiser(new TrainingOptions { Optimizer = OptimizerKind.Sgd, LearningRate = 0.1, Momentum = 0.5 });
        Assert.Equal("SGD (momentum 0.5) lr 0.1", sgd);
        Assert.DoesNotContain("Adam", sgd);
    }
}
