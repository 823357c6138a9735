//! A long mutation campaign over the site-file loader and the CSV readers (stable Rust):
//! `cargo run --release --example fuzz_loader -- [COUNT] [SEED]` (default 1,000,000 inputs).
//! Every input that panics is written to `target/fuzz-crashes/`; the exit code is 1 when any did.

#[path = "../tests/common/mutate.rs"]
mod mutate;

fn main() {
    let mut args = std::env::args().skip(1);
    let count: usize = args.next().and_then(|a| a.parse().ok()).unwrap_or(1_000_000);
    let seed: u64 = args.next().and_then(|a| a.parse().ok()).unwrap_or(1);
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR"));
    let started = std::time::Instant::now();
    let crashes = mutate::campaign(root, count, seed);
    let secs = started.elapsed().as_secs_f64();
    let dir = root.join("target/fuzz-crashes");
    let _ = std::fs::create_dir_all(&dir);
    for (i, (input, message)) in crashes.iter().enumerate() {
        let _ = std::fs::write(dir.join(format!("crash-{seed}-{i}.yaml")), input);
        eprintln!("crash {i}: {message}");
    }
    println!(
        "{count} inputs from seed {seed} in {secs:.1} s ({:.0} a second): {} crashes",
        count as f64 / secs,
        crashes.len()
    );
    std::process::exit(i32::from(!crashes.is_empty()));
}
