//! Plot rendering for the HTML report.
//!
//! Plain data in (no physics), two encodings out: an SVG string to inline in the HTML page and
//! PNG bytes to save beside it. Text is drawn with the bundled DejaVu Sans font
//! (`assets/fonts/DejaVuSans.ttf`, Bitstream Vera licence in `assets/fonts/LICENSE-DejaVu.txt`)
//! through plotters' `ab_glyph` path, so nothing depends on system fonts or fontconfig. The SVG
//! names the font family `"DejaVu Sans, sans-serif"` and references no external resource.

use plotters::coord::Shift;
use plotters::element::{BitMapElement, DashedPathElement, Polygon};
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
const AUTO_RANGE_PAD: f64 = 0.05;

/// A point in data coordinates.
type Point = (f64, f64);
/// A connected line through data points.
type Polyline = Vec<Point>;

/// Registers the bundled font with plotters exactly once per process.
pub(crate) fn ensure_font() -> Result<(), String> {
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
/// how to make figures and presentations that are friendly to colorblind people" (web
/// publication; sRGB bytes from memory, as widely reproduced), in burrow's own order: the six mid-lightness hues first, black seventh and the pale
/// yellow eighth because it has little contrast on white; then burrow's two colours for the
/// sides of a ground heat exchanger ([`FROM_GROUND`], [`TO_GROUND`]). Hue alone does not survive grey print,
/// so series are also told apart by [`SeriesStyle`] (solid, dashed, dotted, markers) and each
/// palette index has its own marker shape (circle, hollow square, triangle, cross, repeating).
/// Palette indices beyond the end wrap around.
pub fn palette() -> &'static [(u8, u8, u8)] {
    const OKABE_ITO_ORDERED: [(u8, u8, u8); 10] = [
        (0, 114, 178),   // blue
        (213, 94, 0),    // vermillion
        (0, 158, 115),   // bluish green
        (204, 121, 167), // reddish purple
        (230, 159, 0),   // orange
        (86, 180, 233),  // sky blue
        (0, 0, 0),       // black
        (240, 228, 66),  // yellow
        FROM_GROUND_RGB,
        TO_GROUND_RGB,
    ];
    &OKABE_ITO_ORDERED
}

/// burrow's colour for heat taken from the ground, the cold side of a ground heat exchanger (a
/// deep slate blue), used for it in every borefield, ground-loop and response-test chart:
/// palette index [`FROM_GROUND`].
pub const FROM_GROUND_RGB: (u8, u8, u8) = (38, 84, 124);
/// burrow's colour for heat given to the ground, the warm side (a burnt ochre): palette index
/// [`TO_GROUND`]. The pair stays apart for the common colour-vision deficiencies (blue against
/// orange) and in grey print (dark against mid).
pub const TO_GROUND_RGB: (u8, u8, u8) = (196, 112, 30);
/// Between the two sides, the pale middle of [`side_colour`].
pub const SIDE_MIDDLE_RGB: (u8, u8, u8) = (244, 241, 232);
/// Palette index of [`FROM_GROUND_RGB`].
pub const FROM_GROUND: usize = 8;
/// Palette index of [`TO_GROUND_RGB`].
pub const TO_GROUND: usize = 9;

/// The diverging scale between the two sides: `t` = 0 is the cold side's colour, 1 the warm
/// side's, 0.5 the pale middle (linear in sRGB on each half; clamped; non-finite gives grey).
pub fn side_colour(t: f64) -> (u8, u8, u8) {
    if !t.is_finite() {
        return NO_DATA_RGB;
    }
    let t = t.clamp(0.0, 1.0);
    let (a, b, f) = if t < 0.5 {
        (FROM_GROUND_RGB, SIDE_MIDDLE_RGB, t / 0.5)
    } else {
        (SIDE_MIDDLE_RGB, TO_GROUND_RGB, (t - 0.5) / 0.5)
    };
    let mix = |p: u8, q: u8| (f64::from(p) + f * (f64::from(q) - f64::from(p))).round() as u8;
    (mix(a.0, b.0), mix(a.1, b.1), mix(a.2, b.2))
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

pub(crate) fn check_size(width_px: u32, height_px: u32) -> Result<(), String> {
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
pub(crate) trait Drawing {
    /// `is_svg` tells the drawing which backend it is on (the field raster differs).
    fn draw_on<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>, is_svg: bool) -> Result<(), String>;
}

/// Runs the same drawing on an SVG and a bitmap backend and encodes the bitmap as PNG.
pub(crate) fn render_both<D: Drawing>(
    width_px: u32,
    height_px: u32,
    drawing: &D,
) -> Result<Rendered, String> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (width_px, height_px)).into_drawing_area();
        drawing.draw_on(&root, true)?;
        root.present().map_err(drawing_error)?;
    }
    let mut rgb = vec![0u8; width_px as usize * height_px as usize * 3];
    {
        let root = BitMapBackend::with_buffer(&mut rgb, (width_px, height_px)).into_drawing_area();
        drawing.draw_on(&root, false)?;
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

pub(crate) fn drawing_error<E: std::fmt::Debug>(e: E) -> String {
    format!("plot drawing failed: {e:?}")
}

/// Replaces control characters (invalid in XML 1.0 even when escaped, and meaningless in a
/// label) by spaces. Markup characters are escaped by the SVG backend itself.
pub(crate) fn clean_text(s: &str) -> String {
    s.chars().map(|c| if c.is_control() { ' ' } else { c }).collect()
}

/// Text sizes in plotters' size unit (pixels of ascent + descent), scaled with the image.
#[derive(Debug, Clone, Copy)]
pub(crate) struct FontSizes {
    pub(crate) tick: f64,
    pub(crate) label: f64,
    pub(crate) title: f64,
}

impl FontSizes {
    pub(crate) fn for_image(width_px: u32, height_px: u32) -> Self {
        let base = (f64::from(width_px.min(height_px)) / 28.0).clamp(11.0, 30.0);
        Self {
            tick: base * 0.85,
            label: base,
            title: base * 1.2,
        }
    }
}

pub(crate) fn font(size: f64) -> TextStyle<'static> {
    (FONT_FAMILY, size).into_font().color(&BLACK)
}

