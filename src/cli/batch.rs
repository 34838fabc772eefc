//! Batch work on structure lists of any size (`pka --input`, `info --input`): rows are read one
//! at a time, worked on in bounded chunks on all cores, and written out chunk by chunk in input
//! order, so memory stays flat however long the file is.
//!
//! Input is recognised from its first non-blank line: a JSON object starts JSON lines (each
//! object with a `smiles` key), a header with a `smiles` column starts CSV, anything else is
//! one SMILES per line (blank lines and `#` comments skipped). A row that cannot be read
//! becomes a row with its error set; nothing stops the run but a failing output.

use std::fs::File;
use std::io::{self, BufRead, BufReader, IsTerminal, Read, Write};
use std::path::{Path, PathBuf};
use std::sync::Arc;
use std::sync::atomic::{AtomicU64, Ordering};

use indicatif::{ProgressBar, ProgressStyle};
use rayon::prelude::*;
use serde::Serialize;
use tabled::Tabled;

use super::Format;
use crate::error::{Error, Result};
use crate::report;

/// Rows worked on together. Large enough to keep every core busy between writes, small enough
/// that a chunk of results is a few megabytes at most.
const CHUNK: usize = 2048;

/// One input row: the SMILES as given, or why the row could not be read.
#[derive(Debug, Clone, PartialEq)]
pub struct Entry {
    pub smiles: String,
    pub error: Option<String>,
}

impl Entry {
    fn ok(smiles: impl Into<String>) -> Entry {
        Entry {
            smiles: smiles.into(),
            error: None,
        }
    }
    fn bad(smiles: impl Into<String>, error: String) -> Entry {
        Entry {
            smiles: smiles.into(),
            error: Some(error),
        }
    }
}

/// The shape of an input file, told from its first non-blank line.
enum Shape {
    Lines,
    Csv,
    Jsonl,
}

/// Reads entries one at a time from a CSV, JSON-lines or plain list source.
pub struct Rows {
    inner: RowsInner,
    /// Line (plain, JSONL) or record (CSV) number of the last row, for error messages.
    line: u64,
}

enum RowsInner {
    Lines(Box<dyn BufRead + Send>),
    Jsonl(Box<dyn BufRead + Send>),
    Csv {
        reader: csv::Reader<Box<dyn BufRead + Send>>,
        column: usize,
        record: csv::StringRecord,
    },
    Done,
}

impl Rows {
    /// Wraps a source; the first non-blank line decides the shape. A CSV header without a
    /// `smiles` column is an error for the whole input.
    pub fn new(mut source: Box<dyn BufRead + Send>) -> Result<Rows> {
        let mut head = String::new();
        let mut skipped = 0u64;
        loop {
            head.clear();
            if read_line_lossy(&mut source, &mut head)? == 0 {
                return Ok(Rows {
                    inner: RowsInner::Done,
                    line: 0,
                });
            }
            if !head.trim().is_empty() {
                break;
            }
            skipped += 1;
        }
        if head == TOO_LONG {
            head.push('\n');
        }
        let shape = if head.trim_start().starts_with('{') {
            Shape::Jsonl
        } else if head.split(',').any(is_smiles_header) {
            Shape::Csv
        } else {
            Shape::Lines
        };
        // Put the first line back in front of the rest.
        let source: Box<dyn BufRead + Send> = Box::new(BufReader::new(
            io::Cursor::new(head.into_bytes()).chain(source),
        ));
        let inner = match shape {
            Shape::Lines => RowsInner::Lines(source),
            Shape::Jsonl => RowsInner::Jsonl(source),
            Shape::Csv => {
                let mut reader = csv::ReaderBuilder::new().flexible(true).from_reader(source);
                let headers = reader
                    .headers()
                    .map_err(|e| Error::Input(format!("CSV header: {e}")))?;
                let column = headers
                    .iter()
                    .position(is_smiles_header)
                    .ok_or_else(|| Error::Input("CSV input has no `smiles` column".into()))?;
                RowsInner::Csv {
                    reader,
                    column,
                    record: csv::StringRecord::new(),
                }
            }
        };
        Ok(Rows {
            inner,
            line: skipped,
        })
    }

    /// Opens `path` (`-` is standard input).
    pub fn open(path: &Path, counter: Option<Arc<AtomicU64>>) -> Result<Rows> {
        let raw: Box<dyn Read + Send> = if path == Path::new("-") {
            Box::new(io::stdin())
        } else {
            Box::new(
                File::open(path)
                    .map_err(|e| Error::Input(format!("cannot read {}: {e}", path.display())))?,
            )
        };
        let raw: Box<dyn Read + Send> = match counter {
            Some(bytes) => Box::new(Counting { inner: raw, bytes }),
            None => raw,
        };
        Rows::new(Box::new(BufReader::with_capacity(1 << 16, raw)))
    }

