//! Every example's report in a real browser: headless Chromium renders `report.html` to PNG and
//! to PDF without errors, the page is not blank, and every figure has a non-zero size.
//!
//! The browser is `$BURROW_CHROMIUM`, else `chromium` / `chromium-browser` / `google-chrome` on
//! the PATH. Without one the test says so and passes, unless `BURROW_REQUIRE_BROWSER` is set
//! (`.ci/run` sets it after installing Debian's `chromium`), when it fails.

use std::path::{Path, PathBuf};
use std::process::Command;

fn browser() -> Option<PathBuf> {
    if let Some(p) = std::env::var_os("BURROW_CHROMIUM") {
        return Some(PathBuf::from(p));
    }
    let path = std::env::var_os("PATH")?;
    std::env::split_paths(&path)
        .flat_map(|dir| {
            ["chromium", "chromium-browser", "google-chrome"]
                .iter()
                .map(move |name| dir.join(name))
        })
        .find(|p| p.is_file())
}

/// Runs the browser headless on `page` with `extra` arguments; returns stdout.
fn headless(browser: &Path, profile: &Path, page: &Path, extra: &[String]) -> String {
    let url = format!("file://{}", page.display());
    let out = Command::new(browser)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-quic",
            "--no-first-run",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--hide-scrollbars",
            &format!("--user-data-dir={}", profile.display()),
        ])
        .args(extra)
        .arg(&url)
        .output()
        .expect("the browser starts");
    assert!(
        out.status.success(),
        "the browser failed on {url}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8_lossy(&out.stdout).into_owned()
}

/// Pages of a PDF: its `/Type /Page` objects (not `/Pages`).
fn pdf_pages(pdf: &[u8]) -> usize {
    let text = String::from_utf8_lossy(pdf);
    text.match_indices("/Type")
        .filter(|(i, _)| {
            let rest = text[i + 5..].trim_start();
            rest.starts_with("/Page") && !rest.starts_with("/Pages")
        })
        .count()
}

/// Share of pixels that are not near-white, and the number of distinct colours (coarsely).
fn ink(png_bytes: &[u8]) -> (f64, usize) {
    let decoder = png::Decoder::new(std::io::Cursor::new(png_bytes));
    let mut reader = decoder.read_info().expect("a PNG");
    let mut buf = vec![0; reader.output_buffer_size()];
    let info = reader.next_frame(&mut buf).expect("a frame");
    let channels = info.color_type.samples();
    let pixels = &buf[..info.buffer_size()];
    let mut inked = 0usize;
    let mut colours = std::collections::HashSet::new();
    let n = pixels.len() / channels;
    for px in pixels.chunks(channels) {
        let (r, g, b) = (px[0], px[1 % channels], px[2 % channels]);
        if r < 230 || g < 230 || b < 230 {
            inked += 1;
        }
        colours.insert((r >> 4, g >> 4, b >> 4));
    }
    (inked as f64 / n as f64, colours.len())
}

/// A copy of the report with a script that lists each figure's rendered size in a `<pre>`; the
/// report itself has no scripts.
const PROBE: &str = "<script>
document.addEventListener('DOMContentLoaded', () => {
  const sizes = [...document.querySelectorAll('figure')].map(f => {
    const r = (f.querySelector('svg, img') || f).getBoundingClientRect();
    return Math.round(r.width) + 'x' + Math.round(r.height);
  });
  const p = document.createElement('pre');
  p.id = 'figure-sizes';
  p.textContent = sizes.join(' ');
  document.body.appendChild(p);
});
</script>";

#[test]
fn every_example_report_renders_in_chromium() {
    let Some(browser) = browser() else {
        assert!(
            std::env::var_os("BURROW_REQUIRE_BROWSER").is_none(),
            "BURROW_REQUIRE_BROWSER is set but no Chromium was found (set BURROW_CHROMIUM)"
        );
        eprintln!("SKIPPED: no Chromium found (install Debian's `chromium` or set BURROW_CHROMIUM)");
        return;
    };
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let scratch = tempfile::tempdir().unwrap();
    let mut examples: Vec<PathBuf> = std::fs::read_dir(root.join("site-examples"))
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|e| e == "yaml"))
        .collect();
    examples.sort();
    assert!(examples.len() >= 4, "one example per study kind");
    let mut lines = Vec::new();
    for example in &examples {
        let stem = example.file_stem().unwrap().to_string_lossy().into_owned();
        let bundle = scratch.path().join(&stem);
        let started = std::time::Instant::now();
        let run = Command::new(env!("CARGO_BIN_EXE_burrow"))
            .args(["run", &example.to_string_lossy(), "--quiet", "--out"])
            .arg(&bundle)
            .output()
            .unwrap();
        let seconds = started.elapsed().as_secs_f64();
        assert!(
            run.status.success(),
            "{stem}: {}",
            String::from_utf8_lossy(&run.stderr)
        );
        let report = bundle.join("report.html");
        let html = std::fs::read_to_string(&report).unwrap();
        let profile = scratch.path().join(format!("{stem}-profile"));

        let png_path = scratch.path().join(format!("{stem}.png"));
        headless(
            &browser,
            &profile,
            &report,
            &[
                "--window-size=1100,2400".into(),
                format!("--screenshot={}", png_path.display()),
            ],
        );
        let (share, colours) = ink(&std::fs::read(&png_path).expect("a screenshot"));
        assert!(
            share > 0.02 && colours > 20,
            "{stem}: the page looks blank ({share:.3} inked, {colours} colours)"
        );

        let pdf_path = scratch.path().join(format!("{stem}.pdf"));
        headless(
            &browser,
            &profile,
            &report,
            &[
                "--no-pdf-header-footer".into(),
                format!("--print-to-pdf={}", pdf_path.display()),
            ],
        );
        let pdf = std::fs::read(&pdf_path).expect("a PDF");
        assert!(pdf.starts_with(b"%PDF"), "{stem}: not a PDF");
        let pages = pdf_pages(&pdf);
        assert!(pages >= 2, "{stem}: {pages} PDF pages");

        let probe = bundle.join("probe.html");
        std::fs::write(&probe, html.replace("</body>", &format!("{PROBE}</body>"))).unwrap();
        let dom = headless(&browser, &profile, &probe, &["--dump-dom".into()]);
        let sizes = dom
            .split("<pre id=\"figure-sizes\">")
            .nth(1)
            .and_then(|s| s.split("</pre>").next())
            .unwrap_or_else(|| panic!("{stem}: the probe did not run"));
        let figures = html.matches("<figure").count();
        let sizes: Vec<&str> = sizes.split_whitespace().collect();
        assert_eq!(sizes.len(), figures, "{stem}: a figure was not measured");
        for s in &sizes {
            let (w, h) = s.split_once('x').unwrap();
            assert!(
                w.parse::<f64>().unwrap() > 50.0 && h.parse::<f64>().unwrap() > 50.0,
                "{stem}: a figure renders at {s} px"
            );
        }
        lines.push(format!(
            "{stem}: run {seconds:.1} s, {figures} figures, PDF {pages} pages, screenshot {:.0} % inked",
            share * 100.0
        ));
    }
    // For the closing note: page counts and run times (visible with --nocapture).
    for l in lines {
        println!("{l}");
    }
}
