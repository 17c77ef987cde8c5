using System.CommandLine;
using Kit.Data;
using Kit.Experiments;

namespace Kit.Cli;

/// <summary>
/// The command-line face of <see cref="RunSettings"/>: one flag per setting (the setting's key), with the setting's
/// help text and default, plus the column flags every data command shares. <c>train</c>, <c>compare</c> and
/// <c>inspect</c> add the same flags from here, so their names, defaults and help text cannot drift apart.
/// </summary>
internal sealed class RunOptions
{
    readonly List<(RunSetting Setting, Option Option)> _settings = new();

    public Option<string> Text { get; } = new("--text") { Description = "Column holding the text", DefaultValueFactory = _ => "text" };
    public Option<string> Label { get; } = new("--label") { Description = "Column holding the class label", DefaultValueFactory = _ => "label" };
    public Option<string?> Group { get; } = new("--group") { Description = "Column of group keys: rows sharing a value stay in one part of the split" };
    public Option<string?> SplitColumn { get; } = new("--split-column") { Description = "Column that already assigns rows to train / validation / test (used instead of a seeded split)" };

    /// <summary>Adds the column flags and the flags of every setting <paramref name="include"/> accepts to <paramref name="command"/>.</summary>
    public static RunOptions AddTo(Command command, Func<RunSetting, bool>? include = null)
    {
        var set = new RunOptions();
        command.Options.Add(set.Text);
        command.Options.Add(set.Label);
        command.Options.Add(set.Group);
        command.Options.Add(set.SplitColumn);
        foreach (var setting in RunSettings.All.Where(include ?? (_ => true)))
        {
            string help = $"{setting.Help} [{setting.Accepts}; default {setting.Default}]";
            Option option = setting.IsSwitch
                ? new Option<bool>("--" + setting.Key) { Description = help }
                : new Option<string?>("--" + setting.Key) { Description = help };
            command.Options.Add(option);
            set._settings.Add((setting, option));
        }
        return set;
    }

    public ColumnSpec Columns(ParseResult parse) =>
        new(parse.GetValue(Text)!, parse.GetValue(Label)!, parse.GetValue(Group), parse.GetValue(SplitColumn));

    /// <summary>
    /// <paramref name="start"/> with every setting given on the command line written into it; an
    /// <see cref="ArgumentException"/> naming the flag for a bad value. A group column turns on the group-aware split.
    /// </summary>
    public RunSpec Read(ParseResult parse, RunSpec start)
    {
        var spec = start with { Columns = Columns(parse), GroupAware = parse.GetValue(Group) is not null };
        foreach (var (setting, option) in _settings)
        {
            if (parse.GetResult(option) is null) continue;
            string value = option switch
            {
                Option<bool> flag => parse.GetValue(flag) ? "true" : "false",
                Option<string?> text => parse.GetValue(text) ?? "",
                _ => throw new InvalidOperationException(option.Name),
            };
            try
            {
                spec = setting.Apply(spec, value);
            }
            catch (ArgumentException)
            {
                throw new ArgumentException($"--{setting.Key} {value}: expected {setting.Accepts}");
            }
        }
        return spec;
    }
}
