//! Drawing the charts with `plotters`: one drawing routine per chart, on its SVG backend (text
//! kept as text) or its bitmap backend (encoded as PNG), text laid out with an embedded font.

use std::sync::OnceLock;

use ab_glyph::Font;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::FontStyle;

use crate::ExportError;
use crate::chart::{
    BUFFER, CURRENT, Chart, DoseChart, EQUIVALENCE, LineChart, PH_LINE, Rgb, SPECIES, SpeciesChart,
    TARGET, TitrationChart,
};

/// The font family every chart's text is set in: `sans-serif`, so an SVG shows the viewer's
/// own sans-serif face and a PNG the embedded one.
const FAMILY: &str = "sans-serif";

/// The embedded face for PNG text and for laying out SVG text (the window's Ubuntu Light).
const FONT_BYTES: &[u8] = epaint_default_fonts::UBUNTU_LIGHT;

/// The smallest and largest side of a picture, pixels.
pub const SIDE_PX: std::ops::RangeInclusive<u32> = 64..=8000;

/// The size of a picture in pixels (SVG user units).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Size {
    /// Width, px.
    pub width: u32,
    /// Height, px.
    pub height: u32,
}

impl Size {
    /// The size charts are exported at unless the caller says otherwise.
    pub const DEFAULT: Size = Size {
        width: 900,
        height: 540,
    };

    fn check(self) -> Result<(), ExportError> {
        if SIDE_PX.contains(&self.width) && SIDE_PX.contains(&self.height) {
            Ok(())
        } else {
            Err(ExportError::Size {
                width: self.width,
                height: self.height,
            })
        }
    }
}

/// Registers the embedded face once for `plotters`' text layout.
fn font_ready() -> Result<(), ExportError> {
    static READY: OnceLock<bool> = OnceLock::new();
    let ok = *READY.get_or_init(|| {
        plotters::style::register_font(FAMILY, FontStyle::Normal, FONT_BYTES).is_ok()
    });
    if ok {
        Ok(())
    } else {
        Err(ExportError::Draw(
            "the embedded chart font could not be read".into(),
        ))
    }
}

/// Text the embedded face can show: characters it lacks (some sub- and superscripts) are put
/// in their ASCII forms.
fn for_bitmap(text: &str) -> String {
    static FACE: OnceLock<Option<ab_glyph::FontRef<'static>>> = OnceLock::new();
    let Some(face) = FACE.get_or_init(|| ab_glyph::FontRef::try_from_slice(FONT_BYTES).ok()) else {
        return saltwise_chem::text::ascii(text);
    };
    text.chars()
        .map(|c| {
            if c.is_ascii() || face.glyph_id(c).0 != 0 {
                c.to_string()
            } else {
                saltwise_chem::text::ascii(&c.to_string())
            }
        })
        .collect()
}

/// The chart as an SVG document.
pub fn svg(chart: Chart<'_>, size: Size) -> Result<String, ExportError> {
    size.check()?;
    font_ready()?;
    let mut out = String::new();
    {
        let root = SVGBackend::with_string(&mut out, (size.width, size.height)).into_drawing_area();
        draw(&root, chart, &|t: &str| t.to_owned())?;
        root.present().map_err(draw_error)?;
    }
    Ok(out)
}

/// The chart as a PNG image (8-bit RGB).
pub fn png(chart: Chart<'_>, size: Size) -> Result<Vec<u8>, ExportError> {
    size.check()?;
    font_ready()?;
    let (w, h) = (size.width, size.height);
    let mut pixels = vec![255_u8; w as usize * h as usize * 3];
    {
        let root = BitMapBackend::with_buffer(&mut pixels, (w, h)).into_drawing_area();
        draw(&root, chart, &for_bitmap)?;
        root.present().map_err(draw_error)?;
    }
    let mut out = Vec::new();
    {
        let mut encoder = png::Encoder::new(&mut out, w, h);
        encoder.set_color(png::ColorType::Rgb);
        encoder.set_depth(png::BitDepth::Eight);
        let mut writer = encoder
            .write_header()
            .map_err(|e| ExportError::Png(e.to_string()))?;
        writer
            .write_image_data(&pixels)
            .map_err(|e| ExportError::Png(e.to_string()))?;
        writer
            .finish()
            .map_err(|e| ExportError::Png(e.to_string()))?;
    }
    Ok(out)
}

/// A tick label: at most four significant figures, no trailing zeros (`2000`, `0.5`, `12`).
fn tick(v: &f64) -> String {
    crate::sheet::plain(*v, 4)
}