/// Formats an axis value with a number of decimals suited to the axis span, without trailing
/// zeros and without "-0".
pub(crate) fn format_tick(value: f64, span: f64) -> String {
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
fn clip_segment(a: (f64, f64), b: (f64, f64), bx: &Bounds) -> Option<(Point, Point, bool, bool)> {
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
    fn draw_on<DB: DrawingBackend>(
        &self,
        root: &DrawingArea<DB, Shift>,
        _is_svg: bool,
    ) -> Result<(), String> {
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

    let chart_area = draw_title(root, &p.title, fonts.title, margin)?;
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

/// Draws the title centred in a band at the top; returns the area below it (all of `root` when
/// the title is empty).
pub(crate) fn draw_title<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    title: &str,
    size: f64,
    margin: u32,
) -> Result<DrawingArea<DB, Shift>, String> {
    if title.trim().is_empty() {
        return Ok(root.clone());
    }
    let title_h = (1.3 * size) as u32 + margin;
    let (top, rest) = root.split_vertically(title_h);
    let (tw, th) = top.dim_in_pixel();
    top.draw_text(
        title,
        &font(size).pos(Pos::new(HPos::Center, VPos::Center)),
        (tw as i32 / 2, (th as i32 + margin as i32) / 2),
    )
    .map_err(drawing_error)?;
    Ok(rest)
}

pub(crate) fn text_width<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    text: &str,
    style: &TextStyle,
) -> u32 {
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

// ---------------------------------------------------------------------------------------------
// Field plot
// ---------------------------------------------------------------------------------------------

/// 16 equally spaced stops (t = k/15) of the 'viridis' colour map of S. van der Walt and
/// N. Smith (2015), the perceptually uniform sequential map made the default of matplotlib 2.0.
/// Its lightness rises monotonically from dark violet to light yellow, so it reads in grey
/// print and for colour-blind readers. Values taken from matplotlib 3.11.2 by
/// `tests/reference/viridis_reference.py`.
const VIRIDIS_16: [(u8, u8, u8); 16] = [
    (68, 1, 84),
    (72, 26, 108),
    (71, 47, 125),
    (65, 68, 135),
    (57, 86, 140),
    (49, 104, 142),
    (42, 120, 142),
    (35, 136, 142),
    (31, 152, 139),
    (34, 168, 132),
    (53, 183, 121),
    (84, 197, 104),
    (122, 209, 81),
    (165, 219, 54),
    (210, 226, 27),
    (253, 231, 37),
];

/// Colour drawn where a field value is not finite.
const NO_DATA_RGB: (u8, u8, u8) = (200, 200, 200);

/// Sequential colour map for fields: `t` in 0..=1 (clamped) from low to high, linear in sRGB
/// between the tabulated viridis stops ([`VIRIDIS_16`]). A non-finite `t` gives light grey.
pub fn colour_map(t: f64) -> (u8, u8, u8) {
    if !t.is_finite() {
        return NO_DATA_RGB;
    }
    let last = (VIRIDIS_16.len() - 1) as f64;
    let s = t.clamp(0.0, 1.0) * last;
    let i = (s.floor() as usize).min(VIRIDIS_16.len() - 2);
    let f = s - i as f64;
    let (a, b) = (VIRIDIS_16[i], VIRIDIS_16[i + 1]);
    let mix = |p: u8, q: u8| (f64::from(p) + f * (f64::from(q) - f64::from(p))).round() as u8;
    (mix(a.0, b.0), mix(a.1, b.1), mix(a.2, b.2))
}

/// A 2-D field on a rectilinear grid, e.g. ground temperature around a buried pipe, drawn with
/// depth growing downward, a colour bar, labelled isotherms and labelled point markers.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct FieldPlot {
    /// Drawn above the plot; empty for none.
    pub title: String,
    /// Axis labels as given, e.g. "Horizontal distance (m)" and "Depth (m)".
    pub x_label: String,
    pub z_label: String,
    /// Label of the colour bar, e.g. "Temperature (°C)".
    pub colour_bar_label: String,
    /// Node positions, strictly increasing, in metres.
    pub x_m: Vec<f64>,
    /// Node depths, strictly increasing (downward), in metres.
    pub z_m: Vec<f64>,
    /// Node values, `values[iz][ix]`; non-finite values are shown grey and skipped by
    /// isotherms.
    pub values: Vec<Vec<f64>>,
    /// (min, max) of the colour scale; `None` uses the finite data range.
    pub value_range: Option<(f64, f64)>,
    /// Values at which isotherms are drawn and labelled.
    pub isotherms: Vec<f64>,
    /// Labelled points (x_m, z_m, label), e.g. a pipe axis.
    pub markers: Vec<(f64, f64, String)>,
}

/// Vectors drawn as arrows over a field plot (e.g. heat flux). The plot only scales them: each
/// arrow is centred on its point, its length proportional to the vector's magnitude (the 90th
/// percentile of the magnitudes spans 0.9 of the closest spacing between arrows; the few longer
/// ones, e.g. next to a pipe, are capped at 1.5 times that, and the key then says so), and a
/// key arrow of a round value with `unit` states the scale in the top-left corner.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ArrowLayer {
    /// `(x_m, z_m, across, down)`: position and components, `down` positive with depth.
    pub arrows: Vec<(f64, f64, f64, f64)>,
    /// Unit of the components, e.g. "W/m²".
    pub unit: String,
}