    /// The next entry, `None` at the end. Reading errors of the source itself (a failing
    /// disk) are returned; malformed rows are entries with their error set.
    pub fn next_entry(&mut self) -> Result<Option<Entry>> {
        let mut text = String::new();
        let json = matches!(self.inner, RowsInner::Jsonl(_));
        loop {
            match &mut self.inner {
                RowsInner::Done => return Ok(None),
                RowsInner::Lines(src) | RowsInner::Jsonl(src) => {
                    text.clear();
                    if read_line_lossy(src, &mut text)? == 0 {
                        return Ok(None);
                    }
                    self.line += 1;
                    if text.trim_end() == TOO_LONG {
                        return Ok(Some(too_long(self.line)));
                    }
                    let t = text.trim();
                    // Blank lines are skipped in both; `#` starts a comment in plain lists.
                    if t.is_empty() || (!json && t.starts_with('#')) {
                        continue;
                    }
                    return Ok(Some(if json {
                        json_entry(&text, self.line)
                    } else {
                        Entry::ok(t)
                    }));
                }
                RowsInner::Csv {
                    reader,
                    column,
                    record,
                } => {
                    self.line += 1;
                    match reader.read_record(record) {
                        Ok(false) => return Ok(None),
                        Ok(true) => {
                            let smiles = record.get(*column).unwrap_or("").trim();
                            if smiles.is_empty() {
                                return Ok(Some(Entry::bad(
                                    "",
                                    format!("row {}: empty `smiles` field", self.line + 1),
                                )));
                            }
                            return Ok(Some(Entry::ok(smiles)));
                        }
                        Err(e) if e.is_io_error() => {
                            return Err(Error::Input(format!("reading input: {e}")));
                        }
                        Err(e) => {
                            return Ok(Some(Entry::bad("", format!("row {}: {e}", self.line + 1))));
                        }
                    }
                }
            }
        }
    }

    /// Up to `n` entries.
    fn chunk(&mut self, n: usize) -> Result<Vec<Entry>> {
        let mut out = Vec::with_capacity(n);
        while out.len() < n {
            match self.next_entry()? {
                Some(e) => out.push(e),
                None => break,
            }
        }
        Ok(out)
    }
}

fn is_smiles_header(h: &str) -> bool {
    h.trim().trim_matches('"').eq_ignore_ascii_case("smiles")
}

/// Longest input line kept; a longer one becomes an error row (memory stays flat even on a
/// file without line breaks).
const MAX_LINE: usize = 1 << 20;

/// Reads one line into `text` and returns the bytes consumed (0 at the end). Bytes that are
/// not UTF-8 are replaced (the row then fails as a SMILES, with its position, instead of
/// stopping the run). A line over `MAX_LINE` is skipped to its end and `text` set to the
/// marker `TOO_LONG`.
fn read_line_lossy(src: &mut dyn BufRead, text: &mut String) -> Result<usize> {
    let io_err = |e: io::Error| Error::Input(format!("reading input: {e}"));
    let mut bytes = Vec::new();
    let mut n = src
        .take(MAX_LINE as u64)
        .read_until(b'\n', &mut bytes)
        .map_err(io_err)?;
    if n == MAX_LINE && bytes.last() != Some(&b'\n') {
        loop {
            let buf = src.fill_buf().map_err(io_err)?;
            if buf.is_empty() {
                break;
            }
            let (used, end) = match buf.iter().position(|&b| b == b'\n') {
                Some(i) => (i + 1, true),
                None => (buf.len(), false),
            };
            src.consume(used);
            n += used;
            if end {
                break;
            }
        }
        text.push_str(TOO_LONG);
        return Ok(n);
    }
    text.push_str(&String::from_utf8_lossy(&bytes));
    Ok(n)
}

/// Stands for a line too long to keep (a NUL cannot occur in a SMILES or JSON line).
const TOO_LONG: &str = "\0too long\0";

fn too_long(line: u64) -> Entry {
    Entry::bad(
        "",
        format!("line {line}: longer than {MAX_LINE} bytes, skipped"),
    )
}