fn draw_error(e: impl std::fmt::Display) -> ExportError {
    ExportError::Draw(e.to_string())
}

fn color(c: Rgb) -> RGBColor {
    RGBColor(c.0, c.1, c.2)
}

type Label<'t> = &'t dyn Fn(&str) -> String;

fn draw<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    chart: Chart<'_>,
    text: Label<'_>,
) -> Result<(), ExportError> {
    root.fill(&WHITE).map_err(draw_error)?;
    match chart {
        Chart::Dose(c) => dose(root, c, text),
        Chart::BufferCapacity(c) => buffer(root, c, text),
        Chart::Species(c) => species(root, c, text),
        Chart::Titration(c) => titration(root, c, text),
        Chart::Lines(c) => lines(root, c, text),
    }
}

/// A range around `lo..hi` with a margin, never empty.
fn padded(lo: f64, hi: f64, margin: f64) -> (f64, f64) {
    if !(lo.is_finite() && hi.is_finite()) {
        return (0.0, 1.0);
    }
    let span = (hi - lo).max(1e-9);
    (lo - margin * span, hi + margin * span)
}

fn finite_range(values: impl Iterator<Item = f64>) -> Option<(f64, f64)> {
    values
        .filter(|v| v.is_finite())
        .fold(None, |acc, v| match acc {
            None => Some((v, v)),
            Some((lo, hi)) => Some((lo.min(v), hi.max(v))),
        })
}

fn empty(what: &'static str) -> ExportError {
    ExportError::EmptyChart { chart: what }
}

/// Font sizes, px: caption, axis description, tick labels, legend.
const CAPTION: u32 = 19;
const AXIS: u32 = 15;
const TICKS: u32 = 13;
const LEGEND: u32 = 13;

fn dose<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &DoseChart,
    text: Label<'_>,
) -> Result<(), ExportError> {
    let (x_lo, x_hi) =
        finite_range(c.points.iter().map(|p| p.dose_g)).ok_or(empty("dose curve"))?;
    let mut y_values: Vec<f64> = c.points.iter().map(|p| p.ph).collect();
    if let Some(t) = c.target {
        y_values.extend([t.ph - t.tolerance, t.ph + t.tolerance]);
    }
    if let Some((lo, hi)) = c.band {
        y_values.extend([lo, hi]);
    }
    let (y_lo, y_hi) = finite_range(y_values.into_iter()).ok_or(empty("dose curve"))?;
    let (y_lo, y_hi) = padded(y_lo, y_hi, 0.06);
    let x_hi = if x_hi > x_lo { x_hi } else { x_lo + 1.0 };
    let mut ch = ChartBuilder::on(root)
        .margin(14)
        .margin_right(30)
        .caption(
            text(&format!("pH against the dose of {}", c.adjuster_name)),
            (FAMILY, CAPTION),
        )
        .x_label_area_size(46)
        .y_label_area_size(54)
        .build_cartesian_2d(x_lo.min(0.0)..x_hi, y_lo..y_hi)
        .map_err(draw_error)?;
    ch.configure_mesh()
        .x_desc(text(&format!("Dose of {}, g", c.adjuster_name)))
        .y_desc("pH")
        .axis_desc_style((FAMILY, AXIS))
        .label_style((FAMILY, TICKS))
        .x_label_formatter(&tick)
        .y_label_formatter(&tick)
        .light_line_style(TRANSPARENT)
        .bold_line_style(RGBColor(225, 225, 225))
        .draw()
        .map_err(draw_error)?;
    if let Some(t) = c.target {
        let (lo, hi) = (t.ph - t.tolerance, t.ph + t.tolerance);
        let fill = color(TARGET).mix(0.22).filled();
        let edge = color(TARGET).stroke_width(1);
        ch.draw_series(std::iter::once(Rectangle::new(
            [(x_lo.min(0.0), lo), (x_hi, hi)],
            fill,
        )))
        .map_err(draw_error)?
        .label(text(&format!(
            "Target band, pH {:.2} ± {:.2}",
            t.ph, t.tolerance
        )))
        .legend(move |(x, y)| Rectangle::new([(x, y - 5), (x + 20, y + 5)], fill));
        for y in [lo, hi] {
            ch.draw_series(LineSeries::new([(x_lo.min(0.0), y), (x_hi, y)], edge))
                .map_err(draw_error)?;
        }
    }
    let ph = color(PH_LINE).stroke_width(2);
    ch.draw_series(LineSeries::new(
        c.points.iter().map(|p| (p.dose_g, p.ph)),
        ph,
    ))
    .map_err(draw_error)?
    .label("pH")
    .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], ph));
    if let Some((lo, hi)) = c.band {
        let style = color(CURRENT).mix(0.6).stroke_width(6);
        ch.draw_series(LineSeries::new([(0.0, lo), (0.0, hi)], style))
            .map_err(draw_error)?
            .label(text(&format!(
                "pH band under the tolerances, {lo:.2} to {hi:.2}"
            )))
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], style));
    }
    if let Some(first) = c.points.first() {
        let style = color(CURRENT).filled();
        ch.draw_series(std::iter::once(
            EmptyElement::at((first.dose_g, first.ph))
                + Polygon::new(vec![(0, -7), (7, 0), (0, 7), (-7, 0)], style),
        ))
        .map_err(draw_error)?
        .label("Current recipe")
        .legend(move |(x, y)| {
            EmptyElement::at((x + 10, y))
                + Polygon::new(vec![(0, -6), (6, 0), (0, 6), (-6, 0)], style)
        });
    }
    if !c.equivalence.is_empty() {
        let style = color(EQUIVALENCE).stroke_width(2);
        ch.draw_series(
            c.equivalence
                .iter()
                .map(|e| Circle::new((e.dose_g, e.ph), 5, style)),
        )
        .map_err(draw_error)?
        .label("Equivalence point")
        .legend(move |(x, y)| Circle::new((x + 10, y), 5, style));
    }
    if let Some(d) = c.dose_to_target_g {
        let style = color(TARGET).stroke_width(2);
        ch.draw_series(LineSeries::new([(d, y_lo), (d, y_hi)], style))
            .map_err(draw_error)?
            .label(text(&format!(
                "Dose to target, {} g",
                crate::sheet::plain(d, 4)
            )))
            .legend(move |(x, y)| PathElement::new(vec![(x + 10, y - 6), (x + 10, y + 6)], style));
    }
    // The legend goes in the bottom corner the curve leaves empty, as in the window.
    let rising = c.points.last().map(|p| p.ph) > c.points.first().map(|p| p.ph);
    legend(
        &mut ch,
        if rising {
            SeriesLabelPosition::LowerRight
        } else {
            SeriesLabelPosition::LowerLeft
        },
    )
}