/// Stroke colour of the arrows (a warm white drawn on a black halo, visible on every colour
/// of the map).
pub const ARROW_RGB: (u8, u8, u8) = (255, 250, 240);

/// Renders `plot` at `width_px` x `height_px` pixels as SVG and PNG. In the SVG the colour
/// raster is an embedded PNG (`data:` URI), not a link.
pub fn render_field_plot(plot: &FieldPlot, width_px: u32, height_px: u32) -> Result<Rendered, String> {
    render_field_plot_with_arrows(plot, &ArrowLayer::default(), width_px, height_px)
}

/// [`render_field_plot`] with `arrows` drawn over the field.
pub fn render_field_plot_with_arrows(
    plot: &FieldPlot,
    arrows: &ArrowLayer,
    width_px: u32,
    height_px: u32,
) -> Result<Rendered, String> {
    check_size(width_px, height_px)?;
    ensure_font()?;
    let mut prepared = prepare_field_plot(plot)?;
    if let Some(a) = arrows
        .arrows
        .iter()
        .find(|a| ![a.0, a.1, a.2, a.3].iter().all(|v| v.is_finite()))
    {
        return Err(format!(
            "arrow at ({}, {}) has components ({}, {}); give finite numbers",
            a.0, a.1, a.2, a.3
        ));
    }
    prepared.arrows = arrows.arrows.clone();
    prepared.arrow_unit = clean_text(&arrows.unit);
    let mut out = render_both(width_px, height_px, &prepared)?;
    let raster = prepared
        .svg_raster
        .take()
        .ok_or("field raster was not produced")?;
    out.svg = embed_raster(&out.svg, &raster)?;
    Ok(out)
}

/// One straight piece of an isoline, endpoints in data coordinates.
pub type Segment = ((f64, f64), (f64, f64));

/// Isoline of `level` through a field given at nodes (`x[ix]`, `z[iz]`) with values
/// `values[iz][ix]`, by marching squares with linear interpolation along cell edges
/// (W. E. Lorensen and H. E. Cline, 1987, "Marching cubes", SIGGRAPH '87, in its 2-D form).
/// A node counts as inside when its value is >= `level`; the two saddle cases are resolved by
/// the mean of the four corners. Cells with a non-finite corner are skipped, and so are
/// zero-length pieces (a node exactly at the level). Endpoints on an
/// edge shared by two cells are bit-identical, so the segments can be chained exactly.
/// The grid must be at least 2 x 2 with `values` of matching shape (not checked here beyond
/// skipping what does not exist).
pub fn isoline_segments(x: &[f64], z: &[f64], values: &[Vec<f64>], level: f64) -> Vec<Segment> {
    let mut segs = Vec::new();
    if x.len() < 2 || z.len() < 2 || !level.is_finite() {
        return segs;
    }
    let node = |iz: usize, ix: usize| values.get(iz).and_then(|r| r.get(ix)).copied();
    // Crossing on the edge between two nodes, always interpolated from the lower-index node
    // so that neighbouring cells get identical points.
    let cross = |n1: (usize, usize), n2: (usize, usize), v1: f64, v2: f64| {
        let ((a, va), (b, vb)) = if n1 <= n2 {
            ((n1, v1), (n2, v2))
        } else {
            ((n2, v2), (n1, v1))
        };
        let t = (level - va) / (vb - va);
        (x[a.1] + t * (x[b.1] - x[a.1]), z[a.0] + t * (z[b.0] - z[a.0]))
    };
    for iz in 0..z.len() - 1 {
        for ix in 0..x.len() - 1 {
            // Corners in cyclic order: top-left, top-right, bottom-right, bottom-left.
            let ids = [(iz, ix), (iz, ix + 1), (iz + 1, ix + 1), (iz + 1, ix)];
            let mut v = [0.0; 4];
            let mut ok = true;
            for (k, &(r, c)) in ids.iter().enumerate() {
                match node(r, c) {
                    Some(val) if val.is_finite() => v[k] = val,
                    _ => ok = false,
                }
            }
            if !ok {
                continue;
            }
            let inside = v.map(|val| val >= level);
            // Crossing on edge k (between corner k and corner k+1), if any.
            let mut edge = [None; 4];
            for k in 0..4 {
                let j = (k + 1) % 4;
                if inside[k] != inside[j] {
                    edge[k] = Some(cross(ids[k], ids[j], v[k], v[j]));
                }
            }
            let crossed: Vec<(f64, f64)> = edge.iter().flatten().copied().collect();
            let mut push = |a: (f64, f64), b: (f64, f64)| {
                // A node exactly at the level puts two crossings on it; skip the empty piece.
                if a != b {
                    segs.push((a, b));
                }
            };
            match crossed.len() {
                2 => push(crossed[0], crossed[1]),
                4 => {
                    let e = |k: usize| edge[k].unwrap_or_default();
                    let centre_inside = (v[0] + v[1] + v[2] + v[3]) / 4.0 >= level;
                    if centre_inside == inside[0] {
                        // Corners 0 and 2 connect through the centre: cut off 1 and 3.
                        push(e(0), e(1));
                        push(e(2), e(3));
                    } else {
                        // Cut off corners 0 and 2.
                        push(e(3), e(0));
                        push(e(1), e(2));
                    }
                }
                _ => {}
            }
        }
    }
    segs
}

