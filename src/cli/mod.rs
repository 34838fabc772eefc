//! Command-line definitions (clap derive). Each command lives in its own file; this module
//! holds the shared flags and dispatches.

pub mod adjust;
pub mod batch;
pub mod buffer;
pub mod check;
pub mod curve;
pub mod db;
pub mod demo;
pub mod html;
pub mod info;
pub mod pka;
pub mod plan;
pub mod shell;

use std::path::PathBuf;

use clap::{Parser, Subcommand, ValueEnum};

use crate::error::Result;
use crate::store::{self, Store};

/// phdose: pKa values, aqueous equilibria and reagent amounts for acid-base workups.
#[derive(Debug, Parser)]
#[command(name = "phdose", version = shell::long_version(), about, long_about = None)]
pub struct Cli {
    #[command(subcommand)]
    pub command: Command,
    /// Output format.
    #[arg(long, global = true, value_enum, default_value_t = Format::Table)]
    pub format: Format,
    /// The SQLite store to use (default: $PHDOSE_DB, else ~/.local/share/phdose/phdose.sqlite).
    #[arg(long, global = true, value_name = "PATH")]
    pub db: Option<PathBuf>,
}

/// How results are printed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Format {
    /// Aligned table for reading.
    Table,
    /// Comma-separated values with a header row.
    Csv,
    /// One JSON document.
    Json,
    /// One JSON object per line (batch input).
    Jsonl,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// Formula (Hill order), molar mass, net charge and components of each structure.
    Info(info::Args),
    /// Ionizable sites with pKa, range and source.
    Pka(pka::Args),
    /// Reagent amount that brings an aqueous layer to a target pH.
    Adjust(adjust::Args),
    /// Buffer recipe: what to weigh, titrate or mix for a pH, concentration and volume.
    Buffer(buffer::Args),
    /// A wash sequence that separates a mixture in an organic solvent, and how to recover
    /// each compound.
    Plan(plan::Args),
    /// Fraction ionized (or mean charge) and logD against pH, as a table or an SVG figure.
    Curve(curve::Args),
    /// Simulate a written workup (TOML procedure) step by step and report its problems.
    Check(check::Args),
    /// A built-in workup scenario, end to end.
    Demo(demo::Args),
    /// Your own measured pKa values: add, list, remove, import, export.
    Db(db::Args),
    /// Shell completion script (bash, zsh, fish, powershell, elvish) on standard output.
    Completions(shell::CompletionArgs),
    /// The manual page (roff) on standard output.
    Manpage,
}

/// Opens the store named by `--db`, `$PHDOSE_DB` or the platform default.
pub fn open_store(db: &Option<PathBuf>) -> Result<Store> {
    match db {
        Some(path) => Store::open(path),
        None => Store::open(&store::default_path()?),
    }
}

/// Runs the parsed command and returns the text to print.
pub fn run(cli: &Cli) -> Result<String> {
    match &cli.command {
        Command::Info(args) => info::run(args, cli),
        Command::Pka(args) => pka::run(args, cli),
        Command::Adjust(args) => adjust::run(args, cli),
        Command::Buffer(args) => buffer::run(args, cli),
        Command::Curve(args) => curve::run(args, cli),
        Command::Check(args) => check::run(args, cli),
        Command::Plan(args) => plan::run(args, cli),
        Command::Demo(args) => demo::run(args, cli),
        Command::Db(args) => db::run(args, cli),
        Command::Completions(args) => shell::completions(args),
        Command::Manpage => shell::manpage(),
    }
}
