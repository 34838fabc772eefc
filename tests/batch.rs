//! Batch input end to end (`pka --input`, `info --input`): input order across chunks, bad rows
//! kept in place with their error, every input shape, `--jobs`, and a reader that closes the
//! pipe early. Expected values are the inputs themselves (order, count) and phdose's own
//! one-structure answers, so the batch path is checked against the single path.

mod common;

use std::io::{BufRead, BufReader, Write};
use std::path::PathBuf;
use std::process::{Command, Output, Stdio};

use serde_json::Value;

fn dir(name: &str) -> PathBuf {
    common::temp_dir("batch", name)
}

fn phdose(name: &str, args: &[&str]) -> Output {
    common::phdose("batch", name, args)
}

fn lines(o: &Output) -> Vec<Value> {
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    String::from_utf8_lossy(&o.stdout)
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect()
}

/// A list longer than one chunk (2048 rows), with a bad row every 7th line.
fn long_list() -> Vec<String> {
    let good = ["CC(=O)O", "CCN", "c1ccncc1", "Oc1ccccc1", "CCO", "NCC(=O)O"];
    (0..4500)
        .map(|i| {
            if i % 7 == 3 {
                format!("C{i}CC") // an unclosed ring bond
            } else {
                good[i % good.len()].to_string()
            }
        })
        .collect()
}

#[test]
fn order_and_bad_rows_survive_chunks_and_threads() {
    let d = dir("order");
    let list = long_list();
    let input = d.join("in.smi");
    std::fs::write(&input, list.join("\n")).unwrap();
    let path = input.to_str().unwrap();
    let all = phdose("order", &["pka", "--input", path, "--format", "jsonl"]);
    let one = phdose(
        "order",
        &["pka", "--input", path, "--format", "jsonl", "--jobs", "1"],
    );
    assert_eq!(all.stdout, one.stdout, "--jobs 1 gives the same output");
    let rows = lines(&all);
    assert_eq!(rows.len(), list.len());
    for (i, (row, smiles)) in rows.iter().zip(&list).enumerate() {
        assert_eq!(row["smiles"], smiles.as_str(), "row {i}");
        assert_eq!(row["error"].is_null(), i % 7 != 3, "row {i}: {row}");
    }
    // Each structure gets the same answer as when it is typed alone.
    let single = phdose("order", &["pka", "CC(=O)O", "--format", "json"]);
    let single: Value = serde_json::from_slice(&single.stdout).unwrap();
    assert_eq!(rows[0]["sites"], single[0]["sites"]);
}

#[test]
fn csv_and_json_lines_inputs_and_json_array_output() {
    let d = dir("shapes");
    let csv = d.join("in.csv");
    std::fs::write(&csv, "id,smiles\n1,CC(=O)O\n2,\"C1CC\"\n3,c1ccncc1\n").unwrap();
    let jsonl = d.join("in.jsonl");
    std::fs::write(
        &jsonl,
        "{\"smiles\": \"CC(=O)O\"}\n{\"smiles\": \"C1CC\"}\n{\"smiles\": \"c1ccncc1\"}\n",
    )
    .unwrap();
    let mut outputs = Vec::new();
    for input in [&csv, &jsonl] {
        let o = phdose(
            "shapes",
            &[
                "pka",
                "--input",
                input.to_str().unwrap(),
                "--format",
                "json",
            ],
        );
        assert!(o.status.success());
        let v: Value = serde_json::from_slice(&o.stdout).expect("one JSON array");
        let arr = v.as_array().unwrap();
        assert_eq!(arr.len(), 3);
        assert_eq!(arr[2]["sites"][0]["kind"], "base");
        assert!(arr[1]["error"].as_str().unwrap().contains("SMILES"));
        outputs.push(o.stdout);
    }
    assert_eq!(outputs[0], outputs[1]);
}

#[test]
fn info_batch_reports_each_row() {
    let d = dir("info");
    let input = d.join("in.csv");
    std::fs::write(&input, "smiles\nCCO\nnot a smiles\nCC(=O)[O-].[Na+]\n").unwrap();
    let rows = lines(&phdose(
        "info",
        &[
            "info",
            "--input",
            input.to_str().unwrap(),
            "--format",
            "jsonl",
        ],
    ));
    assert_eq!(rows.len(), 3);
    assert_eq!(rows[0]["formula"], "C2H6O");
    assert!(rows[1]["error"].is_string());
    assert_eq!(rows[2]["formula"], "C2H3NaO2");
}

#[test]
fn a_missing_input_file_exits_2() {
    let o = phdose("nofile", &["pka", "--input", "/nonexistent/in.csv"]);
    assert_eq!(o.status.code(), Some(2));
}

#[test]
fn a_reader_that_closes_the_pipe_ends_the_run_quietly() {
    let d = dir("pipe");
    let input = d.join("in.smi");
    std::fs::write(&input, long_list().join("\n")).unwrap();
    for format in ["jsonl", "json", "csv", "table"] {
        let mut child = Command::new(env!("CARGO_BIN_EXE_phdose"))
            .args([
                "info",
                "--input",
                input.to_str().unwrap(),
                "--format",
                format,
            ])
            .arg("--db")
            .arg(d.join("store.sqlite"))
            .stdout(Stdio::piped())
            .stderr(Stdio::piped())
            .spawn()
            .unwrap();
        let mut first = String::new();
        BufReader::new(child.stdout.take().unwrap())
            .read_line(&mut first)
            .unwrap();
        assert!(!first.is_empty());
        // The reader is gone (like `| head -1`); phdose must notice and stop with 0.
        let out = child.wait_with_output().unwrap();
        assert_eq!(out.status.code(), Some(0), "{format}");
        assert!(out.stderr.is_empty(), "{format}: {:?}", out.stderr);
    }
}

#[test]
fn standard_input_is_read_with_a_dash() {
    let d = dir("stdin");
    let mut child = Command::new(env!("CARGO_BIN_EXE_phdose"))
        .args(["pka", "--input", "-", "--format", "jsonl"])
        .arg("--db")
        .arg(d.join("store.sqlite"))
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .unwrap();
    child
        .stdin
        .take()
        .unwrap()
        .write_all(b"CCN\nOC(=O)c1ccccc1\n")
        .unwrap();
    let rows = lines(&child.wait_with_output().unwrap());
    assert_eq!(rows.len(), 2);
    assert_eq!(rows[1]["sites"][0]["kind"], "acid");
}
