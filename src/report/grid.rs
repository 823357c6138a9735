//! Calendar grids: one cell per month (across) and year (down), coloured on burrow's diverging
//! scale between the cold and the warm side, with marks on the cells that need attention and a
//! colour bar. Drawn with the bundled font on the same SVG and PNG backends as the other plots.

use super::plot::{
    Drawing, FontSizes, Rendered, check_size, clean_text, draw_title, drawing_error, ensure_font, font,
    format_tick, nice_ticks, render_both, side_colour, text_width,
};
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

/// A mark drawn on a cell.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Mark {
    /// A limit is passed in this cell (a bold cross).
    Beyond,
    /// The cell comes close to a limit (a small ring).
    Near,
}

/// A month-by-year grid.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct CalendarGrid {
    pub title: String,
    /// Label of the colour bar, e.g. "mean fluid temperature (°C)".
    pub colour_bar_label: String,
    /// `values[year][month]`, twelve months a year; a non-finite value is drawn grey.
    pub values: Vec<[f64; 12]>,
    /// `marks[year][month]`, same shape as `values` (or empty for none).
    pub marks: Vec<[Option<Mark>; 12]>,
    /// The value at the cold end and at the warm end of the colour scale.
    pub value_range: (f64, f64),
    /// The value drawn in the pale middle of the scale (e.g. the undisturbed ground
    /// temperature: colder cells take heat from the ground, warmer ones give it back); it must
    /// lie inside `value_range`.
    pub centre: f64,
    /// What each mark means, for the key under the grid (empty: no key entry).
    pub beyond_key: String,
    pub near_key: String,
}

const MONTH_INITIALS: [&str; 12] = ["J", "F", "M", "A", "M", "J", "J", "A", "S", "O", "N", "D"];

/// Renders `grid` at `width_px` x `height_px` pixels as SVG and PNG.
pub fn render_calendar_grid(grid: &CalendarGrid, width_px: u32, height_px: u32) -> Result<Rendered, String> {
    check_size(width_px, height_px)?;
    ensure_font()?;
    if grid.values.is_empty() || grid.values.len() > 200 {
        return Err(format!(
            "a calendar grid needs 1 to 200 years, not {}",
            grid.values.len()
        ));
    }
    let (lo, hi) = grid.value_range;
    if !(lo.is_finite() && hi.is_finite() && lo < hi) {
        return Err(format!(
            "the colour range {lo}..{hi} of a calendar grid is not a range"
        ));
    }
    if !(grid.centre > lo && grid.centre < hi) {
        return Err(format!(
            "the centre {} of a calendar grid's colours lies outside {lo}..{hi}",
            grid.centre
        ));
    }
    if !grid.marks.is_empty() && grid.marks.len() != grid.values.len() {
        return Err("a calendar grid's marks do not match its values".into());
    }
    render_both(width_px, height_px, &Prepared(grid.clone()))
}

struct Prepared(CalendarGrid);

impl Drawing for Prepared {
    fn draw_on<DB: DrawingBackend>(
        &self,
        root: &DrawingArea<DB, Shift>,
        _is_svg: bool,
    ) -> Result<(), String> {
        draw(root, &self.0)
    }
}