fn legend<'a, DB: DrawingBackend + 'a, X: Ranged, Y: Ranged>(
    ch: &mut ChartContext<'a, DB, Cartesian2d<X, Y>>,
    at: SeriesLabelPosition,
) -> Result<(), ExportError> {
    ch.configure_series_labels()
        .position(at)
        .margin(10)
        .label_font((FAMILY, LEGEND))
        .background_style(WHITE.mix(0.9))
        .border_style(RGBColor(190, 190, 190))
        .draw()
        .map_err(draw_error)
}

fn buffer<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &DoseChart,
    text: Label<'_>,
) -> Result<(), ExportError> {
    let (x_lo, x_hi) =
        finite_range(c.points.iter().map(|p| p.dose_g)).ok_or(empty("buffer capacity"))?;
    let (_, b_hi) =
        finite_range(c.points.iter().map(|p| p.buffer_capacity)).ok_or(empty("buffer capacity"))?;
    let x_hi = if x_hi > x_lo { x_hi } else { x_lo + 1.0 };
    let y_hi = if b_hi > 0.0 { b_hi * 1.08 } else { 1.0 };
    let mut ch = ChartBuilder::on(root)
        .margin(14)
        .margin_right(30)
        .caption(
            text(&format!(
                "Buffer capacity against the dose of {}",
                c.adjuster_name
            )),
            (FAMILY, CAPTION),
        )
        .x_label_area_size(46)
        .y_label_area_size(64)
        .build_cartesian_2d(x_lo.min(0.0)..x_hi, 0.0..y_hi)
        .map_err(draw_error)?;
    ch.configure_mesh()
        .x_desc(text(&format!("Dose of {}, g", c.adjuster_name)))
        .y_desc(text("β, mol per kg water per pH"))
        .axis_desc_style((FAMILY, AXIS))
        .label_style((FAMILY, TICKS))
        .x_label_formatter(&tick)
        .y_label_formatter(&tick)
        .light_line_style(TRANSPARENT)
        .bold_line_style(RGBColor(225, 225, 225))
        .draw()
        .map_err(draw_error)?;
    let style = color(BUFFER).stroke_width(2);
    ch.draw_series(DashedLineSeries::new(
        c.points.iter().map(|p| (p.dose_g, p.buffer_capacity)),
        9,
        6,
        style,
    ))
    .map_err(draw_error)?
    .label("Buffer capacity")
    .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], style));
    legend(&mut ch, SeriesLabelPosition::UpperRight)
}

