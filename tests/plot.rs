//! Checks of the report plot renderer: encodings, text, escaping, orientation, ranges, errors.
//!
//! No physics here: the references are the PNG specification (signature, IHDR), XML
//! well-formedness (parsed with roxmltree), and pixel colours of the rendered image.

use burrow::report::plot::{Band, LinePlot, Series, SeriesStyle, palette, render_line_plot};

const W: u32 = 640;
const H: u32 = 420;

/// Decoded 8-bit RGB image.
struct Image {
    width: u32,
    height: u32,
    rgb: Vec<u8>,
}

impl Image {
    fn pixel(&self, x: u32, y: u32) -> (u8, u8, u8) {
        let i = 3 * (y as usize * self.width as usize + x as usize);
        (self.rgb[i], self.rgb[i + 1], self.rgb[i + 2])
    }

    /// Pixels exactly equal to `c`, as (x, y).
    fn pixels_of(&self, c: (u8, u8, u8)) -> Vec<(u32, u32)> {
        let mut out = Vec::new();
        for y in 0..self.height {
            for x in 0..self.width {
                if self.pixel(x, y) == c {
                    out.push((x, y));
                }
            }
        }
        out
    }
}

fn decode_png(bytes: &[u8]) -> Image {
    let decoder = png::Decoder::new(bytes);
    let mut reader = decoder.read_info().expect("PNG header decodes");
    let mut buf = vec![0; reader.output_buffer_size()];
    let info = reader.next_frame(&mut buf).expect("PNG frame decodes");
    assert_eq!(info.color_type, png::ColorType::Rgb);
    assert_eq!(info.bit_depth, png::BitDepth::Eight);
    buf.truncate(info.buffer_size());
    Image {
        width: info.width,
        height: info.height,
        rgb: buf,
    }
}

fn line(name: &str, points: Vec<(f64, f64)>, style: SeriesStyle, colour: usize) -> Series {
    Series {
        name: name.to_string(),
        points,
        style,
        colour,
    }
}

fn simple_plot(title: &str) -> LinePlot {
    LinePlot {
        title: title.to_string(),
        x_label: "Time (d)".into(),
        y_label: "Temperature (°C)".into(),
        series: vec![line(
            "inlet",
            (0..50)
                .map(|i| (f64::from(i), (f64::from(i) / 8.0).sin()))
                .collect(),
            SeriesStyle::Line,
            0,
        )],
        ..LinePlot::default()
    }
}

/// All text content of <text> elements, trimmed.
fn svg_texts(svg: &str) -> Vec<String> {
    let doc = roxmltree::Document::parse(svg).expect("SVG is well-formed XML");
    doc.descendants()
        .filter(|n| n.has_tag_name("text"))
        .map(|n| n.text().unwrap_or("").trim().to_string())
        .collect()
}

#[test]
fn png_has_signature_and_requested_size() {
    let out = render_line_plot(&simple_plot("t"), W, H).unwrap();
    // PNG specification, section 5.2: the eight signature bytes.
    assert_eq!(&out.png[..8], &[0x89, b'P', b'N', b'G', 0x0D, 0x0A, 0x1A, 0x0A]);
    // IHDR is the first chunk; width and height are big-endian u32 at bytes 16..24.
    assert_eq!(&out.png[12..16], b"IHDR");
    assert_eq!(u32::from_be_bytes(out.png[16..20].try_into().unwrap()), W);
    assert_eq!(u32::from_be_bytes(out.png[20..24].try_into().unwrap()), H);
    let img = decode_png(&out.png);
    assert_eq!((img.width, img.height), (W, H));
}

#[test]
fn svg_root_has_requested_size() {
    let out = render_line_plot(&simple_plot("t"), W, H).unwrap();
    let doc = roxmltree::Document::parse(&out.svg).unwrap();
    let root = doc.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    assert_eq!(root.attribute("width"), Some("640"));
    assert_eq!(root.attribute("height"), Some("420"));
}

/// Two titles of different text give the same layout, so the PNGs can differ only where glyphs
/// are drawn. If the bundled font were not rasterised (or no font were found) they would be
/// identical.
#[test]
fn title_glyphs_are_rasterised_from_the_bundled_font() {
    let a = decode_png(
        &render_line_plot(&simple_plot("Ground temperature"), W, H)
            .unwrap()
            .png,
    );
    let b = decode_png(
        &render_line_plot(&simple_plot("Pipe wall heat flux"), W, H)
            .unwrap()
            .png,
    );
    let mut differing = Vec::new();
    for y in 0..H {
        for x in 0..W {
            if a.pixel(x, y) != b.pixel(x, y) {
                differing.push((x, y));
            }
        }
    }
    assert!(
        differing.len() > 150,
        "only {} pixels differ between two titles",
        differing.len()
    );
    // All of them in the title band at the top (the title is about 20 px tall here).
    let lowest = differing.iter().map(|p| p.1).max().unwrap();
    assert!(lowest < H / 8, "title pixels reach down to row {lowest}");
    // And the title is dark text on white: some pixels are near black.
    let darkest = differing
        .iter()
        .map(|&(x, y)| {
            let (r, g, b) = a.pixel(x, y);
            u32::from(r) + u32::from(g) + u32::from(b)
        })
        .min()
        .unwrap();
    assert!(darkest < 100);
}