/// Joins segments that share endpoints into polylines. A closed loop repeats its first point
/// at the end.
pub fn chain_segments(segs: &[Segment]) -> Vec<Vec<(f64, f64)>> {
    use std::collections::HashMap;
    let key = |p: (f64, f64)| (p.0.to_bits(), p.1.to_bits());
    let mut at: HashMap<(u64, u64), Vec<usize>> = HashMap::new();
    for (i, s) in segs.iter().enumerate() {
        at.entry(key(s.0)).or_default().push(i);
        at.entry(key(s.1)).or_default().push(i);
    }
    let mut used = vec![false; segs.len()];
    let mut lines = Vec::new();
    // Follows unused segments from `end`, appending their far endpoints.
    let extend = |line: &mut Vec<(f64, f64)>, used: &mut Vec<bool>| loop {
        let end = line[line.len() - 1];
        let next = at
            .get(&key(end))
            .and_then(|c| c.iter().copied().find(|&i| !used[i]));
        match next {
            Some(i) => {
                used[i] = true;
                let s = segs[i];
                line.push(if key(s.0) == key(end) { s.1 } else { s.0 });
            }
            None => break,
        }
    };
    for i in 0..segs.len() {
        if used[i] {
            continue;
        }
        used[i] = true;
        let mut line = vec![segs[i].0, segs[i].1];
        extend(&mut line, &mut used);
        line.reverse();
        extend(&mut line, &mut used);
        lines.push(line);
    }
    lines
}

/// Standard base64 (RFC 4648, section 4) with padding, for the PNG data URI of a field raster.
fn base64(bytes: &[u8]) -> String {
    use base64::Engine as _;
    base64::engine::general_purpose::STANDARD.encode(bytes)
}

/// Placeholder colour of the raster rectangle in the SVG, replaced by the embedded image.
const RASTER_PLACEHOLDER: RGBColor = RGBColor(1, 2, 3);

/// The colour raster of the plotting area, as drawn into the SVG.
struct Raster {
    left: i32,
    top: i32,
    width: u32,
    height: u32,
    rgb: Vec<u8>,
}

/// Replaces the placeholder rectangle in `svg` by an `<image>` holding `raster` as PNG.
fn embed_raster(svg: &str, raster: &Raster) -> Result<String, String> {
    let needle = "fill=\"#010203\"";
    let at = svg
        .find(needle)
        .ok_or("field raster placeholder missing from SVG")?;
    if svg[at + needle.len()..].contains(needle) {
        return Err("field raster placeholder found twice in SVG".into());
    }
    let start = svg[..at].rfind("<rect").ok_or("malformed raster placeholder")?;
    let end = at + svg[at..].find("/>").ok_or("malformed raster placeholder")? + 2;
    let png_bytes = encode_png(&raster.rgb, raster.width, raster.height)?;
    let image = format!(
        "<image x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" preserveAspectRatio=\"none\" href=\"data:image/png;base64,{}\"/>",
        raster.left,
        raster.top,
        raster.width,
        raster.height,
        base64(&png_bytes)
    );
    Ok(format!("{}{}{}", &svg[..start], image, &svg[end..]))
}

/// A validated field plot.
struct PreparedFieldPlot {
    title: String,
    x_label: String,
    z_label: String,
    colour_bar_label: String,
    x_m: Vec<f64>,
    z_m: Vec<f64>,
    values: Vec<Vec<f64>>,
    value_range: (f64, f64),
    /// (level, its chained isolines).
    isolines: Vec<(f64, Vec<Polyline>)>,
    markers: Vec<(f64, f64, String)>,
    /// Arrows `(x, z, across, down)` and the unit of their key.
    arrows: Vec<(f64, f64, f64, f64)>,
    arrow_unit: String,
    /// Filled by the SVG pass: the raster to embed.
    svg_raster: std::cell::RefCell<Option<Raster>>,
}

fn strictly_increasing_finite(v: &[f64]) -> bool {
    v.len() >= 2 && v.iter().all(|a| a.is_finite()) && v.windows(2).all(|w| w[0] < w[1])
}

fn prepare_field_plot(plot: &FieldPlot) -> Result<PreparedFieldPlot, String> {
    if !strictly_increasing_finite(&plot.x_m) {
        return Err("x_m must hold at least two finite, strictly increasing positions".into());
    }
    if !strictly_increasing_finite(&plot.z_m) {
        return Err("z_m must hold at least two finite, strictly increasing depths".into());
    }
    if plot.values.len() != plot.z_m.len() || plot.values.iter().any(|r| r.len() != plot.x_m.len()) {
        return Err(format!(
            "values must have {} rows (one per z_m) of {} values (one per x_m)",
            plot.z_m.len(),
            plot.x_m.len()
        ));
    }
    let finite = plot.values.iter().flatten().copied().filter(|v| v.is_finite());
    let (lo, hi) = finite.fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
        (lo.min(v), hi.max(v))
    });
    if !lo.is_finite() {
        return Err("values has no finite entry; give at least one".into());
    }
    let value_range = match plot.value_range {
        Some(r) => checked_range(r, "value_range")?,
        None if hi > lo => (lo, hi),
        None => (lo - 0.5, hi + 0.5),
    };
    if let Some(v) = plot.isotherms.iter().find(|v| !v.is_finite()) {
        return Err(format!("isotherm value {v} is not finite; give finite values"));
    }
    if let Some(m) = plot.markers.iter().find(|m| !m.0.is_finite() || !m.1.is_finite()) {
        return Err(format!(
            "marker '{}' is at ({}, {}); give finite coordinates",
            m.2, m.0, m.1
        ));
    }
    let isolines = plot
        .isotherms
        .iter()
        .map(|&level| {
            let segs = isoline_segments(&plot.x_m, &plot.z_m, &plot.values, level);
            (level, chain_segments(&segs))
        })
        .collect();
    Ok(PreparedFieldPlot {
        title: clean_text(&plot.title),
        x_label: clean_text(&plot.x_label),
        z_label: clean_text(&plot.z_label),
        colour_bar_label: clean_text(&plot.colour_bar_label),
        x_m: plot.x_m.clone(),
        z_m: plot.z_m.clone(),
        values: plot.values.clone(),
        value_range,
        isolines,
        markers: plot
            .markers
            .iter()
            .map(|(x, z, l)| (*x, *z, clean_text(l)))
            .collect(),
        arrows: Vec::new(),
        arrow_unit: String::new(),
        svg_raster: std::cell::RefCell::new(None),
    })
}

