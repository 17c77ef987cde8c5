using System.Collections.Concurrent;
using System.Reflection;
using System.Runtime.Loader;
using Microsoft.DotNet.Interactive;
using Microsoft.DotNet.Interactive.Events;

namespace Kit.Tools.Notebooks;

/// <summary>
/// The embedded kernel's counterpart of what the notebook tool does after <c>#r "nuget: ..."</c>: look in each
/// newly added package for interactive-extensions/dotnet, run the IKernelExtension types of its assemblies and
/// its extension.dib. The library packages leave this to the host, so a headless run has to do it itself.
/// </summary>
internal static class PackageExtensionLoader
{
    public static void Attach(CompositeKernel kernel)
    {
        var pending = new ConcurrentQueue<ResolvedPackageReference>();
        var seen = new ConcurrentDictionary<string, bool>(StringComparer.Ordinal);
        kernel.RegisterForDisposal(kernel.KernelEvents.Subscribe(new Observer(e =>
        {
            if (e is PackageAdded { PackageReference.PackageRoot: { Length: > 0 } root } added && seen.TryAdd(root, true))
                pending.Enqueue(added.PackageReference);
        })));

        // After the command that restored the package, still inside it, so what the extension displays lands in
        // that cell's outputs and a failing extension fails that cell.
        // A package whose event arrived only after its cell finished is loaded before the next cell runs, so what
        // the extension defers to the next submission (its namespace imports) is always in place for that cell.
        kernel.AddMiddleware(async (command, context, next) =>
        {
            await LoadPending();
            await next(command, context);
            await LoadPending();

            async Task LoadPending()
            {
                while (pending.TryDequeue(out var package))
                {
                    var dir = new DirectoryInfo(Path.Combine(package.PackageRoot, "interactive-extensions", "dotnet"));
                    if (dir.Exists) await LoadAsync(dir, kernel, context);
                }
            }
        });
    }

    static async Task LoadAsync(DirectoryInfo dir, CompositeKernel kernel, KernelInvocationContext context)
    {
        foreach (var file in dir.GetFiles("*.dll", SearchOption.TopDirectoryOnly).OrderBy(f => f.Name, StringComparer.Ordinal))
        {
            var assembly = LoadOnce(file.FullName);
            foreach (var type in assembly.GetExportedTypes().Where(t => t is { IsAbstract: false, IsInterface: false, IsGenericTypeDefinition: false } && typeof(IKernelExtension).IsAssignableFrom(t)))
            {
                try
                {
                    var extension = (IKernelExtension)Activator.CreateInstance(type)!;
                    await extension.OnLoadAsync(kernel);
                    context.Publish(new KernelExtensionLoaded(extension, context.Command));
                }
                catch (Exception e)
                {
                    context.Fail(context.Command, e, $"The kernel extension {type.FullName} from {file.FullName} failed to load: {e.Message}");
                }
            }
        }
        var script = new FileInfo(Path.Combine(dir.FullName, "extension.dib"));
        if (script.Exists) await kernel.LoadAndRunInteractiveDocument(script, context.Command);
    }

    /// <summary>
    /// An assembly already in the process under the same name is used as is: the host (a test, or a notebook that
    /// referenced the built kit) may have loaded Kit.Notebooks already, and loading a second copy would give the
    /// notebook a second set of formatter and view types.
    /// </summary>
    static Assembly LoadOnce(string path)
    {
        var name = AssemblyName.GetAssemblyName(path);
        var loaded = AssemblyLoadContext.Default.Assemblies.FirstOrDefault(a => AssemblyName.ReferenceMatchesDefinition(name, a.GetName()));
        return loaded ?? AssemblyLoadContext.Default.LoadFromAssemblyPath(path);
    }

    sealed class Observer(Action<KernelEvent> onNext) : IObserver<KernelEvent>
    {
        public void OnNext(KernelEvent value) => onNext(value);
        public void OnError(Exception error) { }
        public void OnCompleted() { }
    }
}
