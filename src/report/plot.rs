//! Plot rendering for the HTML report.
//!
//! Plain data in (no physics), two encodings out: an SVG string to inline in the HTML page and
//! PNG bytes to save beside it. Text is drawn with the bundled DejaVu Sans font
//! (`assets/fonts/DejaVuSans.ttf`, Bitstream Vera licence in `assets/fonts/LICENSE-DejaVu.txt`)
//! through plotters' `ab_glyph` path, so nothing depends on system fonts or fontconfig. The SVG
//! names the font family `"DejaVu Sans, sans-serif"` and references no external resource.

use plotters::coord::Shift;
use plotters::element::{DashedPathElement, Polygon};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use plotters::style::{FontStyle, register_font};
use std::sync::OnceLock;

/// Family name under which the bundled font is registered. It doubles as the CSS font-family
/// list written into the SVG: a browser uses DejaVu Sans where installed and its own sans-serif
/// face otherwise.
const FONT_FAMILY: &str = "DejaVu Sans, sans-serif";
static FONT_BYTES: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");

/// Smallest and largest accepted image side in pixels.
const MIN_SIDE_PX: u32 = 160;
const MAX_SIDE_PX: u32 = 8000;

/// Fraction of the data span added on each side of an automatic axis range.
const AUTO_RANGE_PAD: f64 = 0.0;

/// Registers the bundled font with plotters exactly once per process.
fn ensure_font() -> Result<(), String> {
    static REGISTERED: OnceLock<Result<(), String>> = OnceLock::new();
    REGISTERED
        .get_or_init(|| {
            register_font(FONT_FAMILY, FontStyle::Normal, FONT_BYTES)
                .map_err(|_| "the bundled DejaVu Sans font could not be parsed".to_string())
        })
        .clone()
}

/// Colour-blind-safe qualitative palette, as sRGB bytes.
///
/// Values are the eight colours of Okabe, M. and Ito, K. (2008), "Color Universal Design (CUD):
/// how to make figures and presentations that are friendly to colorblind people" (J*Fly, Univ.
/// of Tokyo), in burrow's own order: the six mid-lightness hues first, black seventh and the pale
/// yellow last because it has little contrast on white. Hue alone does not survive grey print,
/// so series are also told apart by [`SeriesStyle`] (solid, dashed, dotted, markers) and each
/// palette index has its own marker shape (circle, hollow square, triangle, cross, repeating).
/// Palette indices beyond the end wrap around.
pub fn palette() -> &'static [(u8, u8, u8)] {
    const OKABE_ITO_ORDERED: [(u8, u8, u8); 8] = [
        (0, 114, 178),   // blue
        (213, 94, 0),    // vermillion
        (0, 158, 115),   // bluish green
        (204, 121, 167), // reddish purple
        (230, 159, 0),   // orange
        (86, 180, 233),  // sky blue
        (0, 0, 0),       // black
        (240, 228, 66),  // yellow
    ];
    &OKABE_ITO_ORDERED
}

/// How one series is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SeriesStyle {
    /// Solid line.
    Line,
    /// Long-dash line.
    Dashed,
    /// Dotted line.
    Dotted,
    /// Markers only; the shape follows the palette index.
    Markers,
    /// Solid line with markers at the data points.
    LineMarkers,
}

/// One curve of a line plot. Non-finite points are skipped and break the line there.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// Legend entry; an empty name leaves the series out of the legend.
    pub name: String,
    /// (x, y) pairs in the units of the axis labels.
    pub points: Vec<(f64, f64)>,
    pub style: SeriesStyle,
    /// Index into [`palette`], wrapping.
    pub colour: usize,
}

/// A filled envelope between two curves, e.g. the annual minimum and maximum ground
/// temperature against depth. The outline runs along `lower` and back along `upper`, so the
/// two curves should run in the same direction.
#[derive(Debug, Clone, PartialEq)]
pub struct Band {
    /// Legend entry; an empty name leaves the band out of the legend.
    pub name: String,
    pub lower: Vec<(f64, f64)>,
    pub upper: Vec<(f64, f64)>,
    /// Index into [`palette`], wrapping.
    pub colour: usize,
}

/// A 2-D line plot.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct LinePlot {
    /// Drawn above the plot; empty for none.
    pub title: String,
    /// Axis labels, shown as given (include the unit, e.g. "Temperature (°C)").
    pub x_label: String,
    pub y_label: String,
    pub series: Vec<Series>,
    pub bands: Vec<Band>,
    /// Values on the y axis grow downward (depth axes); the x axis is then drawn on top.
    pub y_down: bool,
    /// (min, max) with min < max; `None` fits the data with 5 % padding.
    pub x_range: Option<(f64, f64)>,
    pub y_range: Option<(f64, f64)>,
    /// Labelled horizontal reference lines at the given y values.
    pub hlines: Vec<(f64, String)>,
    /// Labelled vertical reference lines at the given x values.
    pub vlines: Vec<(f64, String)>,
}