/// Index of the grid interval holding `v` (clamped to the grid) and the fraction within it.
fn locate(grid: &[f64], v: f64) -> (usize, f64) {
    let n = grid.len();
    let i = grid.partition_point(|&g| g <= v).clamp(1, n - 1) - 1;
    let f = ((v - grid[i]) / (grid[i + 1] - grid[i])).clamp(0.0, 1.0);
    (i, f)
}

impl PreparedFieldPlot {
    /// Bilinear interpolation of the node values; NaN if a needed corner is not finite.
    fn value_at(&self, (ix, fx): (usize, f64), (iz, fz): (usize, f64)) -> f64 {
        let v = &self.values;
        let top = v[iz][ix] + fx * (v[iz][ix + 1] - v[iz][ix]);
        let bottom = v[iz + 1][ix] + fx * (v[iz + 1][ix + 1] - v[iz + 1][ix]);
        top + fz * (bottom - top)
    }

    /// [`colour_map`] of the value scaled to the colour range, through a 1024-entry table
    /// (steps far below one byte) because the raster asks for it once per pixel.
    fn colour_of(&self, value: f64) -> (u8, u8, u8) {
        const N: usize = 1024;
        static TABLE: OnceLock<Vec<(u8, u8, u8)>> = OnceLock::new();
        let table = TABLE.get_or_init(|| (0..N).map(|k| colour_map(k as f64 / (N - 1) as f64)).collect());
        let (lo, hi) = self.value_range;
        let t = (value - lo) / (hi - lo);
        if t.is_finite() {
            table[(t.clamp(0.0, 1.0) * (N - 1) as f64).round() as usize]
        } else {
            NO_DATA_RGB
        }
    }

    /// RGB raster of the plotting area (`width` x `height` pixels).
    fn raster(&self, width: u32, height: u32) -> Vec<u8> {
        let (x0, x1) = (self.x_m[0], self.x_m[self.x_m.len() - 1]);
        let (z0, z1) = (self.z_m[0], self.z_m[self.z_m.len() - 1]);
        let cols: Vec<_> = (0..width)
            .map(|i| {
                locate(
                    &self.x_m,
                    x0 + (f64::from(i) + 0.5) / f64::from(width) * (x1 - x0),
                )
            })
            .collect();
        let mut rgb = Vec::with_capacity(width as usize * height as usize * 3);
        for j in 0..height {
            let row = locate(
                &self.z_m,
                z0 + (f64::from(j) + 0.5) / f64::from(height) * (z1 - z0),
            );
            for &col in &cols {
                let (r, g, b) = self.colour_of(self.value_at(col, row));
                rgb.extend_from_slice(&[r, g, b]);
            }
        }
        rgb
    }
}

/// Largest 1-2-5 value not above `v` (> 0).
fn nice_below(v: f64) -> f64 {
    let mag = 10f64.powf(v.log10().floor());
    [5.0, 2.0, 1.0]
        .iter()
        .map(|m| m * mag)
        .find(|s| *s <= v * (1.0 + 1e-12))
        .unwrap_or(mag)
}

/// One arrow from `tail` to `head` (pixels): a black halo under a light shaft, and a filled
/// head.
fn draw_arrow<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    tail: (f64, f64),
    head: (f64, f64),
) -> Result<(), String> {
    let light = RGBColor(ARROW_RGB.0, ARROW_RGB.1, ARROW_RGB.2);
    let (dx, dy) = (head.0 - tail.0, head.1 - tail.1);
    let len = dx.hypot(dy);
    let (ux, uy) = (dx / len, dy / len);
    let barb = (0.4 * len).clamp(3.0, 7.0);
    let base = (head.0 - barb * ux, head.1 - barb * uy);
    let side = 0.45 * barb;
    let pt = |x: f64, y: f64| (x.round() as i32, y.round() as i32);
    let shaft = vec![pt(tail.0, tail.1), pt(base.0, base.1)];
    root.draw(&PathElement::new(shaft.clone(), BLACK.mix(0.8).stroke_width(3)))
        .map_err(drawing_error)?;
    root.draw(&PathElement::new(shaft, light.stroke_width(1)))
        .map_err(drawing_error)?;
    let tip = vec![
        pt(head.0, head.1),
        pt(base.0 - side * uy, base.1 + side * ux),
        pt(base.0 + side * uy, base.1 - side * ux),
    ];
    root.draw(&Polygon::new(tip.clone(), light.filled()))
        .map_err(drawing_error)?;
    let mut outline = tip.clone();
    outline.push(tip[0]);
    root.draw(&PathElement::new(outline, BLACK.stroke_width(1)))
        .map_err(drawing_error)
}

/// An arrow's point in pixels and its components in data units.
type PixelArrow = ((i32, i32), (f64, f64));

