namespace Kit.Export;

/// <summary>Picture formats a chart can be exported to through the browser (HTML needs none).</summary>
public enum ChartImageFormat { Svg, Png }