fn json_entry(line: &str, number: u64) -> Entry {
    match serde_json::from_str::<serde_json::Value>(line) {
        Ok(serde_json::Value::Object(map)) => match map.get("smiles") {
            Some(serde_json::Value::String(s)) => Entry::ok(s.as_str()),
            Some(_) => Entry::bad("", format!("line {number}: `smiles` is not a string")),
            None => Entry::bad("", format!("line {number}: no `smiles` key")),
        },
        Ok(_) => Entry::bad("", format!("line {number}: not a JSON object")),
        Err(e) => Entry::bad("", format!("line {number}: {e}")),
    }
}

/// Counts the bytes read, for the progress bar.
struct Counting {
    inner: Box<dyn Read + Send>,
    bytes: Arc<AtomicU64>,
}

impl Read for Counting {
    fn read(&mut self, buf: &mut [u8]) -> io::Result<usize> {
        let n = self.inner.read(buf)?;
        self.bytes.fetch_add(n as u64, Ordering::Relaxed);
        Ok(n)
    }
}

/// Where results go, in the chosen format. The table format prints one table per chunk (an
/// aligned table needs all its rows before the first line, and a chunk is what memory holds).
pub struct Sink<W: Write> {
    format: Format,
    out: Option<W>,
    csv: Option<csv::Writer<W>>,
    first: bool,
}

impl<W: Write> Sink<W> {
    pub fn new(format: Format, out: W) -> Sink<W> {
        let (out, csv) = match format {
            Format::Csv => (None, Some(csv::Writer::from_writer(out))),
            _ => (Some(out), None),
        };
        Sink {
            format,
            out,
            csv,
            first: true,
        }
    }

    /// Writes one chunk: `objects` for JSON, `rows` for table and CSV, `trailer` under a table.
    pub fn write<T: Serialize, R: Tabled + Serialize>(
        &mut self,
        objects: &[T],
        rows: impl FnOnce() -> Vec<R>,
        trailer: impl FnOnce() -> String,
    ) -> Result<()> {
        let json_err = |e: serde_json::Error| -> Error {
            match e.io_error_kind() {
                Some(kind) => Error::Io(io::Error::from(kind)),
                None => Error::Internal(format!("json: {e}")),
            }
        };
        match (self.format, self.out.as_mut(), self.csv.as_mut()) {
            (Format::Csv, _, Some(w)) => {
                for r in rows() {
                    w.serialize(r).map_err(csv_err)?;
                }
                w.flush()?;
            }
            (Format::Table, Some(out), _) => {
                let rows = rows();
                if !rows.is_empty() {
                    out.write_all(report::table(&rows).as_bytes())?;
                }
                out.write_all(trailer().as_bytes())?;
            }
            (Format::Json, Some(out), _) => {
                for o in objects {
                    out.write_all(if self.first { b"[\n" } else { b",\n" })?;
                    self.first = false;
                    serde_json::to_writer(&mut *out, o).map_err(json_err)?;
                }
            }
            (Format::Jsonl, Some(out), _) => {
                for o in objects {
                    serde_json::to_writer(&mut *out, o).map_err(json_err)?;
                    out.write_all(b"\n")?;
                }
            }
            _ => return Err(Error::Internal("batch output not set up".into())),
        }
        Ok(())
    }

    /// Closes the JSON array and flushes.
    pub fn finish(mut self) -> Result<()> {
        if let Some(out) = self.out.as_mut() {
            if self.format == Format::Json {
                out.write_all(if self.first { b"[]\n" } else { b"\n]\n" })?;
            }
            out.flush()?;
        }
        if let Some(w) = self.csv.as_mut() {
            w.flush()?;
        }
        Ok(())
    }
}

fn csv_err(e: csv::Error) -> Error {
    match e.into_kind() {
        csv::ErrorKind::Io(io) => Error::Io(io),
        other => Error::Internal(format!("csv: {other:?}")),
    }
}

/// How a batch runs.
#[derive(Debug, Clone)]
pub struct Options {
    /// Worker threads; `None` = all cores.
    pub jobs: Option<usize>,
    /// Show a progress bar on standard error (only when it is a terminal).
    pub progress: bool,
}

/// The structures a batch-capable command reads: typed on the command line, from a file, or
/// both (`info` and `pka`).
#[derive(Debug, clap::Args)]
pub struct Structures {
    /// Structures as SMILES.
    pub smiles: Vec<String>,
    /// Read structures from a file: CSV with a `smiles` column, JSON lines with a `smiles` key,
    /// or one SMILES per line (`-` = stdin). Bad rows do not stop the run: their `error` is set.
    #[arg(long, value_name = "FILE")]
    pub input: Option<PathBuf>,
    /// Worker threads for `--input` (default: all cores).
    #[arg(long, value_name = "N", value_parser = clap::value_parser!(u16).range(1..))]
    pub jobs: Option<u16>,
}