/// Arrows centred on their points (pixels, components in data units with `down` positive
/// downward), scaled as [`ArrowLayer`] says, and the scale key in the corner `corner` of the
/// plotting area. Arrows shorter than 2 px are left out.
fn draw_arrows<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    arrows: &[PixelArrow],
    unit: &str,
    corner: (i32, i32),
    font: &TextStyle,
) -> Result<(), String> {
    let mut sizes: Vec<f64> = arrows
        .iter()
        .map(|(_, (u, w))| u.hypot(*w))
        .filter(|m| *m > 0.0)
        .collect();
    if sizes.is_empty() {
        return Ok(());
    }
    sizes.sort_by(f64::total_cmp);
    let reference = sizes[(0.9 * (sizes.len() - 1) as f64).round() as usize];
    let cap = 1.5 * reference;
    let mut spacing = f64::INFINITY;
    for (i, (a, _)) in arrows.iter().enumerate() {
        for (b, _) in &arrows[i + 1..] {
            let d = f64::from(a.0 - b.0).hypot(f64::from(a.1 - b.1));
            if d > 0.0 {
                spacing = spacing.min(d);
            }
        }
    }
    if !spacing.is_finite() {
        spacing = 40.0;
    }
    let px_per_unit = 0.9 * spacing / reference;
    let mut capped = false;
    for &((x, y), (u, w)) in arrows {
        let size = u.hypot(w);
        let shrink = if size > cap {
            capped = true;
            cap / size
        } else {
            1.0
        };
        let (vx, vy) = (u * px_per_unit * shrink, w * px_per_unit * shrink);
        if vx.hypot(vy) < 2.0 {
            continue;
        }
        let (cx, cy) = (f64::from(x), f64::from(y));
        draw_arrow(
            root,
            (cx - 0.5 * vx, cy - 0.5 * vy),
            (cx + 0.5 * vx, cy + 0.5 * vy),
        )?;
    }
    // Key: an arrow of a round value and its label on a white box.
    let key = nice_below(reference);
    let key_px = key * px_per_unit;
    let mut text = format!("{} {unit}", format_tick(key, key));
    if capped {
        text.push_str(&format!(" (capped at {})", format_tick(cap, cap)));
    }
    let (tw, th) = root.estimate_text_size(&text, font).unwrap_or((0, 0));
    let (bx, by) = (corner.0 + 6, corner.1 + 6);
    let box_w = key_px.round() as i32 + tw as i32 + 16;
    let box_h = th as i32 + 10;
    root.draw(&Rectangle::new(
        [(bx, by), (bx + box_w, by + box_h)],
        WHITE.mix(0.85).filled(),
    ))
    .map_err(drawing_error)?;
    let mid = f64::from(by + box_h / 2);
    let start = f64::from(bx + 4);
    draw_arrow(root, (start, mid), (start + key_px, mid))?;
    root.draw_text(
        &text,
        &font.pos(Pos::new(HPos::Left, VPos::Center)),
        ((start + key_px).round() as i32 + 6, by + box_h / 2),
    )
    .map_err(drawing_error)
}

/// Tick values at a 1-2-5 step giving about `target` ticks over lo..hi.
pub(crate) fn nice_ticks(lo: f64, hi: f64, target: usize) -> Vec<f64> {
    let raw = (hi - lo) / target.max(1) as f64;
    if !(raw > 0.0 && raw.is_finite()) {
        return vec![lo];
    }
    let mag = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * mag)
        .find(|s| *s >= raw)
        .unwrap_or(10.0 * mag);
    // A relative slack so that ends that are multiples of the step survive rounding.
    let first = (lo / step - 1e-9).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    (first..=last).map(|k| k as f64 * step).collect()
}

impl Drawing for PreparedFieldPlot {
    fn draw_on<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>, is_svg: bool) -> Result<(), String> {
        draw_field_plot(root, self, is_svg)
    }
}

