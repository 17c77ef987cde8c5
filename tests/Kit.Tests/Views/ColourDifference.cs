namespace Kit.Tests.Views;

/// <summary>
/// Colour arithmetic for checking the palette: sRGB to CIELAB, the CIEDE2000 colour difference and simulated
/// colour-vision deficiency. Kept in the tests: the kit only needs the finished palette.
/// </summary>
static class ColourDifference
{
    public readonly record struct Lab(double L, double A, double B)
    {
        /// <summary>Hue angle h_ab in degrees, [0, 360).</summary>
        public double Hue => (Math.Atan2(B, A) * 180 / Math.PI + 360) % 360;
    }

    /// <summary>"#RRGGBB" to linear-light RGB (IEC 61966-2-1 sRGB transfer function).</summary>
    public static double[] Linear(string hex) => new[] { 1, 3, 5 }.Select(i =>
    {
        double c = Convert.ToInt32(hex.Substring(i, 2), 16) / 255.0;
        return c <= 0.04045 ? c / 12.92 : Math.Pow((c + 0.055) / 1.055, 2.4);
    }).ToArray();

    /// <summary>
    /// Linear sRGB to CIELAB under D65: the sRGB primaries' XYZ matrix (IEC 61966-2-1) and the CIE 1976 L*a*b*
    /// formulas (CIE 15:2004), white point Xn = 0.95047, Yn = 1, Zn = 1.08883.
    /// </summary>
    public static Lab ToLab(double[] rgb)
    {
        double r = Math.Clamp(rgb[0], 0, 1), g = Math.Clamp(rgb[1], 0, 1), b = Math.Clamp(rgb[2], 0, 1);
        double x = 0.4124564 * r + 0.3575761 * g + 0.1804375 * b;
        double y = 0.2126729 * r + 0.7151522 * g + 0.0721750 * b;
        double z = 0.0193339 * r + 0.1191920 * g + 0.9503041 * b;
        static double F(double t) => t > 216.0 / 24389 ? Math.Cbrt(t) : (24389.0 / 27 * t + 16) / 116;
        double fx = F(x / 0.95047), fy = F(y), fz = F(z / 1.08883);
        return new Lab(116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz));
    }

    public static Lab ToLab(string hex) => ToLab(Linear(hex));

    /// <summary>
    /// CIEDE2000 with kL = kC = kH = 1, as written out step by step in G. Sharma, W. Wu, E. N. Dalal, "The CIEDE2000
    /// color-difference formula: implementation notes, supplementary test data, and mathematical observations",
    /// Color Research and Application 30(1), 2005, eqs. (1)-(22).
    /// </summary>
    public static double Ciede2000(Lab c1, Lab c2)
    {
        static double Rad(double d) => d * Math.PI / 180;
        double cAb1 = Math.Sqrt(c1.A * c1.A + c1.B * c1.B), cAb2 = Math.Sqrt(c2.A * c2.A + c2.B * c2.B);
        double cBar = (cAb1 + cAb2) / 2, c7 = Math.Pow(cBar, 7);
        double g = 0.5 * (1 - Math.Sqrt(c7 / (c7 + Math.Pow(25, 7))));
        double a1 = (1 + g) * c1.A, a2 = (1 + g) * c2.A;
        double cp1 = Math.Sqrt(a1 * a1 + c1.B * c1.B), cp2 = Math.Sqrt(a2 * a2 + c2.B * c2.B);
        double hp1 = cp1 == 0 ? 0 : (Math.Atan2(c1.B, a1) * 180 / Math.PI + 360) % 360;
        double hp2 = cp2 == 0 ? 0 : (Math.Atan2(c2.B, a2) * 180 / Math.PI + 360) % 360;

        double dL = c2.L - c1.L, dC = cp2 - cp1, dh = 0;
        if (cp1 * cp2 != 0)
        {
            dh = hp2 - hp1;
            if (dh > 180) dh -= 360;
            else if (dh < -180) dh += 360;
        }
        double dH = 2 * Math.Sqrt(cp1 * cp2) * Math.Sin(Rad(dh / 2));

        double lBar = (c1.L + c2.L) / 2, cpBar = (cp1 + cp2) / 2;
        double hBar = cp1 * cp2 == 0 ? hp1 + hp2
            : Math.Abs(hp1 - hp2) <= 180 ? (hp1 + hp2) / 2
            : hp1 + hp2 < 360 ? (hp1 + hp2 + 360) / 2 : (hp1 + hp2 - 360) / 2;
        double t = 1 - 0.17 * Math.Cos(Rad(hBar - 30)) + 0.24 * Math.Cos(Rad(2 * hBar)) + 0.32 * Math.Cos(Rad(3 * hBar + 6))
                   - 0.20 * Math.Cos(Rad(4 * hBar - 63));
        double dTheta = 30 * Math.Exp(-Math.Pow((hBar - 275) / 25, 2));
        double cp7 = Math.Pow(cpBar, 7);
        double rC = 2 * Math.Sqrt(cp7 / (cp7 + Math.Pow(25, 7)));
        double sL = 1 + 0.015 * (lBar - 50) * (lBar - 50) / Math.Sqrt(20 + (lBar - 50) * (lBar - 50));
        double sC = 1 + 0.045 * cpBar, sH = 1 + 0.015 * cpBar * t;
        double rT = -Math.Sin(Rad(2 * dTheta)) * rC;
        return Math.Sqrt(Math.Pow(dL / sL, 2) + Math.Pow(dC / sC, 2) + Math.Pow(dH / sH, 2) + rT * (dC / sC) * (dH / sH));
    }

    /// <summary>
    /// Severity-1.0 simulation matrices on linear RGB from G. M. Machado, M. M. Oliveira, L. A. F. Fernandes,
    /// "A Physiologically-based Model for Simulation of Color Vision Deficiency", IEEE TVCG 15(6), 2009, Table 1
    /// (values from memory; each row sums to 1, so white stays white, which the tests check).
    /// </summary>
    public static readonly IReadOnlyDictionary<string, double[,]> Deficiencies = new Dictionary<string, double[,]>
    {
        ["deuteranopia"] = new[,] { { 0.367322, 0.860646, -0.227968 }, { 0.280085, 0.672501, 0.047413 }, { -0.011820, 0.042940, 0.968881 } },
        ["protanopia"] = new[,] { { 0.152286, 1.052583, -0.204868 }, { 0.114503, 0.786281, 0.099216 }, { -0.003882, -0.048116, 1.051998 } },
        ["tritanopia"] = new[,] { { 1.255528, -0.076749, -0.178779 }, { -0.078411, 0.930809, 0.147602 }, { 0.004733, 0.691367, 0.303900 } },
    };

    /// <summary>How a reader with the named deficiency ("normal" for none) sees the colour, as CIELAB.</summary>
    public static Lab Seen(string hex, string vision)
    {
        var rgb = Linear(hex);
        if (vision == "normal") return ToLab(rgb);
        var m = Deficiencies[vision];
        var seen = new double[3];
        for (int i = 0; i < 3; i++) seen[i] = m[i, 0] * rgb[0] + m[i, 1] * rgb[1] + m[i, 2] * rgb[2];
        return ToLab(seen);
    }

    /// <summary>The smallest CIEDE2000 between any two of the colours as the named reader sees them, and which pair.</summary>
    public static (double Distance, int First, int Second) ClosestPair(IReadOnlyList<string> colours, string vision)
    {
        var seen = colours.Select(c => Seen(c, vision)).ToArray();
        var best = (double.PositiveInfinity, -1, -1);
        for (int i = 0; i < seen.Length; i++)
            for (int j = i + 1; j < seen.Length; j++)
            {
                double d = Ciede2000(seen[i], seen[j]);
                if (d < best.Item1) best = (d, i, j);
            }
        return best;
    }
}
