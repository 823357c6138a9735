//! Rendering time of the report plots (run: cargo bench --bench plot).
use burrow::report::plot::{
    Band, FieldPlot, LinePlot, Series, SeriesStyle, render_field_plot, render_line_plot,
};
use std::time::Instant;

fn line_plot() -> LinePlot {
    let depths: Vec<f64> = (0..=200).map(|i| f64::from(i) * 0.02).collect();
    let series = (0..4)
        .map(|k| Series {
            name: format!("series {k}"),
            points: depths
                .iter()
                .map(|&z| (8.0 + 10.0 * (-z / 2.5).exp() * (f64::from(k) - z / 2.5).cos(), z))
                .collect(),
            style: [
                SeriesStyle::Line,
                SeriesStyle::Dashed,
                SeriesStyle::Dotted,
                SeriesStyle::LineMarkers,
            ][k as usize],
            colour: k as usize,
        })
        .collect();
    LinePlot {
        title: "Benchmark".into(),
        x_label: "Temperature (°C)".into(),
        y_label: "Depth (m)".into(),
        series,
        bands: vec![Band {
            name: "range".into(),
            lower: depths
                .iter()
                .map(|&z| (8.0 - 10.0 * (-z / 2.5).exp(), z))
                .collect(),
            upper: depths
                .iter()
                .map(|&z| (8.0 + 10.0 * (-z / 2.5).exp(), z))
                .collect(),
            colour: 5,
        }],
        y_down: true,
        hlines: vec![(1.2, "limit".into())],
        ..LinePlot::default()
    }
}

fn field_plot() -> FieldPlot {
    let x_m: Vec<f64> = (0..=120).map(|i| -3.0 + 0.05 * f64::from(i)).collect();
    let z_m: Vec<f64> = (0..=80).map(|i| 0.05 * f64::from(i)).collect();
    let values = z_m
        .iter()
        .map(|&z| {
            x_m.iter()
                .map(|&x| 6.0 + 0.5 * z + 30.0 * (-(x * x + (z - 1.2) * (z - 1.2)) / 0.3).exp())
                .collect()
        })
        .collect();
    FieldPlot {
        title: "Benchmark".into(),
        x_label: "x (m)".into(),
        z_label: "Depth (m)".into(),
        colour_bar_label: "Temperature (°C)".into(),
        x_m,
        z_m,
        values,
        isotherms: vec![7.0, 10.0, 15.0, 20.0, 30.0],
        markers: vec![(0.0, 1.2, "pipe".into())],
        ..FieldPlot::default()
    }
}

fn time<F: FnMut()>(name: &str, runs: u32, mut f: F) {
    f(); // warm-up (font registration)
    let t = Instant::now();
    for _ in 0..runs {
        f();
    }
    println!(
        "{name}: {:.2} ms per render",
        t.elapsed().as_secs_f64() * 1e3 / f64::from(runs)
    );
}

fn main() {
    let lp = line_plot();
    let fp = field_plot();
    time("line plot 900x600 (SVG + PNG)", 20, || {
        render_line_plot(&lp, 900, 600).unwrap();
    });
    time("field plot 900x600 (SVG + PNG)", 20, || {
        render_field_plot(&fp, 900, 600).unwrap();
    });
}
