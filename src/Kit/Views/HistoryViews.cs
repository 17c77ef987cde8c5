using System.Text.Json.Nodes;
using Kit.Training;

namespace Kit.Views;

/// <summary>Training curves: loss on the left axis, accuracy on the right, best epoch marked.</summary>
public static class HistoryViews
{
    public static ChartView Curves(TrainingHistory history, string? title = null)
    {
        var epochs = history.Epochs.Select(e => (JsonNode)e.Epoch).ToArray();
        JsonArray Series(Func<EpochRecord, double> f) => new(history.Epochs.Select(e => (JsonNode?)(double.IsFinite(f(e)) ? f(e) : null)).ToArray());
        var traces = new JsonArray
        {
            Line("train loss", epochs, Series(e => e.TrainLoss), 0, "y", dash: "solid"),
            Line("validation loss", epochs, Series(e => e.ValidationLoss), 0, "y", dash: "dot"),
            Line("train accuracy", epochs, Series(e => e.TrainAccuracy), 1, "y2", dash: "solid"),
            Line("validation accuracy", epochs, Series(e => e.ValidationAccuracy), 1, "y2", dash: "dot"),
        };
        var layout = Theme.Layout(title ?? $"Training curves — best validation accuracy at epoch {history.BestEpoch}", "epoch", "cross-entropy loss (nats)", height: 420);
        var y2 = Theme.Axis("accuracy (fraction correct)");
        y2["overlaying"] = "y";
        y2["side"] = "right";
        AxisTicks.For(0, 1, RateFormat.Fraction).ApplyTo(y2);
        y2["showgrid"] = false;
        layout["yaxis2"] = y2;
        layout["xaxis"]!["dtick"] = 1;
        // The right-hand accuracy axis takes the space a side legend would use, so this legend sits underneath.
        layout["legend"] = new JsonObject { ["orientation"] = "h", ["x"] = 0.0, ["xanchor"] = "left", ["y"] = -0.28, ["yanchor"] = "top" };
        layout["margin"]!["b"] = 96;
        layout["margin"]!["r"] = 72;   // room for the right-hand axis title
        layout["shapes"] = new JsonArray(new JsonObject
        {
            ["type"] = "line", ["xref"] = "x", ["yref"] = "paper", ["x0"] = history.BestEpoch, ["x1"] = history.BestEpoch,
            ["y0"] = 0, ["y1"] = 1, ["line"] = new JsonObject { ["color"] = Theme.Muted, ["dash"] = "dash", ["width"] = 1 },
        });
        return new ChartView("Training history", traces, layout)
        {
            Caption = "Solid: training split; dotted: validation split. The dashed line marks the epoch whose weights were kept.",
        };
    }

    static JsonObject Line(string name, JsonNode[] x, JsonArray y, int colour, string axis, string dash) => new()
    {
        ["type"] = "scatter", ["mode"] = "lines+markers", ["name"] = name,
        ["x"] = new JsonArray(x.Select(v => v.DeepClone()).ToArray()), ["y"] = y, ["yaxis"] = axis,
        ["line"] = new JsonObject { ["color"] = Theme.Colour(colour), ["dash"] = dash, ["width"] = 2 },
        ["marker"] = new JsonObject { ["size"] = 5 },
    };
}
