using System.Globalization;
using System.Text.Json;

namespace Kit.Data;

/// <summary>
/// JSON Lines: one JSON object per line (LF or CRLF). The text field must be a JSON string; label, group and
/// split may also be numbers or booleans (taken as their JSON text). A blank line inside the file is a problem
/// like any malformed row; a final line break is not.
/// </summary>
internal static class JsonLinesReader
{
    public static LabelledTable Read(string source, string text, ColumnSpec spec, RowPolicy policy)
    {
        var rows = new RowCollector(source, spec, policy);
        int pos = 0, line = 0;
        while (pos < text.Length)
        {
            line++;
            int end = text.IndexOf('\n', pos);
            int next = end < 0 ? text.Length : end + 1;
            if (end < 0) end = text.Length;
            if (end > pos && text[end - 1] == '\r') end--;
            var content = text.AsSpan(pos, end - pos);
            pos = next;
            if (content.IsWhiteSpace())
            {
                if (pos >= text.Length && line > 1) break;
                rows.Problem(line, null, "blank line", "blank line (every line must hold one JSON object)");
                continue;
            }
            ReadLine(rows, spec, line, content.ToString());
        }
        return rows.Build(1);
    }

    static void ReadLine(RowCollector rows, ColumnSpec spec, int line, string content)
    {
        JsonDocument doc;
        try
        {
            doc = JsonDocument.Parse(content);
        }
        catch (JsonException e)
        {
            rows.Problem(line, e.BytePositionInLine is long b ? (int)b + 1 : null, "invalid JSON", $"invalid JSON: {FirstSentence(e.Message)}");
            return;
        }
        using (doc)
        {
            var root = doc.RootElement;
            if (root.ValueKind != JsonValueKind.Object)
            {
                rows.Problem(line, 1, "invalid JSON", $"expected a JSON object, found {root.ValueKind.ToString().ToLowerInvariant()}");
                return;
            }
            if (!root.TryGetProperty(spec.Text, out var textValue) || textValue.ValueKind == JsonValueKind.Null)
            {
                rows.Problem(line, null, "missing field", $"missing field '{spec.Text}'");
                return;
            }
            if (textValue.ValueKind != JsonValueKind.String)
            {
                rows.Problem(line, null, "wrong type", $"field '{spec.Text}' is a {textValue.ValueKind.ToString().ToLowerInvariant()}, expected a string");
                return;
            }
            if (!TryString(rows, line, spec.Text, textValue, out var textString)) return;
            if (!Scalar(rows, line, spec.Label, root, "missing label", out var label)) return;
            string? group = null, split = null;
            if (spec.Group is not null && !Scalar(rows, line, spec.Group, root, "missing group", out group)) return;
            if (spec.Split is not null && !Scalar(rows, line, spec.Split, root, "missing field", out split)) return;
            rows.Add(line, textString, label, group, split);
        }
    }

    static bool Scalar(RowCollector rows, int line, string name, JsonElement root, string missingReason, out string value)
    {
        value = "";
        if (!root.TryGetProperty(name, out var v) || v.ValueKind == JsonValueKind.Null)
        {
            rows.Problem(line, null, missingReason, missingReason == "missing field" ? $"missing field '{name}'" : $"{missingReason}: no field '{name}'");
            return false;
        }
        switch (v.ValueKind)
        {
            case JsonValueKind.String: return TryString(rows, line, name, v, out value);
            case JsonValueKind.Number: value = v.GetRawText(); return true;
            case JsonValueKind.True:
            case JsonValueKind.False: value = v.GetBoolean().ToString(CultureInfo.InvariantCulture).ToLowerInvariant(); return true;
            default:
                rows.Problem(line, null, "wrong type", $"field '{name}' is a {v.ValueKind.ToString().ToLowerInvariant()}, expected a string or number");
                return false;
        }
    }

    /// <summary>A JSON string can escape a lone surrogate (e.g. \ud800), which is not text; report it as such.</summary>
    static bool TryString(RowCollector rows, int line, string name, JsonElement v, out string value)
    {
        try
        {
            value = v.GetString()!;
            return true;
        }
        catch (InvalidOperationException)
        {
            value = "";
            rows.Problem(line, null, "invalid JSON", $"field '{name}' holds an escaped lone surrogate, which is not valid Unicode text");
            return false;
        }
    }

    static string FirstSentence(string message)
    {
        int cut = message.IndexOf(" Path:", StringComparison.Ordinal);
        return (cut > 0 ? message[..cut] : message).TrimEnd('.', ' ');
    }
}
