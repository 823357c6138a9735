#![no_main]
//! Any bytes as a site file and as the CSV files a site file names: the readers must return a
//! located error or a site, and never panic.

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let text = String::from_utf8_lossy(data);
    let dir = std::env::temp_dir();
    let _ = burrow::site::load_text(&text, "fuzz.yaml", &dir);
    let _ = burrow::site::series_file::parse(
        &text,
        "fuzz.csv",
        None,
        burrow::site::series_file::TemperatureUnit::Celsius,
    );
    let _ = burrow::site::series_file::parse_hourly_loads(&text, "fuzz.csv");
});