/// One plot in both encodings.
#[derive(Debug, Clone, PartialEq)]
pub struct Rendered {
    /// A complete `<svg>` element, ready to inline in HTML.
    pub svg: String,
    /// An 8-bit RGB PNG file of the requested size.
    pub png: Vec<u8>,
}

/// Renders `plot` at `width_px` x `height_px` pixels as SVG and PNG.
pub fn render_line_plot(plot: &LinePlot, width_px: u32, height_px: u32) -> Result<Rendered, String> {
    check_size(width_px, height_px)?;
    ensure_font()?;
    let prepared = prepare_line_plot(plot)?;
    render_both(width_px, height_px, &prepared)
}

// ---------------------------------------------------------------------------------------------
// Shared rendering plumbing
// ---------------------------------------------------------------------------------------------

fn check_size(width_px: u32, height_px: u32) -> Result<(), String> {
    let ok = |s: u32| (MIN_SIDE_PX..=MAX_SIDE_PX).contains(&s);
    if ok(width_px) && ok(height_px) {
        Ok(())
    } else {
        Err(format!(
            "plot size {width_px}x{height_px} px is not allowed; each side must be {MIN_SIDE_PX} to {MAX_SIDE_PX} px"
        ))
    }
}

/// Something that can draw itself on any plotters backend.
trait Drawing {
    fn draw_on<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String>;
}

/// Runs the same drawing on an SVG and a bitmap backend and encodes the bitmap as PNG.
fn render_both<D: Drawing>(width_px: u32, height_px: u32, drawing: &D) -> Result<Rendered, String> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (width_px, height_px)).into_drawing_area();
        drawing.draw_on(&root)?;
        root.present().map_err(drawing_error)?;
    }
    let mut rgb = vec![0u8; width_px as usize * height_px as usize * 3];
    {
        let root = BitMapBackend::with_buffer(&mut rgb, (width_px, height_px)).into_drawing_area();
        drawing.draw_on(&root)?;
        root.present().map_err(drawing_error)?;
    }
    let png = encode_png(&rgb, width_px, height_px)?;
    Ok(Rendered { svg, png })
}

fn encode_png(rgb: &[u8], width_px: u32, height_px: u32) -> Result<Vec<u8>, String> {
    let mut out = Vec::new();
    let mut encoder = png::Encoder::new(&mut out, width_px, height_px);
    encoder.set_color(png::ColorType::Rgb);
    encoder.set_depth(png::BitDepth::Eight);
    encoder.set_compression(png::Compression::Fast);
    let mut writer = encoder
        .write_header()
        .map_err(|e| format!("PNG encoding failed: {e}"))?;
    writer
        .write_image_data(rgb)
        .map_err(|e| format!("PNG encoding failed: {e}"))?;
    writer.finish().map_err(|e| format!("PNG encoding failed: {e}"))?;
    Ok(out)
}

fn drawing_error<E: std::fmt::Debug>(e: E) -> String {
    format!("plot drawing failed: {e:?}")
}

/// Replaces control characters (invalid in XML 1.0 even when escaped, and meaningless in a
/// label) by spaces. Markup characters are escaped by the SVG backend itself.
fn clean_text(s: &str) -> String {
    s.chars().map(|c| if c.is_control() { ' ' } else { c }).collect()
}

/// Text sizes in plotters' size unit (pixels of ascent + descent), scaled with the image.
#[derive(Debug, Clone, Copy)]
struct FontSizes {
    tick: f64,
    label: f64,
    title: f64,
}

impl FontSizes {
    fn for_image(width_px: u32, height_px: u32) -> Self {
        let base = (f64::from(width_px.min(height_px)) / 28.0).clamp(11.0, 30.0);
        Self {
            tick: base * 0.85,
            label: base,
            title: base * 1.2,
        }
    }
}

fn font(size: f64) -> TextStyle<'static> {
    (FONT_FAMILY, size).into_font().color(&BLACK)
}

/// Formats an axis value with a number of decimals suited to the axis span, without trailing
/// zeros and without "-0".
fn format_tick(value: f64, span: f64) -> String {
    let decimals = if span > 0.0 && span.is_finite() {
        (2.0 - span.log10().floor()).clamp(0.0, 8.0) as usize
    } else {
        2
    };
    let mut s = format!("{value:.decimals$}");
    if s.contains('.') {
        while s.ends_with('0') {
            s.pop();
        }
        if s.ends_with('.') {
            s.pop();
        }
    }
    if s == "-0" {
        s = "0".to_string();
    }
    s
}