impl Structures {
    /// Refuses a run with nothing to read.
    pub fn require_some(&self) -> Result<()> {
        if self.smiles.is_empty() && self.input.is_none() {
            return Err(Error::Input(
                "give at least one SMILES, or --input FILE".into(),
            ));
        }
        Ok(())
    }

    /// With `--input`, streams every structure through `work` to standard output in `format`
    /// (`rows` and `trailer` give the table/CSV form of each chunk) and returns `true`;
    /// without it returns `false` and leaves the run to the caller.
    pub fn stream<T, R, F, G, H>(
        &self,
        format: Format,
        work: F,
        rows: G,
        trailer: H,
    ) -> Result<bool>
    where
        T: Serialize + Send,
        R: Tabled + Serialize,
        F: Fn(&Entry) -> T + Sync,
        G: Fn(&[T]) -> Vec<R>,
        H: Fn(&[T]) -> String,
    {
        let Some(path) = &self.input else {
            return Ok(false);
        };
        let opts = Options {
            jobs: self.jobs.map(usize::from),
            progress: true,
        };
        let mut sink = Sink::new(format, io::BufWriter::new(io::stdout()));
        run(&self.smiles, path, &opts, work, |chunk: &[T]| {
            sink.write(chunk, || rows(chunk), || trailer(chunk))
        })?;
        quiet_on_closed_pipe(sink.finish())?;
        Ok(true)
    }
}

/// Works `work` over every entry of `leading` (structures typed on the command line) and then
/// of `path`, chunk by chunk on a pool of `opts.jobs` threads, handing each chunk of results,
/// in input order, to `emit`. A reader that closed the pipe ends the run quietly.
pub fn run<T, F, E>(
    leading: &[String],
    path: &Path,
    opts: &Options,
    work: F,
    mut emit: E,
) -> Result<()>
where
    T: Send,
    F: Fn(&Entry) -> T + Sync,
    E: FnMut(&[T]) -> Result<()>,
{
    let pool = rayon::ThreadPoolBuilder::new()
        .num_threads(opts.jobs.unwrap_or(0))
        // purr reads a SMILES chain by recursion; give workers the main thread's room.
        .stack_size(16 << 20)
        .build()
        .map_err(|e| Error::Internal(format!("thread pool: {e}")))?;
    let counter = Arc::new(AtomicU64::new(0));
    let bar = progress_bar(path, opts.progress);
    let mut rows = Rows::open(path, bar.as_ref().map(|_| counter.clone()))?;
    let mut pending: Vec<Entry> = leading.iter().map(Entry::ok).collect();
    pending.extend(rows.chunk(CHUNK.saturating_sub(pending.len()).max(1))?);
    let mut step = || -> Result<()> {
        while !pending.is_empty() {
            // Read the next chunk while this one is worked on; write on this thread.
            let (results, next) = pool.install(|| {
                rayon::join(
                    || pending.par_iter().map(&work).collect::<Vec<T>>(),
                    || rows.chunk(CHUNK),
                )
            });
            emit(&results)?;
            if let Some(b) = &bar {
                b.set_position(counter.load(Ordering::Relaxed));
            }
            pending = next?;
        }
        Ok(())
    };
    let outcome = step();
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    quiet_on_closed_pipe(outcome)
}

/// A closed standard output (`| head`) is a normal end (design §5).
pub fn quiet_on_closed_pipe(r: Result<()>) -> Result<()> {
    match r {
        Err(Error::Io(e)) if e.kind() == io::ErrorKind::BrokenPipe => Ok(()),
        other => other,
    }
}

