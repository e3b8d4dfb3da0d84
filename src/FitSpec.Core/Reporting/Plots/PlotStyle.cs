using System.Globalization;
using OxyPlot;
using OxyPlot.Axes;
using OxyPlot.Legends;

namespace FitSpec.Reporting.Plots;

/// <summary>The look every report plot shares: fonts, colours, axes, legend.</summary>
internal static class PlotStyle
{
    public static readonly OxyColor Ink = OxyColor.FromRgb(0x1d, 0x23, 0x2b);
    public static readonly OxyColor Grid = OxyColor.FromRgb(0xe3, 0xe7, 0xeb);
    public static readonly OxyColor Points = OxyColor.FromRgb(0x2d, 0x5b, 0x9a);
    public static readonly OxyColor Highlight = OxyColor.FromRgb(0xa1, 0x2a, 0x2a);
    public static readonly OxyColor Curve = OxyColor.FromRgb(0xc0, 0x5a, 0x00);
    public static readonly OxyColor Reference = OxyColor.FromRgb(0x5b, 0x65, 0x70);
    public static readonly OxyColor Bars = OxyColor.FromRgb(0xb9, 0xcb, 0xe3);

    /// <summary>Guide lines take these in turn, so two guides on one plot can be told apart.</summary>
    public static readonly OxyColor[] GuideColors =
    [
        OxyColor.FromRgb(0x8a, 0x5a, 0x00),
        OxyColor.FromRgb(0x1f, 0x6f, 0x43),
        OxyColor.FromRgb(0x6a, 0x3d, 0x9a),
        OxyColor.FromRgb(0xa1, 0x2a, 0x2a),
    ];

    public static PlotModel Model()
    {
        var model = new PlotModel
        {
            Culture = CultureInfo.InvariantCulture,
            DefaultFont = SvgExport.Font,
            DefaultFontSize = 12,
            Background = OxyColors.White,
            TextColor = Ink,
            PlotAreaBorderColor = Reference,
            PlotAreaBorderThickness = new OxyThickness(1),
            Padding = new OxyThickness(8, 12, 16, 8),
            IsLegendVisible = true,
        };
        model.Legends.Add(new Legend
        {
            // Below the frame, so the legend never hides points.
            LegendPosition = LegendPosition.BottomCenter,
            LegendPlacement = LegendPlacement.Outside,
            LegendOrientation = LegendOrientation.Horizontal,
            LegendFontSize = 11,
        });
        return model;
    }

    public static LinearAxis Axis(AxisPosition position, string title, string? key = null) => new()
    {
        Position = position,
        Title = PlotText.Label(title),
        Key = key,
        MajorGridlineStyle = LineStyle.Solid,
        MajorGridlineColor = Grid,
        MinorGridlineStyle = LineStyle.None,
        MinorTickSize = 0,
        TicklineColor = Reference,
        AxislineColor = Reference,
        TitleFontSize = 12,
        AxisTitleDistance = 10,
        FontSize = 11,
        MaximumPadding = 0.04,
        MinimumPadding = 0.04,
        IsZoomEnabled = false,
        IsPanEnabled = false,
    };
}