fn rgb(colour_index: usize) -> RGBColor {
    let p = palette();
    let (r, g, b) = p[colour_index % p.len()];
    RGBColor(r, g, b)
}

/// Axis-aligned rectangle in data coordinates.
#[derive(Debug, Clone, Copy, PartialEq)]
struct Bounds {
    x0: f64,
    x1: f64,
    y0: f64,
    y1: f64,
}

impl Bounds {
    fn contains(&self, (x, y): (f64, f64)) -> bool {
        x >= self.x0 && x <= self.x1 && y >= self.y0 && y <= self.y1
    }
}

/// Clips the segment a-b to `b` (Liang-Barsky). Returns the visible part and whether its start
/// and end were moved.
fn clip_segment(a: (f64, f64), b: (f64, f64), bx: &Bounds) -> Option<((f64, f64), (f64, f64), bool, bool)> {
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let (mut t0, mut t1) = (0.0_f64, 1.0_f64);
    for (p, q) in [
        (-dx, a.0 - bx.x0),
        (dx, bx.x1 - a.0),
        (-dy, a.1 - bx.y0),
        (dy, bx.y1 - a.1),
    ] {
        if p == 0.0 {
            if q < 0.0 {
                return None;
            }
        } else {
            let r = q / p;
            if p < 0.0 {
                if r > t1 {
                    return None;
                }
                t0 = t0.max(r);
            } else {
                if r < t0 {
                    return None;
                }
                t1 = t1.min(r);
            }
        }
    }
    let at = |t: f64| (a.0 + t * dx, a.1 + t * dy);
    Some((at(t0), at(t1), t0 > 0.0, t1 < 1.0))
}

/// Clips a polyline to `bx`, returning the visible pieces. A one-point run is kept if inside.
fn clip_polyline(run: &[(f64, f64)], bx: &Bounds) -> Vec<Vec<(f64, f64)>> {
    if run.len() == 1 {
        return if bx.contains(run[0]) {
            vec![run.to_vec()]
        } else {
            Vec::new()
        };
    }
    let mut pieces = Vec::new();
    let mut current: Vec<(f64, f64)> = Vec::new();
    for w in run.windows(2) {
        match clip_segment(w[0], w[1], bx) {
            Some((p, q, start_moved, end_moved)) => {
                if start_moved && !current.is_empty() {
                    pieces.push(std::mem::take(&mut current));
                }
                if current.is_empty() {
                    current.push(p);
                }
                current.push(q);
                if end_moved {
                    pieces.push(std::mem::take(&mut current));
                }
            }
            None => {
                if !current.is_empty() {
                    pieces.push(std::mem::take(&mut current));
                }
            }
        }
    }
    if !current.is_empty() {
        pieces.push(current);
    }
    pieces
}

/// Clips a polygon to `bx` (Sutherland-Hodgman).
fn clip_polygon(poly: &[(f64, f64)], bx: &Bounds) -> Vec<(f64, f64)> {
    type Inside = fn(&Bounds, (f64, f64)) -> bool;
    type Cross = fn(&Bounds, (f64, f64), (f64, f64)) -> (f64, f64);
    fn at_x(a: (f64, f64), b: (f64, f64), x: f64) -> (f64, f64) {
        let t = (x - a.0) / (b.0 - a.0);
        (x, a.1 + t * (b.1 - a.1))
    }
    fn at_y(a: (f64, f64), b: (f64, f64), y: f64) -> (f64, f64) {
        let t = (y - a.1) / (b.1 - a.1);
        (a.0 + t * (b.0 - a.0), y)
    }
    let edges: [(Inside, Cross); 4] = [
        (|b, p| p.0 >= b.x0, |b, p, q| at_x(p, q, b.x0)),
        (|b, p| p.0 <= b.x1, |b, p, q| at_x(p, q, b.x1)),
        (|b, p| p.1 >= b.y0, |b, p, q| at_y(p, q, b.y0)),
        (|b, p| p.1 <= b.y1, |b, p, q| at_y(p, q, b.y1)),
    ];
    let mut out = poly.to_vec();
    for (inside, cross) in edges {
        if out.is_empty() {
            break;
        }
        let input = std::mem::take(&mut out);
        let mut prev = input[input.len() - 1];
        for &cur in &input {
            match (inside(bx, prev), inside(bx, cur)) {
                (true, true) => out.push(cur),
                (true, false) => out.push(cross(bx, prev, cur)),
                (false, true) => {
                    out.push(cross(bx, prev, cur));
                    out.push(cur);
                }
                (false, false) => {}
            }
            prev = cur;
        }
    }
    out
}

