using System.Text.Json;
using System.Text.Json.Nodes;
using Kit.Common;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>
/// Everything a run needs to continue after its last finished epoch: current and best weights, optimiser moments
/// and step count, schedule and early-stopping state, the history so far, and a fingerprint of the model config,
/// training options and data so a checkpoint is never resumed into a different run. The random state needs no
/// saving: every epoch reseeds the engine and the batch plan from (seed, epoch).
/// </summary>
internal sealed class TrainingCheckpoint : IDisposable
{
    public const string Magic = "KITCHKPT";
    public const string FileName = "resume-state.kit";
    /// <summary>
    /// The name checkpoints had before version 0.2. Still read (never written) for this one release so an
    /// interrupted run started with the old name can be resumed; drop it in the release after.
    /// </summary>
    internal const string FormerFileName = "last.kitckpt";
    const string What = "kit training checkpoint";

    internal required CheckpointState State { get; init; }
    internal required Dictionary<string, Tensor> Weights { get; init; }
    internal Dictionary<string, Tensor>? BestWeights { get; init; }
    internal required Dictionary<string, Tensor> OptimizerState { get; init; }

    public int Epoch => State.Epoch;
    public bool Finished => State.Finished;

    static readonly JsonSerializerOptions Json = new()
    {
        NumberHandling = System.Text.Json.Serialization.JsonNumberHandling.AllowNamedFloatingPointLiterals,
        Converters = { new System.Text.Json.Serialization.JsonStringEnumConverter() },
    };

    /// <summary>Where a run writes its checkpoint inside <paramref name="directory"/>.</summary>
    public static string PathIn(string directory) => System.IO.Path.Combine(directory, FileName);

    /// <summary>
    /// The checkpoint a resume should read: the current name, else the former one (see <see cref="FormerFileName"/>),
    /// else null.
    /// </summary>
    public static string? FindIn(string directory)
    {
        string current = PathIn(directory), former = System.IO.Path.Combine(directory, FormerFileName);
        return File.Exists(current) ? current : File.Exists(former) ? former : null;
    }

    internal byte[] ToBytes()
    {
        var manifest = new JsonObject { ["kind"] = "kit-checkpoint", ["state"] = JsonSerializer.SerializeToNode(State, Json) };
        var sections = new List<(string, byte[])>
        {
            ("weights", TensorArchive.Write(Weights)),
            ("optimizer", TensorArchive.Write(OptimizerState.OrderBy(p => p.Key, StringComparer.Ordinal))),
        };
        if (BestWeights is not null) sections.Add(("best", TensorArchive.Write(BestWeights)));
        return KitContainer.Write(Magic, manifest, sections);
    }

    internal void Save(string path) => AtomicFile.WriteAllBytes(path, ToBytes());

    internal static TrainingCheckpoint Load(string path)
    {
        var (m, sections) = KitContainer.Read(KitContainer.ReadFile(path), path, Magic, What,
            new Dictionary<string, string> { [ModelBundle.Magic] = "kit model bundle" });
        CheckpointState? state;
        try
        {
            state = m["state"].Deserialize<CheckpointState>(Json);
        }
        catch (JsonException e)
        {
            throw new BundleError(path, $"checkpoint state is malformed: {e.Message}", e);
        }
        if (state is null) throw new BundleError(path, "checkpoint has no state");
        foreach (var needed in new[] { "weights", "optimizer" })
            if (!sections.ContainsKey(needed)) throw new BundleError(path, $"checkpoint has no '{needed}' section");
        return new TrainingCheckpoint
        {
            State = state,
            Weights = TensorArchive.Read(sections["weights"], path, "weights"),
            OptimizerState = TensorArchive.Read(sections["optimizer"], path, "optimizer"),
            BestWeights = sections.TryGetValue("best", out var best) ? TensorArchive.Read(best, path, "best") : null,
        };
    }

    public void Dispose()
    {
        foreach (var t in Weights.Values) t.Dispose();
        foreach (var t in OptimizerState.Values) t.Dispose();
        if (BestWeights is not null) foreach (var t in BestWeights.Values) t.Dispose();
    }
}

/// <summary>The plain-number part of a checkpoint.</summary>
internal sealed record CheckpointState(
    string Fingerprint,
    int Epoch,
    long GlobalStep,
    long OptimizerSteps,
    ScheduleState Schedule,
    double BestScore,
    int BestEpoch,
    int EpochsWithoutImprovement,
    bool Finished,
    StopKind Stop,
    string? StopReason,
    List<EpochRecord> History);
