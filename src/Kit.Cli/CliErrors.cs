using System.CommandLine;
using Kit.Data;
using Kit.Native;

namespace Kit.Cli;

/// <summary>
/// Turns the kit's own errors (data, settings, model bundle, engine) into a one-line message on stderr and an exit
/// code: 2 for bad input of any kind (a bad file, a bad option value, an unknown option), 3 when the engine cannot
/// load, 130 when cancelled.
/// </summary>
internal static class CliErrors
{
    public const int BadInput = 2;

    public static int Guard(Func<int> action, TextWriter? errors = null)
    {
        errors ??= Console.Error;
        try
        {
            return action();
        }
        catch (DataError e)
        {
            errors.WriteLine(e.Message);
            return BadInput;
        }
        catch (Kit.Training.BundleError e)
        {
            errors.WriteLine(e.Message);
            return BadInput;
        }
        catch (ArgumentException e)
        {
            // Settings the parser cannot check (a value out of range, fractions that do not add up) are bad input too.
            errors.WriteLine(e.Message);
            return BadInput;
        }
        catch (Kit.Scoring.ScoringModelError e)
        {
            Console.Error.WriteLine(e.Message);
            return 2;
        }
        catch (EngineLoadException e)
        {
            errors.WriteLine($"engine: {e.Message}");
            return 3;
        }
        catch (OperationCanceledException)
        {
            errors.WriteLine("cancelled");
            return 130;
        }
    }

    /// <summary>Parses and runs <paramref name="args"/>; a parse error (unknown option, missing argument, bad choice) exits with 2.</summary>
    public static int Invoke(RootCommand root, string[] args, InvocationConfiguration? configuration = null)
    {
        var parse = root.Parse(args);
        if (parse.Errors.Count > 0)
        {
            var errors = configuration?.Error ?? Console.Error;
            foreach (var error in parse.Errors) errors.WriteLine(error.Message);
            errors.WriteLine("run with --help for the options");
            return BadInput;
        }
        return configuration is null ? parse.Invoke() : parse.Invoke(configuration);
    }
}