fn species<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &SpeciesChart,
    text: Label<'_>,
) -> Result<(), ExportError> {
    if c.ph.is_empty() || c.forms.is_empty() {
        return Err(empty("species chart"));
    }
    // The legend gets a column of its own: the curves fill the whole pH range, so no corner of
    // the plot is free for it.
    let width = root.dim_in_pixel().0;
    let (plot, side) = root.split_horizontally(width * 71 / 100);
    let mut ch = ChartBuilder::on(&plot)
        .margin(14)
        .margin_right(18)
        .caption(
            text(&format!("Forms of {} against pH", c.system_name)),
            (FAMILY, CAPTION),
        )
        .x_label_area_size(46)
        .y_label_area_size(54)
        .build_cartesian_2d(0.0..14.0, 0.0..1.05)
        .map_err(draw_error)?;
    ch.configure_mesh()
        .x_desc("pH")
        .y_desc("Fraction")
        .x_labels(15)
        .axis_desc_style((FAMILY, AXIS))
        .label_style((FAMILY, TICKS))
        .x_label_formatter(&tick)
        .y_label_formatter(&tick)
        .light_line_style(TRANSPARENT)
        .bold_line_style(RGBColor(225, 225, 225))
        .draw()
        .map_err(draw_error)?;
    let font = (FAMILY, LEGEND).into_font().color(&BLACK);
    let (x0, mut y) = (6, 58);
    for (j, (name, fractions)) in c.forms.iter().zip(&c.fractions).enumerate() {
        let style = color(SPECIES[j % SPECIES.len()]).stroke_width(2);
        let points = c.ph.iter().copied().zip(fractions.iter().copied());
        // Solid for even forms, dashed for odd ones, so neighbours differ by more than colour.
        if j % 2 == 0 {
            ch.draw_series(LineSeries::new(points, style))
                .map_err(draw_error)?;
            side.draw(&PathElement::new(vec![(x0, y), (x0 + 26, y)], style))
                .map_err(draw_error)?;
        } else {
            ch.draw_series(DashedLineSeries::new(points, 7, 5, style))
                .map_err(draw_error)?;
            for x in [x0, x0 + 17] {
                side.draw(&PathElement::new(vec![(x, y), (x + 9, y)], style))
                    .map_err(draw_error)?;
            }
        }
        side.draw(&plotters::element::Text::new(
            text(name),
            (x0 + 34, y - 8),
            font.clone(),
        ))
        .map_err(draw_error)?;
        y += 24;
    }
    let now = color(CURRENT).stroke_width(2);
    ch.draw_series(LineSeries::new(
        [(c.current_ph, 0.0), (c.current_ph, 1.05)],
        now,
    ))
    .map_err(draw_error)?;
    side.draw(&PathElement::new(
        vec![(x0 + 13, y - 8), (x0 + 13, y + 8)],
        now,
    ))
    .map_err(draw_error)?;
    side.draw(&plotters::element::Text::new(
        format!("Current recipe, pH {:.2}", c.current_ph),
        (x0 + 34, y - 8),
        font,
    ))
    .map_err(draw_error)?;
    Ok(())
}