#[test]
fn markup_in_user_text_is_escaped_into_well_formed_svg() {
    let nasty = r#"<script>alert("x")</script> & 'q' </svg>"#;
    let mut plot = simple_plot(nasty);
    plot.x_label = format!("x {nasty}");
    plot.y_label = format!("y {nasty}");
    plot.series[0].name = format!("s {nasty}");
    plot.hlines = vec![(0.5, format!("h {nasty}"))];
    plot.vlines = vec![(10.0, format!("v {nasty}"))];
    plot.bands = vec![Band {
        name: format!("b {nasty}"),
        lower: vec![(0.0, -0.5), (40.0, -0.5)],
        upper: vec![(0.0, 0.5), (40.0, 0.5)],
        colour: 2,
    }];
    let out = render_line_plot(&plot, W, H).unwrap();
    assert!(!out.svg.contains("<script"));
    let texts = svg_texts(&out.svg);
    for expected in [
        nasty.to_string(),
        format!("x {nasty}"),
        format!("y {nasty}"),
        format!("s {nasty}"),
        format!("h {nasty}"),
        format!("v {nasty}"),
        format!("b {nasty}"),
    ] {
        assert!(
            texts.contains(&expected),
            "text {expected:?} missing from {texts:?}"
        );
    }
    // No element other than the drawing primitives was injected.
    let doc = roxmltree::Document::parse(&out.svg).unwrap();
    for n in doc.descendants().filter(|n| n.is_element()) {
        let tag = n.tag_name().name();
        assert!(
            [
                "svg", "text", "rect", "polyline", "polygon", "circle", "line", "path"
            ]
            .contains(&tag),
            "unexpected element <{tag}>"
        );
    }
}

#[test]
fn control_characters_in_text_do_not_break_the_svg() {
    let plot = simple_plot("bell\u{7} nul\u{0} esc\u{1b} tab\t end");
    let out = render_line_plot(&plot, W, H).unwrap();
    let texts = svg_texts(&out.svg);
    assert!(texts.iter().any(|t| t.starts_with("bell") && t.ends_with("end")));
}

#[test]
fn svg_references_no_external_resource() {
    let mut plot = simple_plot("Title");
    plot.bands = vec![Band {
        name: "range".into(),
        lower: vec![(0.0, -1.0), (49.0, -1.0)],
        upper: vec![(0.0, 1.0), (49.0, 1.0)],
        colour: 1,
    }];
    let out = render_line_plot(&plot, W, H).unwrap();
    let without_ns = out.svg.replace("http://www.w3.org/2000/svg", "");
    for forbidden in ["http", "url(", "href", "@font-face", "@import", "<image", "src="] {
        assert!(!without_ns.contains(forbidden), "SVG contains {forbidden:?}");
    }
}

#[test]
fn axis_labels_and_legend_names_appear_as_given() {
    let mut plot = simple_plot("Profile");
    plot.series.push(line(
        "outlet",
        vec![(0.0, 0.2), (49.0, 0.4)],
        SeriesStyle::Dashed,
        1,
    ));
    plot.series
        .push(line("", vec![(0.0, 0.0), (49.0, 0.1)], SeriesStyle::Dotted, 2));
    let texts = svg_texts(&render_line_plot(&plot, W, H).unwrap().svg);
    for t in ["Profile", "Time (d)", "Temperature (°C)", "inlet", "outlet"] {
        assert!(texts.iter().any(|x| x == t), "{t:?} missing from {texts:?}");
    }
    // The unnamed series gets no legend entry (no empty text element).
    assert!(!texts.iter().any(|x| x.is_empty()));
}

/// Y pixel row of the centre of the markers of palette colour `colour`.
fn marker_row(img: &Image, colour: usize) -> f64 {
    let px = img.pixels_of(palette()[colour]);
    assert!(!px.is_empty(), "no pixel of palette colour {colour}");
    px.iter().map(|p| f64::from(p.1)).sum::<f64>() / px.len() as f64
}

fn two_depth_markers(y_down: bool) -> LinePlot {
    LinePlot {
        x_label: "Temperature (°C)".into(),
        y_label: "Depth (m)".into(),
        series: vec![
            line("", vec![(5.0, 1.0)], SeriesStyle::Markers, 0),
            line("", vec![(5.0, 3.0)], SeriesStyle::Markers, 1),
        ],
        y_down,
        ..LinePlot::default()
    }
}

#[test]
fn depth_axis_grows_downward_when_y_down() {
    let img = decode_png(&render_line_plot(&two_depth_markers(true), W, H).unwrap().png);
    let shallow = marker_row(&img, 0);
    let deep = marker_row(&img, 1);
    assert!(deep > shallow + 100.0, "deep {deep} not below shallow {shallow}");
}

