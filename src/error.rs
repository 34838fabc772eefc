//! Errors as values. Every fallible library call returns `phdose::Error`; `main` maps the
//! variants to exit codes in one place (2 bad input, 3 unreachable target, 4 problems found by `check`,
//! 1 internal).

use thiserror::Error as ThisError;

/// A text the user gave, with the byte position where reading failed.
#[derive(Debug, Clone, PartialEq, ThisError)]
#[error("{what}: {message} at position {}\n  {text}\n  {caret}", position + 1, caret = caret(*position))]
pub struct ParseError {
    /// What was being read: "SMILES", "SMARTS", "amount", "volume", ...
    pub what: &'static str,
    /// The whole text as given.
    pub text: String,
    /// 0-based byte offset of the offending character (may equal `text.len()` at end of input).
    pub position: usize,
    pub message: String,
}

impl ParseError {
    pub fn new(
        what: &'static str,
        text: &str,
        position: usize,
        message: impl Into<String>,
    ) -> Self {
        ParseError {
            what,
            text: text.to_string(),
            position,
            message: message.into(),
        }
    }
}

fn caret(position: usize) -> String {
    format!("{}^", " ".repeat(position))
}

/// Every error the library reports.
#[derive(Debug, ThisError)]
pub enum Error {
    /// A SMILES, SMARTS, amount, volume or other text that could not be read.
    #[error("{0}")]
    Parse(#[from] ParseError),
    /// Input that reads fine but makes no sense (pH out of range, unknown reagent, ...).
    #[error("{0}")]
    Input(String),
    /// The target pH lies outside what the chosen reagent and stock can reach.
    #[error("{0}")]
    Unreachable(String),
    /// `check` ran and found problems in the procedure; `report` is the full output to print.
    #[error("{count} problem(s) found in the procedure")]
    Problems { count: usize, report: String },
    /// The local store could not be opened, migrated or read.
    #[error("store: {0}")]
    Store(String),
    /// A fault inside phdose (a built-in table that does not load, ...).
    #[error("internal: {0}")]
    Internal(String),
    #[error("{0}")]
    Io(#[from] std::io::Error),
}

impl From<rusqlite::Error> for Error {
    fn from(e: rusqlite::Error) -> Self {
        Error::Store(e.to_string())
    }
}

pub type Result<T> = std::result::Result<T, Error>;
