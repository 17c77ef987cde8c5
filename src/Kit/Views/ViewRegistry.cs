using System.Diagnostics.CodeAnalysis;

namespace Kit.Views;

/// <summary>
/// Which view draws which result record. Records stay plain (they know nothing about HTML); whoever writes a view
/// registers it here once, and every front end (notebook formatters, CLI report) asks the registry, so a record
/// looks the same everywhere. A later registration for the same type replaces the earlier one, which lets a
/// notebook user restyle a record without touching the kit.
/// </summary>
public static class ViewRegistry
{
    static readonly object Gate = new();
    static readonly Dictionary<Type, Func<object, IView>> Views = new();

    // The kit's own views are there before anyone asks (see RecordViews).
    static ViewRegistry() => RecordViews.RegisterAll();

    /// <summary>Raised after a type is registered, so a front end that is already running can pick it up.</summary>
    public static event Action<Type>? Registered;

    public static void Register<T>(Func<T, IView> view) where T : notnull
    {
        ArgumentNullException.ThrowIfNull(view);
        lock (Gate) Views[typeof(T)] = o => view((T)o);
        Registered?.Invoke(typeof(T));
    }

    public static IReadOnlyList<Type> Types
    {
        get { lock (Gate) return Views.Keys.ToList(); }
    }

    /// <summary>The view for <paramref name="value"/>: its own type first, then base classes, then interfaces.</summary>
    public static bool TryGetView(object? value, [NotNullWhen(true)] out IView? view)
    {
        view = null;
        if (value is null) return false;
        Func<object, IView>? make = null;
        lock (Gate)
        {
            for (Type? t = value.GetType(); t is not null && make is null; t = t.BaseType)
                Views.TryGetValue(t, out make);
            if (make is null)
                foreach (var i in value.GetType().GetInterfaces())
                    if (Views.TryGetValue(i, out make)) break;
        }
        if (make is null) return false;
        view = make(value);
        return true;
    }
}