/// Range of `values` padded by [`AUTO_RANGE_PAD`] on each side; a single value gets +-10 % (or
/// +-1 at zero); no values gives 0..1.
fn auto_range(values: impl Iterator<Item = f64>) -> (f64, f64) {
    let (lo, hi) = values.fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
        (lo.min(v), hi.max(v))
    });
    if !lo.is_finite() || !hi.is_finite() {
        return (0.0, 1.0);
    }
    let span = hi - lo;
    if span > 0.0 {
        (lo - AUTO_RANGE_PAD * span, hi + AUTO_RANGE_PAD * span)
    } else {
        let half = if lo == 0.0 { 1.0 } else { 0.1 * lo.abs() };
        (lo - half, hi + half)
    }
}

fn checked_range(range: (f64, f64), what: &str) -> Result<(f64, f64), String> {
    let (lo, hi) = range;
    if lo.is_finite() && hi.is_finite() && lo < hi {
        Ok(range)
    } else {
        Err(format!(
            "{what} ({lo}, {hi}) is not usable; give finite (min, max) with min < max"
        ))
    }
}

// ---------------------------------------------------------------------------------------------
// Line plot
// ---------------------------------------------------------------------------------------------

/// A validated line plot in internal coordinates: the y value is negated when the axis grows
/// downward, so that larger internal y is always higher on the page.
struct PreparedLinePlot {
    title: String,
    x_label: String,
    y_label: String,
    y_sign: f64,
    bounds: Bounds,
    series: Vec<PreparedSeries>,
    bands: Vec<PreparedBand>,
    hlines: Vec<(f64, String)>,
    vlines: Vec<(f64, String)>,
}

struct PreparedSeries {
    name: String,
    /// Finite stretches of the input, clipped to the plot bounds.
    runs: Vec<Vec<(f64, f64)>>,
    style: SeriesStyle,
    colour: usize,
}

struct PreparedBand {
    name: String,
    polygon: Vec<(f64, f64)>,
    lower: Vec<(f64, f64)>,
    upper: Vec<(f64, f64)>,
    colour: usize,
}

/// Splits `points` into maximal runs of finite points, mapping y by `y_sign`.
fn finite_runs(points: &[(f64, f64)], y_sign: f64) -> Vec<Vec<(f64, f64)>> {
    let mut runs = Vec::new();
    let mut current = Vec::new();
    for &(x, y) in points {
        if x.is_finite() && y.is_finite() {
            current.push((x, y * y_sign));
        } else if !current.is_empty() {
            runs.push(std::mem::take(&mut current));
        }
    }
    if !current.is_empty() {
        runs.push(current);
    }
    runs
}

fn finite_points(points: &[(f64, f64)], y_sign: f64) -> Vec<(f64, f64)> {
    finite_runs(points, y_sign).concat()
}