fn draw<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, g: &CalendarGrid) -> Result<(), String> {
    let (w, h) = root.dim_in_pixel();
    let fonts = FontSizes::for_image(w, h);
    let tick = font(fonts.tick);
    let label = font(fonts.label);
    root.fill(&WHITE).map_err(drawing_error)?;
    let margin = (0.8 * fonts.label) as u32;
    let rest = draw_title(root, &clean_text(&g.title), fonts.title, margin)?;
    let (rw, rh) = rest.dim_in_pixel();
    let (rx, ry) = rest.get_base_pixel();
    let (bx, by) = root.get_base_pixel();
    let (ox, oy) = (rx - bx, ry - by);

    let years = g.values.len();
    let (lo, hi) = g.value_range;
    let centre = g.centre;
    // Piecewise linear: lo → 0, centre → ½, hi → 1.
    let scale = |v: f64| {
        if v <= centre {
            0.5 * (v - lo) / (centre - lo)
        } else {
            0.5 + 0.5 * (v - centre) / (hi - centre)
        }
    };
    let bar_ticks = nice_ticks(lo, hi, 6);
    let widest_bar_tick = bar_ticks
        .iter()
        .map(|v| text_width(root, &format_tick(*v, hi - lo), &tick))
        .max()
        .unwrap_or(0) as i32;
    let year_label = |y: usize| format!("year {}", y + 1);
    let widest_year = text_width(root, &year_label(years - 1), &tick) as i32;
    let line = (1.3 * fonts.label) as i32;
    let key_rows = i32::from(!g.beyond_key.is_empty()) + i32::from(!g.near_key.is_empty());

    // Layout: year labels | grid | gap | colour bar, ticks and its label; month initials above;
    // the key below.
    let left = ox + margin as i32 + widest_year + 8;
    let top = oy + margin as i32 + line;
    let bar_w = (1.1 * fonts.label) as i32;
    let bar_col = (1.5 * fonts.label) as i32 + bar_w + 6 + widest_bar_tick + line;
    let right = ox + rw as i32 - margin as i32 - bar_col;
    let bottom = oy + rh as i32 - margin as i32 - key_rows * line - if key_rows > 0 { line / 2 } else { 0 };
    if right - left < 24 || bottom - top < years as i32 {
        return Err("the calendar grid does not fit its image; make the image larger".into());
    }
    let cell_w = f64::from(right - left) / 12.0;
    let cell_h = f64::from(bottom - top) / years as f64;
    let x_at = |m: usize| left + (m as f64 * cell_w).round() as i32;
    let y_at = |y: usize| top + (y as f64 * cell_h).round() as i32;

    for (y, row) in g.values.iter().enumerate() {
        for (m, v) in row.iter().enumerate() {
            let (r, gr, b) = side_colour(scale(*v));
            root.draw(&Rectangle::new(
                [(x_at(m), y_at(y)), (x_at(m + 1), y_at(y + 1))],
                RGBColor(r, gr, b).filled(),
            ))
            .map_err(drawing_error)?;
        }
    }
    // Thin white rules between years and months keep the cells apart when printed.
    let rule = WHITE.stroke_width(1);
    for m in 1..12 {
        root.draw(&PathElement::new(vec![(x_at(m), top), (x_at(m), bottom)], rule))
            .map_err(drawing_error)?;
    }
    if cell_h >= 4.0 {
        for y in 1..years {
            root.draw(&PathElement::new(vec![(left, y_at(y)), (right, y_at(y))], rule))
                .map_err(drawing_error)?;
        }
    }
    root.draw(&Rectangle::new(
        [(left, top), (right, bottom)],
        BLACK.stroke_width(1),
    ))
    .map_err(drawing_error)?;

    // Marks, sized to the cell.
    let size = (cell_w.min(cell_h) * 0.3).clamp(3.0, 9.0) as i32;
    for (y, row) in g.marks.iter().enumerate() {
        for (m, mark) in row.iter().enumerate() {
            let c = ((x_at(m) + x_at(m + 1)) / 2, (y_at(y) + y_at(y + 1)) / 2);
            match mark {
                Some(Mark::Beyond) => draw_cross(root, c, size)?,
                Some(Mark::Near) => draw_ring(root, c, size)?,
                None => {}
            }
        }
    }

    // Month initials above, year labels on the left (every year while they fit, else every
    // fifth and the last).
    for (m, name) in MONTH_INITIALS.iter().enumerate() {
        root.draw_text(
            name,
            &tick.pos(Pos::new(HPos::Center, VPos::Bottom)),
            ((x_at(m) + x_at(m + 1)) / 2, top - 4),
        )
        .map_err(drawing_error)?;
    }
    let every = if cell_h >= 1.2 * fonts.tick { 1 } else { 5 };
    for y in 0..years {
        if y % every == every - 1 || y == 0 || y == years - 1 {
            if every > 1 && y == years - 2 {
                continue;
            }
            root.draw_text(
                &year_label(y),
                &tick.pos(Pos::new(HPos::Right, VPos::Center)),
                (left - 6, (y_at(y) + y_at(y + 1)) / 2),
            )
            .map_err(drawing_error)?;
        }
    }

    // Colour bar.
    let bar_left = right + (1.5 * fonts.label) as i32;
    let steps = (bottom - top).max(1);
    for k in 0..steps {
        let t = 1.0 - f64::from(k) / f64::from(steps);
        let (r, gr, b) = side_colour(t);
        root.draw(&Rectangle::new(
            [(bar_left, top + k), (bar_left + bar_w, top + k + 1)],
            RGBColor(r, gr, b).filled(),
        ))
        .map_err(drawing_error)?;
    }
    root.draw(&Rectangle::new(
        [(bar_left, top), (bar_left + bar_w, bottom)],
        BLACK.stroke_width(1),
    ))
    .map_err(drawing_error)?;
    for v in &bar_ticks {
        let yy = bottom - (scale(*v) * f64::from(bottom - top)).round() as i32;
        root.draw(&PathElement::new(
            vec![(bar_left + bar_w, yy), (bar_left + bar_w + 4, yy)],
            BLACK,
        ))
        .map_err(drawing_error)?;
        root.draw_text(
            &format_tick(*v, hi - lo),
            &tick.pos(Pos::new(HPos::Left, VPos::Center)),
            (bar_left + bar_w + 6, yy),
        )
        .map_err(drawing_error)?;
    }
    let bar_label_x = bar_left + bar_w + 6 + widest_bar_tick + line / 2 + 4;
    root.draw_text(
        &clean_text(&g.colour_bar_label),
        &label
            .transform(FontTransform::Rotate90)
            .pos(Pos::new(HPos::Center, VPos::Center)),
        (bar_label_x, (top + bottom) / 2),
    )
    .map_err(drawing_error)?;

    // The key of the marks, under the grid.
    let mut ky = bottom + line / 2 + line / 2;
    for (text, mark) in [(&g.beyond_key, Mark::Beyond), (&g.near_key, Mark::Near)] {
        if text.is_empty() {
            continue;
        }
        let c = (left + size, ky);
        match mark {
            Mark::Beyond => draw_cross(root, c, size)?,
            Mark::Near => draw_ring(root, c, size)?,
        }
        root.draw_text(
            &clean_text(text),
            &tick.pos(Pos::new(HPos::Left, VPos::Center)),
            (left + 2 * size + 8, ky),
        )
        .map_err(drawing_error)?;
        ky += line;
    }
    Ok(())
}

/// A bold black cross on a white halo.
fn draw_cross<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    (x, y): (i32, i32),
    s: i32,
) -> Result<(), String> {
    for (style, grow) in [(WHITE.stroke_width(5), 1), (BLACK.stroke_width(2), 0)] {
        let s = s + grow;
        root.draw(&PathElement::new(vec![(x - s, y - s), (x + s, y + s)], style))
            .map_err(drawing_error)?;
        root.draw(&PathElement::new(vec![(x - s, y + s), (x + s, y - s)], style))
            .map_err(drawing_error)?;
    }
    Ok(())
}

/// A small black ring on a white halo.
fn draw_ring<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    (x, y): (i32, i32),
    s: i32,
) -> Result<(), String> {
    let r = s.max(3);
    root.draw(&Circle::new((x, y), r as u32, WHITE.stroke_width(4)))
        .map_err(drawing_error)?;
    root.draw(&Circle::new((x, y), r as u32, BLACK.stroke_width(2)))
        .map_err(drawing_error)?;
    Ok(())
}