fn draw_field_plot<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    p: &PreparedFieldPlot,
    is_svg: bool,
) -> Result<(), String> {
    let (w, h) = root.dim_in_pixel();
    let fonts = FontSizes::for_image(w, h);
    let tick_font = font(fonts.tick);
    let label_font = font(fonts.label);
    root.fill(&WHITE).map_err(drawing_error)?;

    let (x0, x1) = (p.x_m[0], p.x_m[p.x_m.len() - 1]);
    let (z0, z1) = (p.z_m[0], p.z_m[p.z_m.len() - 1]);
    let (v0, v1) = p.value_range;
    let (x_span, z_span, v_span) = (x1 - x0, z1 - z0, v1 - v0);
    let x_fmt = move |v: &f64| format_tick(*v, x_span);
    let z_fmt = move |v: &f64| format_tick(-*v, z_span);
    let margin = (0.8 * fonts.label) as u32;

    let rest = draw_title(root, &p.title, fonts.title, margin)?;

    // Colour bar column on the right.
    let bar_ticks = nice_ticks(v0, v1, 6);
    let widest_bar_tick = bar_ticks
        .iter()
        .map(|v| text_width(root, &format_tick(*v, v_span), &tick_font))
        .max()
        .unwrap_or(0);
    let bar_w = (1.2 * fonts.label) as i32;
    let bar_gap = (1.2 * fonts.label) as i32;
    let bar_col = bar_gap + bar_w + 6 + widest_bar_tick as i32 + (1.8 * fonts.label) as i32;
    let (rest_w, _) = rest.dim_in_pixel();
    let (main, _) = rest.split_horizontally((rest_w as i32 - bar_col).max(1));

    let widest_z_tick = [z0, z1]
        .iter()
        .map(|v| text_width(root, &z_fmt(&-v), &tick_font))
        .max()
        .unwrap_or(0);
    let mut chart = ChartBuilder::on(&main)
        .margin(margin)
        .set_label_area_size(
            LabelAreaPosition::Left,
            (f64::from(widest_z_tick) + 1.5 * fonts.label + 0.6 * fonts.tick + 8.0) as u32,
        )
        .set_label_area_size(
            LabelAreaPosition::Top,
            (1.2 * fonts.tick + 1.6 * fonts.label + 10.0) as u32,
        )
        .build_cartesian_2d(x0..x1, -z1..-z0)
        .map_err(drawing_error)?;
    chart
        .configure_mesh()
        .disable_mesh()
        .x_desc(p.x_label.as_str())
        .y_desc(p.z_label.as_str())
        .x_labels(8)
        .y_labels(8)
        .x_label_formatter(&x_fmt)
        .y_label_formatter(&z_fmt)
        .label_style(tick_font.clone())
        .axis_desc_style(label_font.clone())
        .axis_style(BLACK)
        .draw()
        .map_err(drawing_error)?;

    // Colour raster: a placeholder in SVG (replaced by an embedded PNG), pixels in bitmaps.
    let area = chart.plotting_area();
    let (px, py) = area.get_pixel_range();
    let (rw, rh) = (
        (px.end - px.start).max(1) as u32,
        (py.end - py.start).max(1) as u32,
    );
    let raster = p.raster(rw, rh);
    let (root_x, root_y) = root.get_base_pixel();
    if is_svg {
        root.draw(&Rectangle::new(
            [
                (px.start - root_x, py.start - root_y),
                (px.end - root_x, py.end - root_y),
            ],
            RASTER_PLACEHOLDER.filled(),
        ))
        .map_err(drawing_error)?;
        *p.svg_raster.borrow_mut() = Some(Raster {
            left: px.start,
            top: py.start,
            width: rw,
            height: rh,
            rgb: raster,
        });
    } else {
        let image = BitMapElement::with_ref((px.start - root_x, py.start - root_y), (rw, rh), &raster)
            .ok_or("field raster has the wrong size")?;
        root.draw(&image).map_err(drawing_error)?;
    }

    // Isotherms: a white halo under a dark line, then labels on white boxes.
    let halo = WHITE.mix(0.7).stroke_width(4);
    let dark = RGBColor(20, 20, 20).stroke_width(2);
    let to_internal = |pts: &[(f64, f64)]| pts.iter().map(|&(x, z)| (x, -z)).collect::<Vec<_>>();
    for (_, lines) in &p.isolines {
        for line in lines {
            area.draw(&PathElement::new(to_internal(line), halo))
                .map_err(drawing_error)?;
            area.draw(&PathElement::new(to_internal(line), dark))
                .map_err(drawing_error)?;
        }
    }
    let to_root = |x: f64, z: f64| {
        let (a, b) = chart.backend_coord(&(x, -z));
        (a - root_x, b - root_y)
    };
    let inside: Vec<_> = p
        .arrows
        .iter()
        .filter(|a| a.0 >= x0 && a.0 <= x1 && a.1 >= z0 && a.1 <= z1)
        .map(|a| (to_root(a.0, a.1), (a.2, a.3)))
        .collect();
    draw_arrows(
        root,
        &inside,
        &p.arrow_unit,
        (px.start - root_x, py.start - root_y),
        &tick_font,
    )?;

    let label_style = tick_font.pos(Pos::new(HPos::Center, VPos::Center));
    let min_len_px = 3.0 * fonts.label;
    // Labels keep away from each other and from the markers.
    let mut placed: Vec<(i32, i32)> = p
        .markers
        .iter()
        .map(|(x, z, _)| chart.backend_coord(&(*x, -*z)))
        .collect();
    for (level, lines) in &p.isolines {
        let text = format_tick(*level, v_span);
        let (tw, th) = root.estimate_text_size(&text, &tick_font).unwrap_or((0, 0));
        let (hw, hh) = (tw as i32 / 2 + 2, th as i32 / 2 + 1);
        let inner = (px.start + hw..px.end - hw, py.start + hh..py.end - hh);
        for line in lines {
            let pix: Vec<(i32, i32)> = line.iter().map(|&(x, z)| chart.backend_coord(&(x, -z))).collect();
            if let Some(at) = label_point(&pix, min_len_px, &placed, &inner) {
                placed.push(at);
                let (cx, cy) = (at.0 - root_x, at.1 - root_y);
                root.draw(&Rectangle::new(
                    [(cx - hw, cy - hh), (cx + hw, cy + hh)],
                    WHITE.mix(0.85).filled(),
                ))
                .map_err(drawing_error)?;
                root.draw_text(&text, &label_style, (cx, cy))
                    .map_err(drawing_error)?;
            }
        }
    }

    // Markers: black dot with white ring, label to the right on a white box.
    let marker_r = (0.3 * fonts.label).round().max(3.0) as i32;
    let marker_font = tick_font.pos(Pos::new(HPos::Left, VPos::Center));
    for (x, z, label) in &p.markers {
        if *x < x0 || *x > x1 || *z < z0 || *z > z1 {
            continue;
        }
        let (mx, my) = chart.backend_coord(&(*x, -*z));
        let (mx, my) = (mx - root_x, my - root_y);
        root.draw(&Circle::new((mx, my), marker_r + 2, WHITE.filled()))
            .map_err(drawing_error)?;
        root.draw(&Circle::new((mx, my), marker_r, BLACK.filled()))
            .map_err(drawing_error)?;
        if !label.trim().is_empty() {
            let (tw, th) = root.estimate_text_size(label, &tick_font).unwrap_or((0, 0));
            let lx = mx + marker_r + 5;
            root.draw(&Rectangle::new(
                [
                    (lx - 2, my - th as i32 / 2 - 1),
                    (lx + tw as i32 + 2, my + th as i32 / 2 + 1),
                ],
                WHITE.mix(0.85).filled(),
            ))
            .map_err(drawing_error)?;
            root.draw_text(label, &marker_font, (lx, my))
                .map_err(drawing_error)?;
        }
    }

    // Frame.
    root.draw(&Rectangle::new(
        [
            (px.start - root_x, py.start - root_y),
            (px.end - root_x - 1, py.end - root_y - 1),
        ],
        BLACK.stroke_width(1),
    ))
    .map_err(drawing_error)?;

    // Colour bar: strips from low (bottom) to high (top), aligned with the plotting area.
    let bx0 = px.end - root_x + bar_gap;
    let (by0, by1) = (py.start - root_y, py.end - root_y);
    let strips = 96;
    for k in 0..strips {
        let t0 = f64::from(k) / f64::from(strips);
        let t1 = f64::from(k + 1) / f64::from(strips);
        let ya = by1 - (t0 * f64::from(by1 - by0)).round() as i32;
        let yb = by1 - (t1 * f64::from(by1 - by0)).round() as i32;
        let (r, g, b) = colour_map(0.5 * (t0 + t1));
        root.draw(&Rectangle::new(
            [(bx0, yb), (bx0 + bar_w, ya)],
            RGBColor(r, g, b).filled(),
        ))
        .map_err(drawing_error)?;
    }
    root.draw(&Rectangle::new(
        [(bx0, by0), (bx0 + bar_w, by1)],
        BLACK.stroke_width(1),
    ))
    .map_err(drawing_error)?;
    let tick_style = tick_font.pos(Pos::new(HPos::Left, VPos::Center));
    let to_bar_y = |v: f64| by1 - ((v - v0) / v_span * f64::from(by1 - by0)).round() as i32;
    for v in &bar_ticks {
        let y = to_bar_y(*v);
        root.draw(&PathElement::new(
            vec![(bx0 + bar_w, y), (bx0 + bar_w + 4, y)],
            BLACK,
        ))
        .map_err(drawing_error)?;
        root.draw_text(&format_tick(*v, v_span), &tick_style, (bx0 + bar_w + 6, y))
            .map_err(drawing_error)?;
    }
    for level in p.isolines.iter().map(|l| l.0).filter(|l| *l >= v0 && *l <= v1) {
        let y = to_bar_y(level);
        root.draw(&PathElement::new(vec![(bx0, y), (bx0 + bar_w, y)], dark))
            .map_err(drawing_error)?;
    }
    let label_x = bx0 + bar_w + 6 + widest_bar_tick as i32 + (0.9 * fonts.label) as i32;
    root.draw_text(
        &p.colour_bar_label,
        &label_font
            .transform(FontTransform::Rotate270)
            .pos(Pos::new(HPos::Center, VPos::Center)),
        (label_x, (by0 + by1) / 2),
    )
    .map_err(drawing_error)?;
    Ok(())
}