fn prepare_line_plot(plot: &LinePlot) -> Result<PreparedLinePlot, String> {
    let y_sign = if plot.y_down { -1.0 } else { 1.0 };

    let mut series_runs = Vec::with_capacity(plot.series.len());
    for s in &plot.series {
        let runs = finite_runs(&s.points, y_sign);
        if runs.is_empty() {
            return Err(format!(
                "series '{}' has no point with finite x and y; give at least one",
                s.name
            ));
        }
        series_runs.push(runs);
    }
    let mut band_curves = Vec::with_capacity(plot.bands.len());
    for b in &plot.bands {
        let lower = finite_points(&b.lower, y_sign);
        let upper = finite_points(&b.upper, y_sign);
        if lower.is_empty() || upper.is_empty() || lower.len() + upper.len() < 3 {
            return Err(format!(
                "band '{}' needs finite points on both its lower and upper curve, at least three in all",
                b.name
            ));
        }
        band_curves.push((lower, upper));
    }
    for (v, label) in plot.hlines.iter().chain(&plot.vlines) {
        if !v.is_finite() {
            return Err(format!("reference line '{label}' is at {v}; give a finite value"));
        }
    }

    let all_points = || {
        series_runs
            .iter()
            .flatten()
            .flatten()
            .chain(band_curves.iter().flat_map(|(l, u)| l.iter().chain(u)))
            .copied()
    };
    let (x0, x1) = match plot.x_range {
        Some(r) => checked_range(r, "x_range")?,
        None => auto_range(all_points().map(|p| p.0).chain(plot.vlines.iter().map(|l| l.0))),
    };
    let (y0, y1) = match plot.y_range {
        Some(r) => {
            let (lo, hi) = checked_range(r, "y_range")?;
            if plot.y_down { (-hi, -lo) } else { (lo, hi) }
        }
        None => auto_range(
            all_points()
                .map(|p| p.1)
                .chain(plot.hlines.iter().map(|l| l.0 * y_sign)),
        ),
    };
    let bounds = Bounds { x0, x1, y0, y1 };

    let series = plot
        .series
        .iter()
        .zip(series_runs)
        .map(|(s, runs)| PreparedSeries {
            name: clean_text(&s.name),
            runs: runs.iter().flat_map(|r| clip_polyline(r, &bounds)).collect(),
            style: s.style,
            colour: s.colour,
        })
        .collect();
    let bands = plot
        .bands
        .iter()
        .zip(band_curves)
        .map(|(b, (lower, upper))| {
            let outline: Vec<_> = lower.iter().chain(upper.iter().rev()).copied().collect();
            PreparedBand {
                name: clean_text(&b.name),
                polygon: clip_polygon(&outline, &bounds),
                lower,
                upper,
                colour: b.colour,
            }
        })
        .collect();
    let hlines = plot
        .hlines
        .iter()
        .map(|(v, l)| (v * y_sign, clean_text(l)))
        .filter(|(v, _)| *v >= y0 && *v <= y1)
        .collect();
    let vlines = plot
        .vlines
        .iter()
        .map(|(v, l)| (*v, clean_text(l)))
        .filter(|(v, _)| *v >= x0 && *v <= x1)
        .collect();

    Ok(PreparedLinePlot {
        title: clean_text(&plot.title),
        x_label: clean_text(&plot.x_label),
        y_label: clean_text(&plot.y_label),
        y_sign,
        bounds,
        series,
        bands,
        hlines,
        vlines,
    })
}

/// Pixel sizes of line work, scaled with the text.
#[derive(Debug, Clone, Copy)]
struct Strokes {
    line: u32,
    marker: i32,
    dash: i32,
    gap: i32,
}

impl Strokes {
    fn for_fonts(f: FontSizes) -> Self {
        let unit = f.label / 14.0;
        Self {
            line: (2.0 * unit).round().max(1.0) as u32,
            marker: (3.5 * unit).round().max(2.0) as i32,
            dash: (9.0 * unit).round().max(3.0) as i32,
            gap: (5.0 * unit).round().max(2.0) as i32,
        }
    }
}

impl Drawing for PreparedLinePlot {
    fn draw_on<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        draw_line_plot(root, self)
    }
}