fn titration<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &TitrationChart,
    text: Label<'_>,
) -> Result<(), ExportError> {
    let (x_lo, x_hi) = finite_range(c.points.iter().map(|p| p.ml)).ok_or(empty("titration"))?;
    let (y_lo, y_hi) = finite_range(
        c.points
            .iter()
            .map(|p| p.ph)
            .chain(c.end_points.iter().map(|e| e.ph)),
    )
    .ok_or(empty("titration"))?;
    let (y_lo, y_hi) = padded(y_lo, y_hi, 0.06);
    let x_hi = if x_hi > x_lo { x_hi } else { x_lo + 1.0 };
    let mut ch = ChartBuilder::on(root)
        .margin(14)
        .margin_right(30)
        .caption(
            text(&format!(
                "QC titration of {} g with {}",
                crate::sheet::plain(c.sample_g, 4),
                c.titrant_label
            )),
            (FAMILY, CAPTION),
        )
        .x_label_area_size(46)
        .y_label_area_size(54)
        .build_cartesian_2d(x_lo.min(0.0)..x_hi, y_lo..y_hi)
        .map_err(draw_error)?;
    ch.configure_mesh()
        .x_desc("Titrant, mL")
        .y_desc("pH")
        .axis_desc_style((FAMILY, AXIS))
        .label_style((FAMILY, TICKS))
        .x_label_formatter(&tick)
        .y_label_formatter(&tick)
        .light_line_style(TRANSPARENT)
        .bold_line_style(RGBColor(225, 225, 225))
        .draw()
        .map_err(draw_error)?;
    let ph = color(PH_LINE).stroke_width(2);
    ch.draw_series(LineSeries::new(c.points.iter().map(|p| (p.ml, p.ph)), ph))
        .map_err(draw_error)?
        .label("pH, predicted")
        .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], ph));
    if !c.end_points.is_empty() {
        let style = color(EQUIVALENCE).stroke_width(2);
        ch.draw_series(
            c.end_points
                .iter()
                .map(|e| Circle::new((e.ml, e.ph), 5, style)),
        )
        .map_err(draw_error)?
        .label("End point")
        .legend(move |(x, y)| Circle::new((x + 10, y), 5, style));
    }
    let falling = c.points.last().map(|p| p.ph) < c.points.first().map(|p| p.ph);
    legend(
        &mut ch,
        if falling {
            SeriesLabelPosition::UpperRight
        } else {
            SeriesLabelPosition::LowerRight
        },
    )
}

fn lines<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &LineChart,
    text: Label<'_>,
) -> Result<(), ExportError> {
    let xs = || c.series.iter().flat_map(|s| s.points.iter().map(|p| p.0));
    let (x_lo, x_hi) =
        finite_range(xs().chain(c.marker.iter().map(|m| m.0))).ok_or(empty("chart"))?;
    let (y_lo, y_hi) = finite_range(c.series.iter().flat_map(|s| s.points.iter().map(|p| p.1)))
        .ok_or(empty("chart"))?;
    let (y_lo, y_hi) = padded(y_lo, y_hi, 0.06);
    let x_hi = if x_hi > x_lo { x_hi } else { x_lo + 1.0 };
    let mut builder = ChartBuilder::on(root);
    builder
        .margin(14)
        .margin_right(30)
        .caption(text(&c.title), (FAMILY, CAPTION))
        .x_label_area_size(46)
        .y_label_area_size(54);
    let x_desc = text(&c.x_label);
    let y_desc = text(&c.y_label);
    // One generic body for the linear and the log x axis.
    macro_rules! body {
        ($ch:expr) => {{
            let mut ch = $ch;
            ch.configure_mesh()
                .x_desc(x_desc.as_str())
                .y_desc(y_desc.as_str())
                .axis_desc_style((FAMILY, AXIS))
                .label_style((FAMILY, TICKS))
                .x_label_formatter(&tick)
                .y_label_formatter(&tick)
                .light_line_style(TRANSPARENT)
                .bold_line_style(RGBColor(225, 225, 225))
                .draw()
                .map_err(draw_error)?;
            for s in &c.series {
                let style = color(s.color).stroke_width(2);
                let points = s
                    .points
                    .iter()
                    .copied()
                    .filter(|p| p.0.is_finite() && p.1.is_finite());
                let drawn = if s.dashed {
                    ch.draw_series(DashedLineSeries::new(points, 7, 5, style))
                        .map_err(draw_error)?
                } else {
                    ch.draw_series(LineSeries::new(points, style))
                        .map_err(draw_error)?
                };
                drawn
                    .label(text(&s.name))
                    .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], style));
            }
            if let Some((x, name)) = &c.marker {
                let now = color(CURRENT).stroke_width(2);
                ch.draw_series(LineSeries::new([(*x, y_lo), (*x, y_hi)], now))
                    .map_err(draw_error)?
                    .label(text(name))
                    .legend(move |(x, y)| {
                        PathElement::new(vec![(x + 10, y - 8), (x + 10, y + 8)], now)
                    });
            }
            legend(&mut ch, SeriesLabelPosition::UpperRight)
        }};
    }
    if c.log_x {
        if x_lo <= 0.0 {
            return Err(ExportError::Draw("a log axis needs every x above 0".into()));
        }
        body!(
            builder
                .build_cartesian_2d((x_lo..x_hi).log_scale(), y_lo..y_hi)
                .map_err(draw_error)?
        )
    } else {
        body!(
            builder
                .build_cartesian_2d(x_lo..x_hi, y_lo..y_hi)
                .map_err(draw_error)?
        )
    }
}