#[test]
fn y_axis_grows_upward_by_default() {
    let img = decode_png(&render_line_plot(&two_depth_markers(false), W, H).unwrap().png);
    let low = marker_row(&img, 0);
    let high = marker_row(&img, 1);
    assert!(high + 100.0 < low, "y=3 at row {high} not above y=1 at row {low}");
}

#[test]
fn depth_tick_labels_are_positive_depths() {
    let mut plot = two_depth_markers(true);
    plot.y_range = Some((0.0, 4.0));
    let texts = svg_texts(&render_line_plot(&plot, W, H).unwrap().svg);
    for t in ["0", "1", "2", "3", "4"] {
        assert!(texts.iter().any(|x| x == t), "tick {t} missing from {texts:?}");
    }
    assert!(!texts.iter().any(|x| x.starts_with('-')), "{texts:?}");
}

/// Markers at the far corners of the data stay inside an automatic range (padding), while an
/// explicit range that excludes one clips it away.
#[test]
fn automatic_range_keeps_extreme_points_and_explicit_range_clips() {
    let mut plot = LinePlot {
        series: vec![
            line("", vec![(-3.0, 100.0)], SeriesStyle::Markers, 0),
            line("", vec![(7.0, 250.0)], SeriesStyle::Markers, 1),
        ],
        ..LinePlot::default()
    };
    let img = decode_png(&render_line_plot(&plot, W, H).unwrap().png);
    let a = img.pixels_of(palette()[0]).len();
    let b = img.pixels_of(palette()[1]).len();
    assert!(a > 10 && b > 10, "marker pixels {a}, {b}");
    plot.x_range = Some((-10.0, 5.0));
    plot.y_range = Some((0.0, 300.0));
    let img = decode_png(&render_line_plot(&plot, W, H).unwrap().png);
    assert!(img.pixels_of(palette()[0]).len() > 10);
    assert_eq!(img.pixels_of(palette()[1]).len(), 0, "x=7 must be clipped");
}

#[test]
fn lines_leaving_an_explicit_range_are_clipped_at_the_frame() {
    // A steep line that would otherwise run up through the title area.
    let plot = LinePlot {
        series: vec![line("", vec![(0.0, 0.0), (1.0, 10.0)], SeriesStyle::Line, 0)],
        x_range: Some((0.0, 1.0)),
        y_range: Some((0.0, 1.0)),
        ..LinePlot::default()
    };
    let img = decode_png(&render_line_plot(&plot, W, H).unwrap().png);
    let px = img.pixels_of(palette()[0]);
    assert!(!px.is_empty());
    // The line enters at the bottom left and leaves through the top at x = 0.1, so it only
    // occupies the left tenth or so of the plotting area.
    let xs: Vec<u32> = px.iter().map(|p| p.0).collect();
    let (xmin, xmax) = (*xs.iter().min().unwrap(), *xs.iter().max().unwrap());
    assert!(xmax - xmin < W / 8, "line spans x {xmin}..{xmax}");
}

#[test]
fn non_finite_points_are_skipped() {
    let mut plot = simple_plot("gaps");
    plot.series[0].points[10] = (f64::NAN, 0.0);
    plot.series[0].points[20] = (3.0, f64::INFINITY);
    plot.series.push(line(
        "mostly nan",
        vec![(f64::NAN, f64::NAN), (1.0, 0.5), (f64::NEG_INFINITY, 2.0)],
        SeriesStyle::Line,
        1,
    ));
    let out = render_line_plot(&plot, W, H).unwrap();
    assert!(!out.svg.contains("NaN") && !out.svg.contains("inf"));
    // The lone finite point of the second series is still shown (as a marker).
    let img = decode_png(&out.png);
    assert!(img.pixels_of(palette()[1]).len() > 10);
}

#[test]
fn series_without_finite_points_is_an_error_naming_it() {
    let mut plot = simple_plot("t");
    plot.series.push(line(
        "broken sensor",
        vec![(f64::NAN, 1.0), (2.0, f64::NAN)],
        SeriesStyle::Line,
        1,
    ));
    let e = render_line_plot(&plot, W, H).unwrap_err();
    assert!(e.contains("broken sensor"), "{e}");
}

#[test]
fn bad_inputs_are_errors_not_panics() {
    let mut p = simple_plot("t");
    p.x_range = Some((5.0, 5.0));
    assert!(render_line_plot(&p, W, H).unwrap_err().contains("x_range"));
    let mut p = simple_plot("t");
    p.y_range = Some((0.0, f64::NAN));
    assert!(render_line_plot(&p, W, H).unwrap_err().contains("y_range"));
    let mut p = simple_plot("t");
    p.hlines = vec![(f64::INFINITY, "limit".into())];
    assert!(render_line_plot(&p, W, H).unwrap_err().contains("limit"));
    let mut p = simple_plot("t");
    p.bands = vec![Band {
        name: "empty band".into(),
        lower: vec![],
        upper: vec![(0.0, 1.0)],
        colour: 0,
    }];
    assert!(render_line_plot(&p, W, H).unwrap_err().contains("empty band"));
    assert!(render_line_plot(&simple_plot("t"), 10, H).is_err());
    assert!(render_line_plot(&simple_plot("t"), W, 100_000).is_err());
}