fn draw_line_plot<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    p: &PreparedLinePlot,
) -> Result<(), String> {
    let (w, h) = root.dim_in_pixel();
    let fonts = FontSizes::for_image(w, h);
    let strokes = Strokes::for_fonts(fonts);
    let tick_font = font(fonts.tick);
    let label_font = font(fonts.label);
    let b = p.bounds;

    root.fill(&WHITE).map_err(drawing_error)?;

    let x_span = b.x1 - b.x0;
    let y_span = b.y1 - b.y0;
    let y_sign = p.y_sign;
    let x_fmt = move |v: &f64| format_tick(*v, x_span);
    let y_fmt = move |v: &f64| format_tick(*v * y_sign, y_span);

    // Room for the widest y tick label plus the rotated axis label.
    let widest_y_tick = [b.y0, b.y1, 0.5 * (b.y0 + b.y1)]
        .iter()
        .map(|v| text_width(root, &y_fmt(v), &tick_font))
        .max()
        .unwrap_or(0);
    let y_area = f64::from(widest_y_tick) + 1.5 * fonts.label + 0.6 * fonts.tick + 8.0;
    let x_area = 1.2 * fonts.tick + 1.6 * fonts.label + 10.0;
    let margin = (0.8 * fonts.label) as u32;

    let chart_area = if p.title.trim().is_empty() {
        root.clone()
    } else {
        let title_h = (1.3 * fonts.title) as u32 + margin;
        let (top, rest) = root.split_vertically(title_h);
        let (tw, th) = top.dim_in_pixel();
        top.draw_text(
            &p.title,
            &font(fonts.title).pos(Pos::new(HPos::Center, VPos::Center)),
            (tw as i32 / 2, (th as i32 + margin as i32) / 2),
        )
        .map_err(drawing_error)?;
        rest
    };
    let mut builder = ChartBuilder::on(&chart_area);
    builder
        .margin(margin)
        .margin_right(margin + (1.2 * fonts.label) as u32)
        .set_label_area_size(LabelAreaPosition::Left, y_area as u32);
    if p.y_sign < 0.0 {
        builder.set_label_area_size(LabelAreaPosition::Top, x_area as u32);
    } else {
        builder.set_label_area_size(LabelAreaPosition::Bottom, x_area as u32);
    }
    let mut chart = builder
        .build_cartesian_2d(b.x0..b.x1, b.y0..b.y1)
        .map_err(drawing_error)?;

    chart
        .configure_mesh()
        .x_desc(p.x_label.as_str())
        .y_desc(p.y_label.as_str())
        .x_labels(8)
        .y_labels(8)
        .x_label_formatter(&x_fmt)
        .y_label_formatter(&y_fmt)
        .label_style(tick_font.clone())
        .axis_desc_style(label_font.clone())
        .bold_line_style(RGBColor(215, 215, 215))
        .light_line_style(RGBColor(242, 242, 242))
        .axis_style(BLACK)
        .draw()
        .map_err(drawing_error)?;

    let area = chart.plotting_area();

    // Bands underneath everything else.
    for band in &p.bands {
        let c = rgb(band.colour);
        if band.polygon.len() >= 3 {
            area.draw(&Polygon::new(band.polygon.clone(), c.mix(BAND_ALPHA).filled()))
                .map_err(drawing_error)?;
        }
        for edge in [&band.lower, &band.upper] {
            for piece in clip_polyline(edge, &b) {
                area.draw(&PathElement::new(piece, c.stroke_width(1)))
                    .map_err(drawing_error)?;
            }
        }
    }

    // Reference lines with their labels.
    let ref_style = RGBColor(70, 70, 70).stroke_width(1);
    let ref_font = font(fonts.tick).color(&RGBColor(40, 40, 40));
    let pad = (0.3 * fonts.tick) as i32 + 2;
    for (y, label) in &p.hlines {
        area.draw(&DashedPathElement::new(
            vec![(b.x0, *y), (b.x1, *y)],
            strokes.dash + 4,
            strokes.gap,
            ref_style,
        ))
        .map_err(drawing_error)?;
        area.draw(
            &(EmptyElement::at((b.x1, *y))
                + Text::new(
                    label.clone(),
                    (-pad, -pad),
                    ref_font.pos(Pos::new(HPos::Right, VPos::Bottom)),
                )),
        )
        .map_err(drawing_error)?;
    }
    for (x, label) in &p.vlines {
        area.draw(&DashedPathElement::new(
            vec![(*x, b.y0), (*x, b.y1)],
            strokes.dash + 4,
            strokes.gap,
            ref_style,
        ))
        .map_err(drawing_error)?;
        area.draw(
            &(EmptyElement::at((*x, b.y1))
                + Text::new(
                    label.clone(),
                    (pad, pad),
                    ref_font.pos(Pos::new(HPos::Left, VPos::Top)),
                )),
        )
        .map_err(drawing_error)?;
    }

    // Series.
    for s in &p.series {
        let c = rgb(s.colour);
        for run in &s.runs {
            if s.style != SeriesStyle::Markers && run.len() >= 2 {
                draw_styled_line(area, run.clone(), s.style, c, strokes)?;
            }
            let markers = matches!(s.style, SeriesStyle::Markers | SeriesStyle::LineMarkers);
            // An isolated point of a line series would be invisible; mark it.
            if markers || run.len() == 1 {
                for &pt in run {
                    draw_marker(area, pt, s.colour, strokes.marker)?;
                }
            }
        }
    }

    // Frame around the plotting area.
    let pixels = area.strip_coord_spec();
    let (aw, ah) = pixels.dim_in_pixel();
    pixels
        .draw(&Rectangle::new(
            [(0, 0), (aw as i32 - 1, ah as i32 - 1)],
            BLACK.stroke_width(1),
        ))
        .map_err(drawing_error)?;

    // Legend.
    let entries: Vec<LegendEntry> = p
        .series
        .iter()
        .filter(|s| !s.name.trim().is_empty())
        .map(|s| LegendEntry {
            name: &s.name,
            key: LegendKey::Series(s.style, s.colour),
        })
        .chain(
            p.bands
                .iter()
                .filter(|b| !b.name.trim().is_empty())
                .map(|b| LegendEntry {
                    name: &b.name,
                    key: LegendKey::Band(b.colour),
                }),
        )
        .collect();
    if !entries.is_empty() {
        draw_legend(&pixels, p, &entries, fonts, strokes)?;
    }
    Ok(())
}

/// Opacity of band fills.
const BAND_ALPHA: f64 = 0.22;

fn text_width<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, text: &str, style: &TextStyle) -> u32 {
    root.estimate_text_size(text, style).map(|s| s.0).unwrap_or(0)
}