fn progress_bar(path: &Path, wanted: bool) -> Option<ProgressBar> {
    if !wanted || !io::stderr().is_terminal() {
        return None;
    }
    let size = std::fs::metadata(path).ok().filter(|m| m.is_file())?.len();
    let bar = ProgressBar::new(size);
    let style = ProgressStyle::with_template(
        "{spinner} [{elapsed_precise}] {wide_bar} {bytes}/{total_bytes} eta {eta}",
    )
    .ok()?;
    bar.set_style(style);
    Some(bar)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn entries(text: &str) -> Vec<Entry> {
        let mut rows = Rows::new(Box::new(io::Cursor::new(text.as_bytes().to_vec()))).unwrap();
        let mut out = Vec::new();
        while let Some(e) = rows.next_entry().unwrap() {
            out.push(e);
        }
        out
    }

    #[test]
    fn csv_with_a_smiles_column() {
        let e = entries("id,SMILES,kind\n1,CCO,acid\n2, CCN ,base\n3,,x\n");
        assert_eq!(e[0], Entry::ok("CCO"));
        assert_eq!(e[1], Entry::ok("CCN"));
        assert!(e[2].error.as_deref().unwrap().contains("row 4"), "{e:?}");
    }

    #[test]
    fn one_smiles_per_line_skips_blanks_and_comments() {
        let e = entries("\nCCO\n\n# note\nc1ccccc1O\r\n");
        assert_eq!(e, vec![Entry::ok("CCO"), Entry::ok("c1ccccc1O")]);
    }

    #[test]
    fn json_lines_with_bad_rows_kept_in_place() {
        let e = entries("{\"smiles\": \"CCO\", \"id\": 1}\nnot json\n{\"id\": 2}\n[1]\n");
        assert_eq!(e.len(), 4);
        assert_eq!(e[0], Entry::ok("CCO"));
        assert!(e[1].error.as_deref().unwrap().starts_with("line 2"));
        assert!(e[2].error.as_deref().unwrap().contains("no `smiles`"));
        assert!(e[3].error.as_deref().unwrap().contains("not a JSON object"));
    }

    #[test]
    fn bytes_that_are_not_utf8_do_not_stop_the_run() {
        let e = entries("CCO\nC\u{fffd}C\n");
        assert_eq!(e.len(), 2);
        let mut raw = b"CCO\n".to_vec();
        raw.extend([0xff, b'C', b'\n', b'C', b'N', b'\n']);
        let mut rows = Rows::new(Box::new(io::Cursor::new(raw))).unwrap();
        let mut n = 0;
        while rows.next_entry().unwrap().is_some() {
            n += 1;
        }
        assert_eq!(n, 3);
    }

    #[test]
    fn a_line_too_long_becomes_an_error_row_and_reading_goes_on() {
        let mut text = "CCO\n".to_string();
        text.push_str(&"C".repeat(MAX_LINE + 10));
        text.push_str("\nCCN\n");
        let e = entries(&text);
        assert_eq!(e.len(), 3);
        assert!(
            e[1].error.as_deref().unwrap().contains("line 2"),
            "{:?}",
            e[1]
        );
        assert_eq!(e[2], Entry::ok("CCN"));
        // Exactly at the limit with its line break is still read.
        let at_limit = format!("{}\n", "C".repeat(MAX_LINE - 1));
        assert!(entries(&at_limit)[0].error.is_none());
        // A first line too long still leaves the rest readable.
        let first = format!("{}\nCCN\n", "C".repeat(MAX_LINE + 1));
        let e = entries(&first);
        assert!(
            e[0].error.as_deref().unwrap().contains("line 1"),
            "{:?}",
            e[0]
        );
        assert_eq!(e[1], Entry::ok("CCN"));
    }

    #[test]
    fn empty_input_has_no_rows() {
        assert!(entries("").is_empty());
        assert!(entries("\n\n").is_empty());
    }

    #[test]
    fn json_output_is_one_array_across_chunks() {
        #[derive(Tabled, Serialize)]
        struct R {
            a: u32,
        }
        let mut buf = Vec::new();
        let mut sink = Sink::new(Format::Json, &mut buf);
        for chunk in [[1u32, 2], [3, 4]] {
            sink.write(&chunk, Vec::<R>::new, String::new).unwrap();
        }
        sink.finish().unwrap();
        let v: Vec<u32> = serde_json::from_slice(&buf).unwrap();
        assert_eq!(v, vec![1, 2, 3, 4]);
        let mut buf = Vec::new();
        Sink::new(Format::Json, &mut buf).finish().unwrap();
        assert_eq!(
            serde_json::from_slice::<Vec<u32>>(&buf).unwrap(),
            Vec::<u32>::new()
        );
    }

    #[test]
    fn csv_output_has_one_header() {
        #[derive(Tabled, Serialize)]
        struct R {
            a: u32,
        }
        let mut buf = Vec::new();
        let mut sink = Sink::new(Format::Csv, &mut buf);
        for a in [1, 2] {
            sink.write(&[()], || vec![R { a }], String::new).unwrap();
        }
        sink.finish().unwrap();
        assert_eq!(String::from_utf8(buf).unwrap(), "a\n1\n2\n");
    }
}
