//! A small, deterministic mutation fuzzer for the site-file loader and the CSV readers, on
//! stable Rust: seeds (every example and template, a few CSV files), a dictionary of the
//! schema's keys, units and YAML syntax, and byte-level mutations drawn from a seeded
//! splitmix64 stream. Used by `tests/fuzz_loader.rs` (a bounded campaign in every test run) and
//! `examples/fuzz_loader.rs` (long campaigns). A panic is a failure; the input is written out.

use std::path::{Path, PathBuf};

/// splitmix64 (Steele, Lea & Flood 2014): a tiny, fast, well-mixed 64-bit generator.
pub struct Rng(u64);

impl Rng {
    pub fn new(seed: u64) -> Self {
        Self(seed)
    }

    pub fn next(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    pub fn below(&mut self, n: usize) -> usize {
        if n == 0 {
            0
        } else {
            (self.next() % n as u64) as usize
        }
    }
}

/// The seeds: every site example and template, and a few series and load files.
pub fn seeds(root: &Path) -> Vec<Vec<u8>> {
    let mut out = Vec::new();
    for dir in ["site-examples", "templates"] {
        let mut files: Vec<PathBuf> = std::fs::read_dir(root.join(dir))
            .map(|d| d.filter_map(Result::ok).map(|e| e.path()).collect())
            .unwrap_or_default();
        files.sort();
        for f in files {
            if f.extension().is_some_and(|e| e == "yaml")
                && let Ok(b) = std::fs::read(&f)
            {
                out.push(b);
            }
        }
    }
    out.push(b"date,air\n2031-01-01,-3.5\n2031-01-02,-4\n2031-01-03,1.25\n".to_vec());
    out.push(b"load_w\n1200\n-300\n# comment\n\n450.5\n".to_vec());
    out
}

/// Keys of the schema, units and YAML syntax that mutations insert.
pub fn dictionary(root: &Path) -> Vec<Vec<u8>> {
    let mut words: Vec<String> = Vec::new();
    if let Ok(text) = std::fs::read_to_string(root.join("schemas/site.schema.json")) {
        let mut rest = text.as_str();
        while let Some(i) = rest.find("\"properties\": {") {
            rest = &rest[i + 15..];
            for line in rest.lines().take(200) {
                let t = line.trim();
                if let Some(name) = t.strip_prefix('"').and_then(|t| t.split('"').next())
                    && t.ends_with('{')
                    && !name.is_empty()
                {
                    words.push(format!("{name}: "));
                }
            }
        }
    }
    for w in [
        " mm",
        " m",
        " km",
        " W/(m K)",
        " MJ/(m3 K)",
        " °C",
        " °F",
        " K",
        " kWh",
        " MWh",
        " kW",
        " l/s",
        " h",
        " d",
        " years",
        " %",
        " °C·d",
        " m2 K/W",
        " m K/W",
        "((((",
        "))))",
        "^99",
        "1e308",
        "-1e308",
        "NaN",
        ".inf",
        "-0",
        "0",
        "1e-320",
        "&a ",
        "*a",
        "&b [*a, *a, *a, *a]",
        "[",
        "]",
        "{",
        "}",
        ", ",
        ": ",
        "- ",
        "\n",
        "\r",
        "\r\n",
        "\t",
        "\0",
        "~",
        "!!str ",
        "---\n",
        "<<: ",
        "\"",
        "'",
        "#",
        "?",
        "|\n",
        ">\n",
        "\u{feff}",
        "é",
        "kind: borefield",
        "kind: frost",
        "kind: heat-loss",
        "kind: cross-section",
        "studies[0]",
        "id: ..",
        "\u{202e}",
    ] {
        words.push(w.to_string());
    }
    words.into_iter().map(String::into_bytes).collect()
}

/// One mutated input from a seed.
pub fn mutate(rng: &mut Rng, seeds: &[Vec<u8>], dict: &[Vec<u8>]) -> Vec<u8> {
    let mut b = seeds[rng.below(seeds.len())].clone();
    let rounds = 1 + rng.below(4);
    for _ in 0..rounds {
        let n = b.len().max(1);
        match rng.below(8) {
            0 => {
                let i = rng.below(n);
                if i < b.len() {
                    b[i] ^= 1 << rng.below(8);
                }
            }
            1 | 2 => {
                let i = rng.below(b.len() + 1);
                let w = &dict[rng.below(dict.len())];
                b.splice(i..i, w.iter().copied());
            }
            3 => {
                let i = rng.below(n);
                let j = (i + 1 + rng.below(64)).min(b.len());
                if i < j {
                    b.drain(i..j);
                }
            }
            4 => {
                let i = rng.below(n);
                let j = (i + 1 + rng.below(200)).min(b.len());
                if i < j {
                    let copy: Vec<u8> = b[i..j].to_vec();
                    let k = rng.below(b.len() + 1);
                    b.splice(k..k, copy);
                }
            }
            5 => {
                // A line of another seed spliced in.
                let other = &seeds[rng.below(seeds.len())];
                let lines: Vec<&[u8]> = other.split(|c| *c == b'\n').collect();
                let line = lines[rng.below(lines.len())];
                let i = rng.below(b.len() + 1);
                b.splice(i..i, line.iter().copied().chain([b'\n']));
            }
            6 => {
                // A digit run replaced by an extreme number.
                if let Some(i) = (0..b.len())
                    .map(|k| (k + rng.below(n)) % n)
                    .find(|&k| b.get(k).is_some_and(u8::is_ascii_digit))
                {
                    let mut j = i;
                    while j < b.len() && (b[j].is_ascii_digit() || b[j] == b'.') {
                        j += 1;
                    }
                    let w: &[u8] =
                        [&b"1e308"[..], b"0", b"-9999999999", b"4294967296", b"1e-300"][rng.below(5)];
                    b.splice(i..j, w.iter().copied());
                }
            }
            _ => {
                let keep = rng.below(b.len() + 1);
                b.truncate(keep);
            }
        }
    }
    b.truncate(1 << 16);
    b
}

/// Feeds one input to every reader; `Err` holds the panic message.
pub fn exercise(input: &[u8], dir: &Path) -> Result<(), String> {
    let text = String::from_utf8_lossy(input).into_owned();
    let run = std::panic::catch_unwind(|| {
        let _ = burrow::site::load_text(&text, "fuzz.yaml", dir);
        let _ = burrow::site::series_file::parse(
            &text,
            "fuzz.csv",
            None,
            burrow::site::series_file::TemperatureUnit::Celsius,
        );
        let _ = burrow::site::series_file::parse_hourly_loads(&text, "fuzz.csv");
    });
    run.map_err(|e| {
        e.downcast_ref::<String>()
            .cloned()
            .or_else(|| e.downcast_ref::<&str>().map(|s| s.to_string()))
            .unwrap_or_default()
    })
}

/// Runs `count` inputs from `seed`; returns the crashes (input, panic message).
pub fn campaign(root: &Path, count: usize, seed: u64) -> Vec<(Vec<u8>, String)> {
    let seeds = seeds(root);
    let dict = dictionary(root);
    let dir = std::env::temp_dir().join(format!("burrow-fuzz-{}", std::process::id()));
    let _ = std::fs::create_dir_all(&dir);
    let mut rng = Rng::new(seed);
    let mut crashes = Vec::new();
    std::panic::set_hook(Box::new(|_| {}));
    for _ in 0..count {
        let input = mutate(&mut rng, &seeds, &dict);
        if let Err(message) = exercise(&input, &dir) {
            crashes.push((input, message));
        }
    }
    let _ = std::panic::take_hook();
    crashes
}