/// Draws a polyline of at least two points in the given line style.
fn draw_styled_line<DB: DrawingBackend, CT>(
    area: &DrawingArea<DB, CT>,
    points: Vec<CT::From>,
    style: SeriesStyle,
    c: RGBColor,
    strokes: Strokes,
) -> Result<(), String>
where
    CT: CoordTranslate,
    CT::From: Clone,
{
    let line = c.stroke_width(strokes.line);
    match style {
        SeriesStyle::Dashed => area.draw(&DashedPathElement::new(points, strokes.dash, strokes.gap, line)),
        SeriesStyle::Dotted => area.draw(&DashedPathElement::new(
            points,
            strokes.line as i32,
            strokes.gap,
            line,
        )),
        _ => area.draw(&PathElement::new(points, line)),
    }
    .map_err(drawing_error)
}

/// Draws the marker of palette index `shape` centred on `at`: filled circle, hollow square,
/// filled triangle, cross, repeating.
fn draw_marker<DB: DrawingBackend, CT>(
    area: &DrawingArea<DB, CT>,
    at: CT::From,
    shape: usize,
    size: i32,
) -> Result<(), String>
where
    CT: CoordTranslate,
    CT::From: Clone,
{
    let c = rgb(shape);
    match shape % 4 {
        0 => area.draw(&Circle::new(at, size, c.filled())),
        1 => area.draw(
            &(EmptyElement::at(at) + Rectangle::new([(-size, -size), (size, size)], c.stroke_width(2))),
        ),
        2 => area.draw(&TriangleMarker::new(at, size + 1, c.filled())),
        _ => area.draw(&Cross::new(at, size, c.stroke_width(2))),
    }
    .map_err(drawing_error)
}

enum LegendKey {
    Series(SeriesStyle, usize),
    Band(usize),
}

struct LegendEntry<'a> {
    name: &'a str,
    key: LegendKey,
}

/// Draws the legend box in the emptiest corner of the plotting area (`pixels` is the plotting
/// area in pixel coordinates).
fn draw_legend<DB: DrawingBackend>(
    pixels: &DrawingArea<DB, Shift>,
    p: &PreparedLinePlot,
    entries: &[LegendEntry],
    fonts: FontSizes,
    strokes: Strokes,
) -> Result<(), String> {
    let label_font = font(fonts.label);
    let key_w = (2.0 * fonts.label).round() as i32;
    let pad = (0.5 * fonts.label).round() as i32;
    let row_h = (1.35 * fonts.label).round() as i32;
    let widest = entries
        .iter()
        .map(|e| text_width(pixels, e.name, &label_font))
        .max()
        .unwrap_or(0) as i32;
    let box_w = pad + key_w + pad + widest + pad;
    let box_h = pad + row_h * entries.len() as i32 + pad / 2;
    let (area_w, area_h) = pixels.dim_in_pixel();
    let (right, upper) = legend_corner(p, (box_w, box_h), (area_w, area_h));
    let inset = pad;
    let x0 = if right {
        area_w as i32 - inset - box_w
    } else {
        inset
    };
    let y0 = if upper {
        inset
    } else {
        area_h as i32 - inset - box_h
    };

    pixels
        .draw(&Rectangle::new(
            [(x0, y0), (x0 + box_w, y0 + box_h)],
            WHITE.mix(0.88).filled(),
        ))
        .map_err(drawing_error)?;
    pixels
        .draw(&Rectangle::new(
            [(x0, y0), (x0 + box_w, y0 + box_h)],
            RGBColor(120, 120, 120).stroke_width(1),
        ))
        .map_err(drawing_error)?;
    let text_style = label_font.pos(Pos::new(HPos::Left, VPos::Center));
    for (i, e) in entries.iter().enumerate() {
        let yc = y0 + pad + row_h * i as i32 + row_h / 2;
        let kx0 = x0 + pad;
        let kx1 = kx0 + key_w;
        match e.key {
            LegendKey::Series(style, colour) => {
                if style != SeriesStyle::Markers {
                    draw_styled_line(pixels, vec![(kx0, yc), (kx1, yc)], style, rgb(colour), strokes)?;
                }
                if matches!(style, SeriesStyle::Markers | SeriesStyle::LineMarkers) {
                    draw_marker(pixels, ((kx0 + kx1) / 2, yc), colour, strokes.marker)?;
                }
            }
            LegendKey::Band(colour) => {
                let half = row_h / 3;
                pixels
                    .draw(&Rectangle::new(
                        [(kx0, yc - half), (kx1, yc + half)],
                        rgb(colour).mix(BAND_ALPHA).filled(),
                    ))
                    .map_err(drawing_error)?;
                pixels
                    .draw(&Rectangle::new(
                        [(kx0, yc - half), (kx1, yc + half)],
                        rgb(colour).stroke_width(1),
                    ))
                    .map_err(drawing_error)?;
            }
        }
        pixels
            .draw_text(e.name, &text_style, (kx1 + pad, yc))
            .map_err(drawing_error)?;
    }
    Ok(())
}