#[test]
fn empty_plot_with_no_series_renders() {
    let out = render_line_plot(&LinePlot::default(), W, H).unwrap();
    assert_eq!(decode_png(&out.png).width, W);
}

#[test]
fn band_fill_is_drawn_between_its_curves() {
    // Band from y=0 to y=1 across x 0..10 in sky blue; outside it the plot background is white.
    let plot = LinePlot {
        bands: vec![Band {
            name: String::new(),
            lower: vec![(0.0, 0.0), (10.0, 0.0)],
            upper: vec![(0.0, 1.0), (10.0, 1.0)],
            colour: 5,
        }],
        x_range: Some((0.0, 10.0)),
        y_range: Some((-1.0, 2.0)),
        ..LinePlot::default()
    };
    let img = decode_png(&render_line_plot(&plot, W, H).unwrap().png);
    // The fill is the palette colour blended over white: strictly between the two.
    let (r, g, b) = palette()[5];
    let fill_like =
        |p: (u8, u8, u8)| p != (255, 255, 255) && p.0 >= r && p.1 >= g && p.2 >= b && p.0 < 255 && p.2 > p.0;
    let filled: Vec<(u32, u32)> = (0..H)
        .flat_map(|y| (0..W).map(move |x| (x, y)))
        .filter(|&(x, y)| fill_like(img.pixel(x, y)))
        .collect();
    assert!(filled.len() > 5000, "{} fill pixels", filled.len());
    let rows: Vec<u32> = filled.iter().map(|p| p.1).collect();
    let (top, bottom) = (*rows.iter().min().unwrap(), *rows.iter().max().unwrap());
    // y range -1..2 with the band over 0..1: the fill covers about a third of the plot height.
    let plot_h_estimate = f64::from(bottom - top) * 3.0;
    assert!(plot_h_estimate > 0.6 * f64::from(H) && plot_h_estimate < f64::from(H));
}

/// Okabe, M. and Ito, K. (2008), Color Universal Design: the eight colours as sRGB bytes
/// (from memory; these are the widely reproduced values of the published set). burrow's two
/// side colours follow them.
#[test]
fn palette_is_the_okabe_ito_set() {
    let mut p = palette()[..8].to_vec();
    p.sort();
    let mut published = vec![
        (0, 0, 0),
        (230, 159, 0),
        (86, 180, 233),
        (0, 158, 115),
        (240, 228, 66),
        (0, 114, 178),
        (213, 94, 0),
        (204, 121, 167),
    ];
    published.sort();
    assert_eq!(p, published);
}

