//! Shared helpers for the tests that run the `phdose` binary: a private store per test, and
//! the process output as text or JSON.
#![allow(dead_code)] // each test file uses its own subset

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

use serde_json::Value;

/// A fresh folder for one test's store and files: `suite` names the test file, `name` the test.
pub fn temp_dir(suite: &str, name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("phdose-{suite}-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// The store file of one test.
pub fn temp_db(suite: &str, name: &str) -> PathBuf {
    temp_dir(suite, name).join("store.sqlite")
}

/// Runs `phdose ARGS --db DB`.
pub fn phdose_with_db(db: &Path, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_phdose"))
        .args(args)
        .arg("--db")
        .arg(db)
        .output()
        .expect("phdose runs")
}

/// Runs `phdose ARGS` with the test's own store.
pub fn phdose(suite: &str, name: &str, args: &[&str]) -> Output {
    phdose_with_db(&temp_db(suite, name), args)
}

pub fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

pub fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// The JSON a successful run printed.
pub fn json(o: &Output) -> Value {
    assert!(o.status.success(), "failed: {}", stderr(o));
    serde_json::from_slice(&o.stdout).expect("valid JSON")
}