/// Picks the corner of the plotting area whose legend box (`legend_px`, in pixels) covers the
/// fewest data samples (points and samples along lines and band outlines), preferring upper
/// right, lower right, upper left, lower left on ties. Returns (right, upper).
fn legend_corner(p: &PreparedLinePlot, legend_px: (i32, i32), area_px: (u32, u32)) -> (bool, bool) {
    let b = p.bounds;
    let fw = (f64::from(legend_px.0) / f64::from(area_px.0.max(1))).min(1.0);
    let fh = (f64::from(legend_px.1) / f64::from(area_px.1.max(1))).min(1.0);
    let to_unit = |(x, y): (f64, f64)| ((x - b.x0) / (b.x1 - b.x0), (y - b.y0) / (b.y1 - b.y0));
    let mut samples: Vec<(f64, f64)> = Vec::new();
    let mut add_polyline = |pts: &[(f64, f64)]| {
        for w in pts.windows(2) {
            for k in 0..8 {
                let t = f64::from(k) / 8.0;
                samples.push(to_unit((
                    w[0].0 + t * (w[1].0 - w[0].0),
                    w[0].1 + t * (w[1].1 - w[0].1),
                )));
            }
        }
        if let Some(&last) = pts.last() {
            samples.push(to_unit(last));
        }
    };
    for s in &p.series {
        for run in &s.runs {
            add_polyline(run);
        }
    }
    for band in &p.bands {
        add_polyline(&band.polygon);
    }
    let count = |right: bool, upper: bool| {
        samples
            .iter()
            .filter(|(u, v)| {
                let in_x = if right { *u >= 1.0 - fw } else { *u <= fw };
                let in_y = if upper { *v >= 1.0 - fh } else { *v <= fh };
                in_x && in_y
            })
            .count()
    };
    let mut best = (usize::MAX, (true, true));
    for corner in [(true, true), (true, false), (false, true), (false, false)] {
        let n = count(corner.0, corner.1);
        if n < best.0 {
            best = (n, corner);
        }
    }
    best.1
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tick_format_drops_trailing_zeros_and_negative_zero() {
        assert_eq!(format_tick(5.0, 20.0), "5");
        assert_eq!(format_tick(2.5, 20.0), "2.5");
        assert_eq!(format_tick(-0.0001, 20.0), "0");
        assert_eq!(format_tick(0.125, 0.5), "0.125");
        assert_eq!(format_tick(0.30000000000000004, 1.0), "0.3");
    }

    #[test]
    fn segment_clipping_keeps_the_inside_part() {
        let bx = Bounds {
            x0: 0.0,
            x1: 1.0,
            y0: 0.0,
            y1: 1.0,
        };
        let (p, q, s, e) = clip_segment((-1.0, 0.5), (2.0, 0.5), &bx).unwrap();
        assert_eq!((p, q, s, e), ((0.0, 0.5), (1.0, 0.5), true, true));
        assert!(clip_segment((-1.0, 2.0), (2.0, 2.0), &bx).is_none());
        let pieces = clip_polyline(&[(0.5, 0.5), (0.5, 2.0), (0.6, 0.5)], &bx);
        assert_eq!(pieces.len(), 2);
        assert_eq!(pieces[0], vec![(0.5, 0.5), (0.5, 1.0)]);
        assert!((pieces[1][0].0 - (0.5 + 0.1 * 2.0 / 3.0)).abs() < 1e-12);
    }

    #[test]
    fn polygon_clipping_of_a_square_half_outside_halves_it() {
        let bx = Bounds {
            x0: 0.0,
            x1: 1.0,
            y0: 0.0,
            y1: 1.0,
        };
        let sq = [(0.5, 0.25), (1.5, 0.25), (1.5, 0.75), (0.5, 0.75)];
        let c = clip_polygon(&sq, &bx);
        // Shoelace area of the clipped polygon: 0.5 x 0.5.
        let area: f64 = (0..c.len())
            .map(|i| {
                let (a, b) = (c[i], c[(i + 1) % c.len()]);
                a.0 * b.1 - b.0 * a.1
            })
            .sum::<f64>()
            .abs()
            / 2.0;
        assert!((area - 0.25).abs() < 1e-12);
    }
}
