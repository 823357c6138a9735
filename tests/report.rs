//! The HTML report as a reviewer receives it: self-contained, escaped, complete, warnings first.

use std::path::PathBuf;
use std::process::Command;

fn bundle(site_text: &str, name: &str) -> (PathBuf, String) {
    let dir = std::env::temp_dir().join(format!("burrow-report-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join("site.yaml"), site_text).unwrap();
    let o = Command::new(env!("CARGO_BIN_EXE_burrow"))
        .args(["run", "--quiet", "site.yaml", "--out", "b"])
        .current_dir(&dir)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(0), "{}", String::from_utf8_lossy(&o.stderr));
    let out = dir.join("b");
    let html = std::fs::read_to_string(out.join("report.html")).unwrap();
    (out, html)
}

const HOSTILE: &str = "<script>alert('x')</script> & \"Co\"";

fn hostile_site() -> String {
    format!(
        "site:
  name: '{name}'
  description: '<img src=x onerror=alert(1)>'
climate: {{model: annual-wave, mean: 2 °C, amplitude: 10 K, coldest_day: 30}}
ground:
  layers:
    - {{name: '<b>fill</b>', conductivity: 1.4, heat_capacity: 2.2e6, water_content: 0.2}}
studies:
  - id: main
    kind: frost
    pipe: {{id: '<i>main</i>', depth: 0.9 m, outer_diameter: 110 mm, fluid: {{temperature: 5}}}}
  - id: trunk
    kind: heat-loss
    pipes:
      - {{id: '<u>supply</u>', depth: 1 m, outer_diameter: 200 mm, fluid: {{temperature: 80}}, layers: [{{name: pur, thickness: 50 mm, conductivity: 0.027}}]}}
    neighbours: [{{id: '<s>cable</s>', x: 1 m, depth: 1 m, limit: 15}}]
",
        name = HOSTILE.replace('\'', "''")
    )
}

#[test]
fn user_text_is_escaped_everywhere() {
    let (_, html) = bundle(&hostile_site(), "escape");
    for raw in ["<script>", "<img", "<b>fill", "<i>main", "<u>supply", "<s>cable"] {
        assert!(!html.contains(raw), "unescaped `{raw}` in the report");
    }
    // maud escapes `&`, `<`, `>` and `"`; a `'` is harmless in text and in its double-quoted
    // attributes.
    assert!(html.contains("&lt;script&gt;alert('x')&lt;/script&gt; &amp; &quot;Co&quot;"));
    assert!(html.contains("&lt;b&gt;fill&lt;/b&gt;"));
}

#[test]
fn the_report_loads_nothing_from_the_network() {
    let (_, html) = bundle(&hostile_site(), "offline");
    let without_svg_ns = html
        .replace("http://www.w3.org/2000/svg", "")
        .replace("http://www.w3.org/1999/xlink", "");
    for needle in ["http://", "https://", "<script", "<link", "@import", "url(http"] {
        assert!(
            !without_svg_ns.contains(needle),
            "the report references `{needle}`"
        );
    }
}

#[test]
fn every_plot_is_a_figure_in_the_report_and_a_file_in_the_bundle() {
    let (out, html) = bundle(&hostile_site(), "figures");
    let svgs = std::fs::read_dir(out.join("plots"))
        .unwrap()
        .filter(|e| e.as_ref().unwrap().path().extension().is_some_and(|x| x == "svg"))
        .count();
    let pngs = std::fs::read_dir(out.join("plots"))
        .unwrap()
        .filter(|e| e.as_ref().unwrap().path().extension().is_some_and(|x| x == "png"))
        .count();
    let figures = html.matches("<figure").count();
    assert!(
        figures >= 2 + 2 + 2,
        "ground, frost and heat-loss figures expected, found {figures}"
    );
    assert_eq!(figures, svgs);
    assert_eq!(svgs, pngs);
    assert_eq!(html.matches("<figure").count(), html.matches("<svg").count());
}

#[test]
fn warnings_come_first_and_the_cautions_paragraph_is_present() {
    let (_, html) = bundle(&hostile_site(), "order");
    // The shallow main raises a danger warning.
    let warnings = html.find("id=\"warnings\"").unwrap();
    let danger = html.find("frost.at_pipe").expect("the danger warning is listed");
    let summary = html.find("id=\"summary\"").unwrap();
    let first_study = html.find("class=\"study\"").unwrap();
    assert!(warnings < danger && danger < summary && summary < first_study);
    assert!(html.contains(&maud::html! { (burrow::CAUTION) }.into_string()));
    assert!(html.find("id=\"cautions\"").unwrap() > first_study);
}

#[test]
fn summary_gives_each_study_its_figures_and_checks_and_each_study_echoes_its_inputs() {
    let (out, html) = bundle(&hostile_site(), "summary");
    let table = html
        .split("<table class=\"studies\">")
        .nth(1)
        .and_then(|t| t.split("</table>").next())
        .expect("a table of the studies in the summary");
    assert_eq!(table.matches("<tr><td><a href=\"#study-").count(), 2);
    // Each study's row holds its decisive figures and the checks the study made, as the study
    // worded them (a failed one marked), or says it set no limits: the summary decides nothing.
    let results: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(out.join("results.json")).unwrap()).unwrap();
    let text = |s: &str| maud::html! { (s) }.into_string();
    for (study, row) in results["studies"]
        .as_array()
        .unwrap()
        .iter()
        .zip(table.split("<tr><td><a href=").skip(1))
    {
        for f in study["decisive_figures"].as_array().unwrap() {
            assert!(row.contains(&text(f["label"].as_str().unwrap())), "{row}");
        }
        let checks = study["checks"].as_array().unwrap();
        if checks.is_empty() {
            assert!(row.contains("no limits set"), "{row}");
        }
        for c in checks {
            let message = text(c["message"].as_str().unwrap());
            let failed = format!("FAILS: </span>{message}");
            assert_eq!(row.contains(&failed), !c["passed"].as_bool().unwrap(), "{row}");
            assert!(row.contains(&message), "{row}");
        }
    }
    assert!(
        table.contains("frost depth") && table.contains("heat loss per metre of trench"),
        "{table}"
    );
    // Each study echoes its own lines of the site file, escaped.
    assert_eq!(html.matches("Inputs as written (site file, lines").count(), 2);
    assert!(html.contains("kind: frost") && html.contains("kind: heat-loss"));
    assert!(html.contains("&lt;u&gt;supply&lt;/u&gt;"));
    // Print: studies start on a new page and figures are never split.
    assert!(html.contains("section.study { page-break-before: always; break-before: page; }"));
    assert!(html.contains("break-inside: avoid"));
}
