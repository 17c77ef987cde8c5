using Kit.Data;
using Kit.Native;

namespace Kit.Cli;

/// <summary>Turns the kit's own errors (data, model bundle, engine) into a one-line message on stderr and an exit code (2 = bad input).</summary>
internal static class CliErrors
{
    public static int Guard(Func<int> action)
    {
        try
        {
            return action();
        }
        catch (DataError e)
        {
            Console.Error.WriteLine(e.Message);
            return 2;
        }
        catch (Kit.Training.BundleError e)
        {
            Console.Error.WriteLine(e.Message);
            return 2;
        }
        catch (Kit.Scoring.ScoringModelError e)
        {
            Console.Error.WriteLine(e.Message);
            return 2;
        }
        catch (EngineLoadException e)
        {
            Console.Error.WriteLine($"engine: {e.Message}");
            return 3;
        }
        catch (OperationCanceledException)
        {
            Console.Error.WriteLine("cancelled");
            return 130;
        }
    }
}