/// The renderer must not pull in the system-font path (font-kit, fontconfig, freetype).
#[test]
fn dependency_graph_has_no_system_font_library() {
    // The lock file sits in the package or, in a workspace, in an ancestor folder.
    let manifest_dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR"));
    let lock_path = manifest_dir
        .ancestors()
        .map(|d| d.join("Cargo.lock"))
        .find(|p| p.exists())
        .expect("Cargo.lock exists after a build");
    let lock = std::fs::read_to_string(lock_path).unwrap();
    for line in lock.lines().filter(|l| l.starts_with("name = ")) {
        for bad in ["font-kit", "fontconfig", "freetype"] {
            assert!(!line.contains(bad), "{line} is in the dependency graph");
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Field plot
// ---------------------------------------------------------------------------------------------

use burrow::report::plot::{
    ARROW_RGB, ArrowLayer, FieldPlot, chain_segments, colour_map, isoline_segments, render_field_plot,
    render_field_plot_with_arrows,
};

/// Rows of "t,r,g,b" from a reference CSV written by tests/reference/viridis_reference.py.
fn read_colour_csv(name: &str) -> Vec<(f64, (u8, u8, u8))> {
    let path = format!("{}/tests/reference/{name}", env!("CARGO_MANIFEST_DIR"));
    std::fs::read_to_string(&path)
        .unwrap_or_else(|e| panic!("{path}: {e}"))
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| {
            let f: Vec<&str> = l.split(',').collect();
            (
                f[0].parse().unwrap(),
                (
                    f[1].parse().unwrap(),
                    f[2].parse().unwrap(),
                    f[3].parse().unwrap(),
                ),
            )
        })
        .collect()
}

/// The 16 tabulated stops are matplotlib's viridis (reference CSV from matplotlib 3.11.2).
#[test]
fn colour_map_stops_are_viridis() {
    let stops = read_colour_csv("viridis_stops.csv");
    assert_eq!(stops.len(), 16);
    for (t, rgb) in stops {
        assert_eq!(colour_map(t), rgb, "t = {t}");
    }
}

/// CIE 1976 L*a*b* of an sRGB colour: decoding and the linear-RGB-to-XYZ matrix per
/// IEC 61966-2-1 (D65 white 0.95047, 1, 1.08883), Lab per CIE 15:2004.
fn cie_lab((r, g, b): (u8, u8, u8)) -> [f64; 3] {
    let lin = |c: u8| {
        let c = f64::from(c) / 255.0;
        if c <= 0.04045 {
            c / 12.92
        } else {
            ((c + 0.055) / 1.055).powf(2.4)
        }
    };
    let (r, g, b) = (lin(r), lin(g), lin(b));
    let x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
    let y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
    let z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
    let f = |t: f64| {
        if t > (6.0f64 / 29.0).powi(3) {
            t.cbrt()
        } else {
            t / (3.0 * (6.0f64 / 29.0).powi(2)) + 4.0 / 29.0
        }
    };
    let (fx, fy, fz) = (f(x / 0.95047), f(y), f(z / 1.08883));
    [116.0 * fy - 16.0, 500.0 * (fx - fy), 200.0 * (fy - fz)]
}

/// Between the stops, linear interpolation stays within a just-noticeable colour difference of
/// the full 256-entry viridis table: CIE76 delta E*ab <= 2.3 (the usual JND figure, e.g.
/// G. Sharma, Digital Color Imaging Handbook, 2003; from memory). Measured: 1.39 at worst.
#[test]
fn colour_map_between_stops_is_within_a_jnd_of_viridis() {
    let samples = read_colour_csv("viridis_samples.csv");
    assert_eq!(samples.len(), 101);
    let mut worst = 0.0f64;
    for (t, reference) in samples {
        let (a, b) = (cie_lab(colour_map(t)), cie_lab(reference));
        let de = ((a[0] - b[0]).powi(2) + (a[1] - b[1]).powi(2) + (a[2] - b[2]).powi(2)).sqrt();
        worst = worst.max(de);
    }
    eprintln!("worst delta E*ab {worst:.2}");
    assert!(worst <= 2.3, "worst delta E*ab {worst}");
}

/// CIE 1976 L* of an sRGB colour (first component of [`cie_lab`]).
fn cie_lightness(c: (u8, u8, u8)) -> f64 {
    cie_lab(c)[0]
}

/// Reads in grey: lightness never falls along the map and spans most of the scale.
#[test]
fn colour_map_lightness_rises_monotonically() {
    let l: Vec<f64> = (0..=255)
        .map(|k| cie_lightness(colour_map(f64::from(k) / 255.0)))
        .collect();
    for w in l.windows(2) {
        // 0.3 L* allows for rounding to bytes in nearly flat stretches.
        assert!(w[1] >= w[0] - 0.3, "lightness falls from {} to {}", w[0], w[1]);
    }
    // Between stops 1/15 apart, lightness rises clearly.
    for k in 0..15 {
        let a = cie_lightness(colour_map(f64::from(k) / 15.0));
        let b = cie_lightness(colour_map(f64::from(k + 1) / 15.0));
        assert!(b > a + 2.0, "stop {k}: {a} -> {b}");
    }
    assert!(l[255] - l[0] > 60.0);
}

fn grid(n: usize, lo: f64, hi: f64) -> Vec<f64> {
    (0..n)
        .map(|i| lo + (hi - lo) * i as f64 / (n - 1) as f64)
        .collect()
}

fn sample(x: &[f64], z: &[f64], f: impl Fn(f64, f64) -> f64) -> Vec<Vec<f64>> {
    z.iter()
        .map(|&zz| x.iter().map(|&xx| f(xx, zz)).collect())
        .collect()
}

/// For a field linear in x, linear interpolation along edges is exact: the isoline of level L is
/// the straight line x = L spanning the whole depth of the grid.
#[test]
fn isoline_of_linear_field_is_exact_vertical_line() {
    let x = grid(13, 0.0, 3.0);
    let z = [0.0, 0.3, 0.5, 1.4, 2.0]; // non-uniform on purpose
    let v = sample(&x, &z, |xx, _| 2.0 * xx + 1.0);
    let level = 4.3; // x = 1.65
    let segs = isoline_segments(&x, &z, &v, level);
    assert_eq!(segs.len(), z.len() - 1);
    let mut depth_covered = 0.0;
    for (a, b) in &segs {
        assert!((a.0 - 1.65).abs() < 1e-12 && (b.0 - 1.65).abs() < 1e-12);
        depth_covered += (a.1 - b.1).abs();
    }
    assert!((depth_covered - 2.0).abs() < 1e-12);
    let lines = chain_segments(&segs);
    assert_eq!(lines.len(), 1);
    assert_eq!(lines[0].len(), z.len());
}

/// Distance field r = |p - c|: every isoline vertex lies on an edge where linear interpolation
/// of r is used, so |r(vertex) - R| <= h^2/8 * max|r''| (interpolation error bound for linear
/// interpolation, e.g. Burden and Faires, Numerical Analysis, Theorem 3.3), with
/// |r''| <= 1/r along any line and r >= R - h*sqrt(2) near the isoline.
#[test]
fn isoline_of_distance_field_is_a_closed_loop_within_interpolation_error() {
    let h = 0.05;
    let x = grid(81, -2.0, 2.0);
    let z = grid(81, 0.0, 4.0);
    // This centre puts five nodes exactly on the level (3-4-5 triangles), the degenerate case.
    let (cx, cz, radius) = (0.1, 2.05, 1.0);
    let v = sample(&x, &z, |xx, zz| (xx - cx).hypot(zz - cz));
    let segs = isoline_segments(&x, &z, &v, radius);
    let bound = h * h / 8.0 / (radius - h * 2f64.sqrt());
    for (a, b) in &segs {
        for p in [a, b] {
            let r = (p.0 - cx).hypot(p.1 - cz);
            assert!((r - radius).abs() <= bound, "r = {r}, bound {bound}");
        }
    }
    let lines = chain_segments(&segs);
    assert_eq!(lines.len(), 1, "one loop expected");
    let lp = &lines[0];
    assert_eq!(lp.first(), lp.last(), "loop is closed");
    // Shoelace area of the inscribed polygon: below pi R^2, and close to it.
    let area = lp
        .windows(2)
        .map(|w| w[0].0 * w[1].1 - w[1].0 * w[0].1)
        .sum::<f64>()
        .abs()
        / 2.0;
    let circle = std::f64::consts::PI * radius * radius;
    assert!(area < circle + 1e-9 && area > 0.995 * circle, "area {area}");
}

/// Saddle cell: corners 1 (top-left), 0 (top-right), 1 (bottom-right), 0 (bottom-left) with
/// level 0.5. The centre mean 0.5 counts as inside, so the high corners connect and the two
/// segments cut off the low corners.
#[test]
fn saddle_cell_is_resolved_by_the_centre_value() {
    let x = [0.0, 1.0];
    let z = [0.0, 1.0];
    let v = vec![vec![1.0, 0.0], vec![0.0, 1.0]];
    let mut segs = isoline_segments(&x, &z, &v, 0.5);
    assert_eq!(segs.len(), 2);
    let norm = |s: ((f64, f64), (f64, f64))| if s.0 <= s.1 { s } else { (s.1, s.0) };
    segs = segs.into_iter().map(norm).collect();
    // Around the low corner (1, 0): points (0.5, 0) and (1, 0.5); around (0, 1): (0, 0.5), (0.5, 1).
    assert!(segs.contains(&((0.5, 0.0), (1.0, 0.5))), "{segs:?}");
    assert!(segs.contains(&((0.0, 0.5), (0.5, 1.0))), "{segs:?}");
    // With the high corners lower, the centre is outside and the other pairing appears.
    let v = vec![vec![0.6, 0.0], vec![0.0, 0.6]];
    let segs: Vec<_> = isoline_segments(&x, &z, &v, 0.5).into_iter().map(norm).collect();
    assert!(segs.iter().any(|s| s.0.0 == 0.0 && s.1.1 == 0.0), "{segs:?}");
}

#[test]
fn isolines_skip_cells_with_missing_values() {
    let x = grid(5, 0.0, 4.0);
    let z = grid(3, 0.0, 2.0);
    let mut v = sample(&x, &z, |xx, _| xx);
    v[1][2] = f64::NAN; // touches the four cells around node (1, 2)
    let segs = isoline_segments(&x, &z, &v, 1.5);
    assert_eq!(
        segs.len(),
        0,
        "the x = 1.5 line lies only in cells touching the NaN"
    );
    let segs = isoline_segments(&x, &z, &v, 0.5);
    assert_eq!(segs.len(), 2);
}

fn demo_field() -> FieldPlot {
    let x_m = grid(61, -3.0, 3.0);
    let z_m = grid(41, 0.0, 4.0);
    let values = sample(&x_m, &z_m, |x, _| x); // low on the left, high on the right
    FieldPlot {
        title: "Field".into(),
        x_label: "Distance (m)".into(),
        z_label: "Depth (m)".into(),
        colour_bar_label: "Temperature (°C)".into(),
        x_m,
        z_m,
        values,
        value_range: None,
        isotherms: vec![-1.5, 0.0, 1.5],
        markers: vec![(0.5, 1.0, "Pipe <a> & b".into())],
    }
}

fn base64_decode(s: &str) -> Vec<u8> {
    let val = |c: u8| match c {
        b'A'..=b'Z' => c - b'A',
        b'a'..=b'z' => c - b'a' + 26,
        b'0'..=b'9' => c - b'0' + 52,
        b'+' => 62,
        b'/' => 63,
        _ => panic!("bad base64 byte {c}"),
    };
    let mut out = Vec::new();
    for chunk in s.as_bytes().chunks(4) {
        let pad = chunk.iter().filter(|&&c| c == b'=').count();
        let mut n = 0u32;
        for &c in chunk {
            n = (n << 6) | if c == b'=' { 0 } else { u32::from(val(c)) };
        }
        let bytes = [(n >> 16) as u8, (n >> 8) as u8, n as u8];
        out.extend_from_slice(&bytes[..3 - pad]);
    }
    out
}

#[test]
fn field_plot_svg_embeds_its_raster_and_nothing_external() {
    let out = render_field_plot(&demo_field(), W, H).unwrap();
    let doc = roxmltree::Document::parse(&out.svg).expect("well-formed SVG");
    let images: Vec<_> = doc.descendants().filter(|n| n.has_tag_name("image")).collect();
    assert_eq!(images.len(), 1);
    let href = images[0].attribute("href").unwrap();
    let b64 = href.strip_prefix("data:image/png;base64,").expect("data URI");
    let raster = decode_png(&base64_decode(b64));
    assert_eq!(
        (raster.width.to_string(), raster.height.to_string()),
        (
            images[0].attribute("width").unwrap().to_string(),
            images[0].attribute("height").unwrap().to_string()
        )
    );
    // The value rises from left to right: left column dark and low, right column light and high.
    let mid = raster.height / 2;
    let left = raster.pixel(0, mid);
    let right = raster.pixel(raster.width - 1, mid);
    assert!(cie_lightness(right) > cie_lightness(left) + 50.0);
    let without_ns = out.svg.replace("http://www.w3.org/2000/svg", "");
    assert!(!without_ns.contains("http") && !without_ns.contains("url("));
    let texts = svg_texts(&out.svg);
    for t in [
        "Field",
        "Distance (m)",
        "Depth (m)",
        "Temperature (°C)",
        "Pipe <a> & b",
        "0",
        "1.5",
        "-1.5",
    ] {
        assert!(texts.iter().any(|x| x == t), "{t:?} missing from {texts:?}");
    }
}

#[test]
fn field_plot_png_shows_the_colour_scale_across_the_plot() {
    let out = render_field_plot(&demo_field(), W, H).unwrap();
    let img = decode_png(&out.png);
    assert_eq!((img.width, img.height), (W, H));
    // Low end of the map appears (left of the plot), high end too (right of the plot).
    let near = |p: (u8, u8, u8), q: (u8, u8, u8)| {
        (i32::from(p.0) - i32::from(q.0)).abs()
            + (i32::from(p.1) - i32::from(q.1)).abs()
            + (i32::from(p.2) - i32::from(q.2)).abs()
            <= 12
    };
    let count = |c: (u8, u8, u8)| {
        (0..H)
            .flat_map(|y| (0..W).map(move |x| (x, y)))
            .filter(|&(x, y)| near(img.pixel(x, y), c))
            .count()
    };
    assert!(count(colour_map(0.0)) > 500);
    assert!(count(colour_map(1.0)) > 500);
}

#[test]
fn field_plot_rejects_malformed_grids() {
    let mut f = demo_field();
    f.values.pop();
    assert!(render_field_plot(&f, W, H).unwrap_err().contains("rows"));
    let mut f = demo_field();
    f.x_m[3] = f.x_m[2];
    assert!(render_field_plot(&f, W, H).unwrap_err().contains("x_m"));
    let mut f = demo_field();
    for row in &mut f.values {
        row.iter_mut().for_each(|v| *v = f64::NAN);
    }
    assert!(render_field_plot(&f, W, H).unwrap_err().contains("finite"));
    let mut f = demo_field();
    f.isotherms.push(f64::NAN);
    assert!(render_field_plot(&f, W, H).is_err());
    let mut f = demo_field();
    f.markers.push((f64::INFINITY, 1.0, "lost".into()));
    assert!(render_field_plot(&f, W, H).unwrap_err().contains("lost"));
}

#[test]
fn field_plot_with_missing_values_renders() {
    let mut f = demo_field();
    f.values[10][10] = f64::NAN;
    f.values[20][30] = f64::INFINITY;
    let out = render_field_plot(&f, W, H).unwrap();
    assert!(!out.svg.contains("NaN"));
}

#[test]
fn smallest_and_extreme_aspect_sizes_render() {
    let mut line_plot = simple_plot("A rather long title that will not fit in a small image at all");
    line_plot
        .series
        .push(line("one point", vec![(2.0, 2.0)], SeriesStyle::Line, 3));
    for (w, h) in [(160, 160), (2000, 160), (160, 1200)] {
        let out = render_line_plot(&line_plot, w, h).unwrap();
        let img = decode_png(&out.png);
        assert_eq!((img.width, img.height), (w, h));
        let out = render_field_plot(&demo_field(), w, h).unwrap();
        roxmltree::Document::parse(&out.svg).unwrap();
        assert_eq!(decode_png(&out.png).width, w);
    }
}

#[test]
fn field_plot_draws_arrows_scaled_to_their_magnitude_with_a_scale_key() {
    // Vectors pointing left (towards the low values of the demo field), magnitude 1 in the
    // left half and 2 in the right half.
    let mut arrows = Vec::new();
    for i in 0..6 {
        for j in 0..4 {
            let x = -2.5 + f64::from(i);
            arrows.push((x, 0.5 + f64::from(j), if x < 0.0 { -1.0 } else { -2.0 }, 0.0));
        }
    }
    let layer = ArrowLayer {
        arrows: arrows.clone(),
        unit: "W/m²".into(),
    };
    let out = render_field_plot_with_arrows(&demo_field(), &layer, W, H).unwrap();
    let doc = roxmltree::Document::parse(&out.svg).expect("well-formed SVG");
    let fill = format!("#{:02X}{:02X}{:02X}", ARROW_RGB.0, ARROW_RGB.1, ARROW_RGB.2);
    let heads: Vec<Vec<(f64, f64)>> = doc
        .descendants()
        .filter(|n| n.has_tag_name("polygon"))
        .filter(|n| n.attribute("fill").is_some_and(|f| f.eq_ignore_ascii_case(&fill)))
        .map(|n| {
            n.attribute("points")
                .unwrap()
                .split_whitespace()
                .map(|p| {
                    let (a, b) = p.split_once(',').unwrap();
                    (a.parse().unwrap(), b.parse().unwrap())
                })
                .collect()
        })
        .collect();
    // One head per arrow and one for the scale key.
    assert_eq!(heads.len(), arrows.len() + 1, "{}", out.svg.len());
    // Every arrow of the field points left: its tip lies left of the two base corners.
    let field_heads = &heads[..arrows.len()];
    for h in field_heads {
        assert!(h[0].0 < h[1].0 && h[0].0 < h[2].0, "{h:?}");
    }
    // The key states a round value of the largest magnitude (2) and the unit.
    let texts = svg_texts(&out.svg);
    assert!(texts.iter().any(|t| t == "2 W/m²"), "{texts:?}");
    // Arrows of magnitude 2 are twice as long: compare the shafts drawn with the arrow colour.
    let shafts: Vec<f64> = doc
        .descendants()
        .filter(|n| n.has_tag_name("polyline"))
        .filter(|n| {
            n.attribute("stroke")
                .is_some_and(|f| f.eq_ignore_ascii_case(&fill))
        })
        .map(|n| {
            let pts: Vec<f64> = n
                .attribute("points")
                .unwrap()
                .split_whitespace()
                .map(|p| p.split_once(',').unwrap().0.parse::<f64>().unwrap())
                .collect();
            (pts[pts.len() - 1] - pts[0]).abs()
        })
        .collect();
    assert_eq!(shafts.len(), arrows.len() + 1);
    let (short, long) = (shafts[0], shafts[arrows.len() - 1]);
    // Shaft = length − head (≤ 7 px): the total lengths are 1 : 2 within a pixel or two.
    println!("shafts {shafts:?}");
    assert!(long > 1.6 * short, "{short} {long}");
}

#[test]
fn field_plot_refuses_arrows_with_non_finite_components() {
    let layer = ArrowLayer {
        arrows: vec![(0.0, 1.0, f64::NAN, 1.0)],
        unit: "W/m²".into(),
    };
    let err = render_field_plot_with_arrows(&demo_field(), &layer, W, H).unwrap_err();
    assert!(err.contains("finite"), "{err}");
}

/// A calendar grid puts year 1 at the top and January on the left: a grid whose only cold cell
/// is January of year 1 and only warm cell December of the last year shows burrow's cold-side
/// colour near the top-left corner and the warm-side colour near the bottom-right one, each
/// exactly at its scale end; the centre value is the pale middle.
#[test]
fn a_calendar_grid_places_years_down_and_months_across_in_the_side_colours() {
    use burrow::report::grid::{CalendarGrid, Mark, render_calendar_grid};
    use burrow::report::plot::{FROM_GROUND_RGB, SIDE_MIDDLE_RGB, TO_GROUND_RGB, side_colour};
    assert_eq!(side_colour(0.0), FROM_GROUND_RGB);
    assert_eq!(side_colour(0.5), SIDE_MIDDLE_RGB);
    assert_eq!(side_colour(1.0), TO_GROUND_RGB);
    let mut values = vec![[5.0; 12]; 4];
    values[0][0] = -2.0;
    values[3][11] = 30.0;
    let mut marks = vec![[None; 12]; 4];
    marks[0][0] = Some(Mark::Beyond);
    let grid = CalendarGrid {
        title: "grid".into(),
        colour_bar_label: "°C".into(),
        values,
        marks,
        value_range: (-2.0, 30.0),
        centre: 5.0,
        beyond_key: "past a limit".into(),
        near_key: String::new(),
    };
    let r = render_calendar_grid(&grid, 600, 400).unwrap();
    let img = decode_png(&r.png);
    let cold = img.pixels_of(FROM_GROUND_RGB);
    let warm = img.pixels_of(TO_GROUND_RGB);
    assert!(!cold.is_empty() && !warm.is_empty());
    // The colour bar holds both colours too, but only in its end rows: the medians are the
    // cells'.
    let median = |px: &[(u32, u32)]| {
        let mut x: Vec<u32> = px.iter().map(|p| p.0).collect();
        let mut y: Vec<u32> = px.iter().map(|p| p.1).collect();
        x.sort();
        y.sort();
        (x[x.len() / 2], y[y.len() / 2])
    };
    let (cx, cy) = median(&cold);
    let (wx, wy) = median(&warm);
    assert!(
        cx < wx && cy < wy,
        "cold cell at ({cx}, {cy}), warm cell at ({wx}, {wy})"
    );
    assert!(svg_texts(&r.svg).iter().any(|t| t == "past a limit"));
    // A centre outside the range is refused, not drawn.
    let bad = CalendarGrid { centre: 40.0, ..grid };
    assert!(render_calendar_grid(&bad, 600, 400).is_err());
}
