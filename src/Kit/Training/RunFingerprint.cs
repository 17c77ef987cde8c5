using System.Runtime.InteropServices;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using Kit.Data;
using Kit.Models;

namespace Kit.Training;

/// <summary>
/// SHA-256 over what decides a run's numbers: model config, training options (less the ones that only change
/// speed or bookkeeping) and the encoded train and validation sets. A checkpoint from another run is refused.
/// Threads are left out: results can differ in the last bits across thread counts (see Trainer), which a resumed
/// run on a different machine should be allowed to accept.
/// </summary>
internal static class RunFingerprint
{
    public static string Of(ClassifierConfig config, TrainingOptions options, EncodedSet train, EncodedSet? validation)
    {
        using var hash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        hash.AppendData(Encoding.UTF8.GetBytes(config.ToJson()));
        var relevant = options with { Threads = 0, ProgressEvery = 1, CheckpointDirectory = null, Resume = false };
        hash.AppendData(Encoding.UTF8.GetBytes(JsonSerializer.Serialize(relevant)));
        Append(hash, train);
        if (validation is not null) Append(hash, validation);
        return Convert.ToHexStringLower(hash.GetHashAndReset());
    }

    static void Append(IncrementalHash hash, EncodedSet set)
    {
        hash.AppendData(MemoryMarshal.AsBytes(set.Tokens.AsSpan()));
        hash.AppendData(MemoryMarshal.AsBytes(set.Offsets.AsSpan()));
        hash.AppendData(MemoryMarshal.AsBytes(set.Labels.AsSpan()));
    }
}
