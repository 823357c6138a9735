//! The command line only: parse arguments, call the library, print, choose the exit code.
//! Exit codes: 0 success (also with warnings), 1 input or run error, 2 usage error,
//! 3 danger-level warning under `--strict`.

use burrow::results::Level;
use burrow::site::Severity;
use clap::{Parser, Subcommand, ValueEnum};
use indicatif::{ProgressBar, ProgressStyle};
use std::io::IsTerminal;
use std::path::PathBuf;
use std::process::ExitCode;
use std::time::Duration;

#[derive(Parser)]
#[command(
    name = "burrow",
    version,
    about = "Designs buried pipes and boreholes that exchange heat with the ground",
    long_about = "burrow reads a YAML site file (soil layers, climate, pipes or boreholes, loads), \
solves heat conduction in the ground, and writes a report bundle: HTML with plots, results.json \
and CSV. Its results are estimates for design support, to be checked by a qualified engineer; \
local codes and licensed practice govern.",
    after_help = "Examples:\n  burrow init water-main > main.yaml\n  burrow check main.yaml\n  burrow run main.yaml --out out/main"
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Run every study in a site file and write the report bundle
    #[command(
        after_help = "Example:\n  burrow run site-examples/fennick-cross-heat-network.yaml\n  \
        (writes out/fennick-cross-heat-network/report.html, results.json, plots and CSV)"
    )]
    Run {
        /// The site file (YAML)
        site: PathBuf,
        /// Folder for the bundle [default: out/<site-file-stem>/]
        #[arg(long, value_name = "DIR")]
        out: Option<PathBuf>,
        /// No progress output on stderr
        #[arg(long, short)]
        quiet: bool,
        /// Exit with code 3 when a danger-level warning is raised
        #[arg(long)]
        strict: bool,
    },
    /// Validate a site file without solving; print every problem found
    #[command(after_help = "Example:\n  burrow check site.yaml\n  \
        (each problem: file:line:column: error: key.path: what is wrong and what is allowed)")]
    Check {
        /// The site file (YAML)
        site: PathBuf,
    },
    /// Print the JSON Schema of the site file
    #[command(after_help = "Example:\n  burrow schema > site.schema.json")]
    Schema,
    /// Print a commented starter site file
    #[command(after_help = "Example:\n  burrow init borefield > field.yaml")]
    Init {
        /// Which starter
        template: Template,
    },
    /// List the soil presets and antifreeze mixtures a site file may name
    #[command(after_help = "Example:\n  burrow materials")]
    Materials,
}

#[derive(Clone, Copy, ValueEnum)]
enum Template {
    DistrictHeating,
    Borefield,
    WaterMain,
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    match cli.command {
        Command::Run {
            site,
            out,
            quiet,
            strict,
        } => run(site, out, quiet, strict),
        Command::Check { site } => check(site),
        Command::Schema => {
            print!("{}", burrow::site::schema::site_schema_text());
            ExitCode::SUCCESS
        }
        Command::Init { template } => {
            print!(
                "{}",
                match template {
                    Template::DistrictHeating => burrow::templates::DISTRICT_HEATING,
                    Template::Borefield => burrow::templates::BOREFIELD,
                    Template::WaterMain => burrow::templates::WATER_MAIN,
                }
            );
            ExitCode::SUCCESS
        }
        Command::Materials => {
            print!("{}", burrow::templates::materials_table());
            ExitCode::SUCCESS
        }
    }
}

/// Progress on stderr, only when stderr is a terminal and not `--quiet`.
struct Spinner(Option<ProgressBar>);

impl Spinner {
    fn new(quiet: bool) -> Self {
        if quiet || !std::io::stderr().is_terminal() {
            return Spinner(None);
        }
        let bar = ProgressBar::new_spinner();
        bar.set_style(
            ProgressStyle::with_template("{spinner} {elapsed:>4} {msg}")
                .unwrap_or_else(|_| ProgressStyle::default_spinner()),
        );
        bar.enable_steady_tick(Duration::from_millis(120));
        Spinner(Some(bar))
    }
    fn finish(&self) {
        if let Some(b) = &self.0 {
            b.finish_and_clear();
        }
    }
}

impl burrow::Progress for Spinner {
    fn stage(&self, message: &str) {
        if let Some(b) = &self.0 {
            b.set_message(message.to_string());
        }
    }
}

fn run(site: PathBuf, out: Option<PathBuf>, quiet: bool, strict: bool) -> ExitCode {
    let out = out.unwrap_or_else(|| burrow::default_out_dir(&site));
    let spinner = Spinner::new(quiet);
    let outcome = burrow::run(&site, &out, &spinner);
    spinner.finish();
    match outcome {
        Err(e) => {
            eprint!("{e}");
            if let burrow::RunError::Invalid(items) = &e {
                let n = items.iter().filter(|d| d.severity == Severity::Error).count();
                eprintln!("{n} error(s): nothing was written.");
            } else {
                eprintln!();
            }
            ExitCode::from(1)
        }
        Ok(summary) => {
            for w in &summary.results.warnings {
                let word = match w.level {
                    Level::Danger => "DANGER",
                    Level::Caution => "caution",
                    Level::Info => "note",
                };
                let study = w.study.as_deref().map(|s| format!(" [{s}]")).unwrap_or_default();
                eprintln!("{word}{study} {}: {}", w.code, w.message);
            }
            for f in &summary.results.failed_studies {
                eprintln!(
                    "FAILED [{}] study {} ({}) did not run: {}",
                    f.id, f.id, f.kind, f.reason
                );
            }
            println!("wrote {}", summary.bundle.join("report.html").display());
            println!("{}", burrow::CAUTION);
            let danger = summary.results.warnings.iter().any(|w| w.level == Level::Danger);
            if !summary.results.failed_studies.is_empty() {
                eprintln!(
                    "{} of {} studies failed; the report lists the others and why each failed.",
                    summary.results.failed_studies.len(),
                    summary.results.failed_studies.len() + summary.results.studies.len()
                );
                ExitCode::from(1)
            } else if strict && danger {
                ExitCode::from(3)
            } else {
                ExitCode::SUCCESS
            }
        }
    }
}

fn check(site: PathBuf) -> ExitCode {
    match burrow::site::load(&site) {
        Ok(loaded) => {
            for d in &loaded.warnings {
                println!("{d}");
            }
            println!("{}: valid ({} warning(s))", site.display(), loaded.warnings.len());
            ExitCode::SUCCESS
        }
        Err(items) => {
            for d in &items {
                println!("{d}");
            }
            let n = items.iter().filter(|d| d.severity == Severity::Error).count();
            println!("{}: {n} error(s)", site.display());
            ExitCode::from(1)
        }
    }
}
