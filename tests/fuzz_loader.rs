//! A bounded mutation campaign over the site-file loader and the CSV readers in every test run
//! (stable Rust; the long campaigns run with `cargo run --release --example fuzz_loader -- N`,
//! and with cargo-fuzz from `fuzz/`): no input may make them panic.

#[path = "common/mutate.rs"]
mod mutate;

#[test]
fn twenty_thousand_mutated_inputs_make_no_reader_panic() {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR"));
    let crashes = mutate::campaign(root, 20_000, 0x5eed_2026);
    if let Some((input, message)) = crashes.first() {
        let file = std::env::temp_dir().join("burrow-fuzz-crash.yaml");
        let _ = std::fs::write(&file, input);
        panic!(
            "{} of 20000 inputs panicked; the first ({}) is in {}",
            crashes.len(),
            message,
            file.display()
        );
    }
}