/// Where to label an isoline drawn through pixel points `pix`: of the points at 5 %, 15 %, ...,
/// 95 % of its length that lie in `inner`, the one farthest from the labels already `placed`.
/// None for lines shorter than `min_len` pixels or with no candidate inside.
fn label_point(
    pix: &[(i32, i32)],
    min_len: f64,
    placed: &[(i32, i32)],
    inner: &(std::ops::Range<i32>, std::ops::Range<i32>),
) -> Option<(i32, i32)> {
    let seg_len = |a: (i32, i32), b: (i32, i32)| f64::from(b.0 - a.0).hypot(f64::from(b.1 - a.1));
    let total: f64 = pix.windows(2).map(|w| seg_len(w[0], w[1])).sum();
    if total < min_len {
        return None;
    }
    let point_at = |mut left: f64| {
        for w in pix.windows(2) {
            let l = seg_len(w[0], w[1]);
            if l >= left && l > 0.0 {
                let t = left / l;
                return Some((
                    w[0].0 + (t * f64::from(w[1].0 - w[0].0)).round() as i32,
                    w[0].1 + (t * f64::from(w[1].1 - w[0].1)).round() as i32,
                ));
            }
            left -= l;
        }
        None
    };
    let clearance = |q: (i32, i32)| {
        placed
            .iter()
            .map(|&r| seg_len(q, r))
            .fold(f64::INFINITY, f64::min)
    };
    (0..10)
        .filter_map(|k| point_at((0.05 + 0.1 * f64::from(k)) * total))
        .filter(|q| inner.0.contains(&q.0) && inner.1.contains(&q.1))
        .max_by(|a, b| clearance(*a).total_cmp(&clearance(*b)))
}

/// Isotherms at round steps giving about eight lines over the range.
pub fn isotherm_levels(lo: f64, hi: f64) -> Vec<f64> {
    let span = (hi - lo).max(1e-9);
    let step = [0.5, 1.0, 2.0, 2.5, 5.0, 10.0, 20.0]
        .into_iter()
        .find(|s| span / s <= 9.0)
        .unwrap_or(20.0);
    let first = (lo / step).ceil() * step;
    (0..40)
        .map(|i| first + i as f64 * step)
        .take_while(|v| *v < hi)
        .collect()
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

    /// Test vectors of RFC 4648, section 10.
    #[test]
    fn base64_matches_rfc4648_vectors() {
        for (input, expected) in [
            ("", ""),
            ("f", "Zg=="),
            ("fo", "Zm8="),
            ("foo", "Zm9v"),
            ("foob", "Zm9vYg=="),
            ("fooba", "Zm9vYmE="),
            ("foobar", "Zm9vYmFy"),
        ] {
            assert_eq!(base64(input.as_bytes()), expected);
        }
    }

    #[test]
    fn nice_ticks_use_one_two_five_steps() {
        assert_eq!(nice_ticks(0.0, 10.0, 5), vec![0.0, 2.0, 4.0, 6.0, 8.0, 10.0]);
        assert_eq!(nice_ticks(6.0, 36.0, 6), vec![10.0, 15.0, 20.0, 25.0, 30.0, 35.0]);
        let t = nice_ticks(-0.3, 0.3, 6);
        let expected = [-0.3, -0.2, -0.1, 0.0, 0.1, 0.2, 0.3];
        assert_eq!(t.len(), expected.len(), "{t:?}");
        assert!(t.iter().zip(expected).all(|(a, b)| (a - b).abs() < 1e-12));
    }

    #[test]
    fn automatic_range_pads_five_percent_each_side() {
        assert_eq!(auto_range([0.0, 10.0, 4.0].into_iter()), (-0.5, 10.5));
        assert_eq!(auto_range([2.0].into_iter()), (1.8, 2.2));
        assert_eq!(auto_range([0.0].into_iter()), (-1.0, 1.0));
        assert_eq!(auto_range(std::iter::empty()), (0.0, 1.0));
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
