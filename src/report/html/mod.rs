//! Printable reports: one self-contained HTML file per run, for the lab notebook.
//!
//! A command describes its report as data ([`Report`]: a summary, sections of facts, tables and
//! figures, notes and cautions) and [`Report::to_html`] lays it out. The page carries its own
//! CSS and inline SVG and fetches nothing (no fonts, scripts or images from anywhere), so it
//! opens the same offline, in ten years, or attached to an e-mail. It prints on A4 with page
//! numbers, tables that repeat their header and keep rows whole across a page break, and
//! colours that survive a monochrome printer.
//!
//! Everything the user typed passes through [`escape`] before it reaches the page.

pub mod adjust;
pub mod buffer;
pub mod check;
mod date;
pub mod figure;
pub mod plan;

use std::fmt::Write as _;
use std::path::Path;

pub use super::svg::escape;
use crate::error::{Error, Result};

/// The page's stylesheet, inlined into every report.
const STYLE: &str = include_str!("page.css");

/// A table cell: how it reads decides how it is set.
#[derive(Debug, Clone, PartialEq)]
pub enum Cell {
    /// Words, left-aligned.
    Text(String),
    /// A structure or other typed code (SMILES exactly as given): monospace, may break anywhere.
    Code(String),
    /// A number with its unit, right-aligned in tabular figures.
    Num(String),
    /// The result a reader is looking for: a number set in bold.
    Key(String),
}

impl Cell {
    fn class(&self) -> &'static str {
        match self {
            Cell::Text(_) => "",
            Cell::Code(_) => " class=\"code\"",
            Cell::Num(_) => " class=\"num\"",
            Cell::Key(_) => " class=\"num key\"",
        }
    }

    fn text(&self) -> &str {
        match self {
            Cell::Text(t) | Cell::Code(t) | Cell::Num(t) | Cell::Key(t) => t,
        }
    }

    fn html(&self) -> String {
        match self {
            // A short structure stays on one line; a long one may break anywhere.
            Cell::Code(t) if t.chars().count() <= SHORT_CODE => {
                format!("<code class=\"whole\">{}</code>", escape(t))
            }
            Cell::Code(t) => format!("<code>{}</code>", escape(t)),
            other => escape(other.text()),
        }
    }
}

/// Longest code (SMILES) kept on one line in a table.
const SHORT_CODE: usize = 24;

/// Tables up to this many rows are kept whole on one printed page; longer ones break between
/// rows and repeat their header.
const SHORT_TABLE: usize = 14;

/// A table with a caption, a header row and rows of cells.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Table {
    pub caption: Option<String>,
    pub header: Vec<String>,
    pub rows: Vec<Vec<Cell>>,
}

/// One piece of a section.
#[derive(Debug, Clone, PartialEq)]
pub enum Block {
    /// Label and value pairs (the inputs as given).
    Facts(Vec<(String, Cell)>),
    Table(Table),
    /// An `<svg>` element (from [`crate::report::plot::Chart::to_svg`]) and its caption. The
    /// SVG is trusted markup built by phdose, whose text is escaped where it is written.
    Figure {
        svg: String,
        caption: String,
    },
    /// A paragraph of plain text.
    Text(String),
    /// What went wrong, each with its fix, set apart so that it cannot be missed: a
    /// heading (`Step 3 (line 33)`), the problem and the fix.
    Alerts(Vec<Alert>),
    /// Text exactly as the user wrote it (a procedure file), in monospace with its lines.
    Listing(String),
}

/// One problem as a report shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct Alert {
    pub heading: String,
    pub message: String,
    pub fix: String,
}

/// A titled part of the report.
#[derive(Debug, Clone, PartialEq)]
pub struct Section {
    pub title: String,
    pub blocks: Vec<Block>,
}

/// A whole report, ready to lay out.
#[derive(Debug, Clone, PartialEq)]
pub struct Report {
    /// The command that made it (`adjust`, `plan`, `check`, `buffer`).
    pub command: String,
    pub title: String,
    /// The answer in a few sentences, shown first.
    pub summary: Vec<String>,
    pub sections: Vec<Section>,
    pub notes: Vec<String>,
    /// In the order given; the last one, the deferral to local rules, the SDS and lab
    /// practice, stays last on the page.
    pub cautions: Vec<String>,
    /// `phdose --version` text: program and data-table versions.
    pub version: String,
    /// When the report was made (`2025-03-14 09:26 UTC`).
    pub generated: String,
}

impl Report {
    /// An empty report for `command`, stamped with the version and the current time.
    pub fn new(command: &str, title: impl Into<String>) -> Report {
        Report {
            command: command.into(),
            title: title.into(),
            summary: vec![],
            sections: vec![],
            notes: vec![],
            cautions: vec![],
            version: crate::cli::shell::long_version().to_string(),
            generated: date::now_utc(),
        }
    }

    /// The whole page.
    pub fn to_html(&self) -> String {
        let mut out = String::with_capacity(64 * 1024);
        let title = escape(&self.title);
        let _ = write!(
            out,
            "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n\
             <meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n\
             <meta name=\"generator\" content=\"phdose {version}\">\n\
             <title>{title} \u{2014} phdose</title>\n<style>\n{STYLE}</style>\n</head>\n\
             <body>\n<main class=\"sheet\">\n",
            version = escape(&self.version),
        );
        self.masthead(&mut out);
        for section in &self.sections {
            write_section(&mut out, section);
        }
        self.closing(&mut out);
        let _ = write!(
            out,
            "<footer class=\"colophon\">Made by phdose {} on {}. Computed from tables and \
             models, not measured: check the pH of the layer itself.</footer>\n</main>\n\
             </body>\n</html>\n",
            escape(&self.version),
            escape(&self.generated)
        );
        out
    }

    /// Title, stamp, blanks for the notebook and the answer in words.
    fn masthead(&self, out: &mut String) {
        let _ = write!(
            out,
            "<header class=\"masthead\">\n<p class=\"kicker\">phdose \u{b7} {command} \
             report</p>\n<h1>{title}</h1>\n<p class=\"stamp\">Generated {generated}</p>\n\
             <table class=\"notebook\"><tr><td>Notebook / page</td><td>Operator</td>\
             <td>Date</td><td>Signature</td></tr></table>\n</header>\n",
            command = escape(&self.command),
            title = escape(&self.title),
            generated = escape(&self.generated),
        );
        if !self.summary.is_empty() {
            out.push_str("<section class=\"summary\">\n");
            for line in &self.summary {
                let _ = writeln!(out, "<p>{}</p>", escape(line));
            }
            if !self.cautions.is_empty() {
                let _ = writeln!(
                    out,
                    "<p class=\"see\">{} caution{} at the end of this report: read them \
                     before you start.</p>",
                    self.cautions.len(),
                    if self.cautions.len() == 1 { "" } else { "s" }
                );
            }
            out.push_str("</section>\n");
        }
    }

    /// Notes, then the cautions, the deferral last of all.
    fn closing(&self, out: &mut String) {
        if !self.notes.is_empty() {
            out.push_str("<section class=\"notes\">\n<h2>Notes</h2>\n<ul>\n");
            for n in &self.notes {
                // A note that warns (a model pushed past its range) must not read as routine.
                let class = if n.contains("Warning:") {
                    " class=\"warn\""
                } else {
                    ""
                };
                let _ = writeln!(out, "<li{class}>{}</li>", escape(n));
            }
            out.push_str("</ul>\n</section>\n");
        }
        if let Some((last, rest)) = self.cautions.split_last() {
            out.push_str(
                "<section class=\"cautions\" role=\"note\">\n<h2>\u{26a0} Cautions</h2>\n<ul>\n",
            );
            for c in rest {
                let _ = writeln!(out, "<li>{}</li>", escape(c));
            }
            let _ = writeln!(out, "</ul>\n<p class=\"deferral\">{}</p>", escape(last));
            out.push_str("</section>\n");
        }
    }
}

fn write_section(out: &mut String, section: &Section) {
    let _ = writeln!(out, "<section>\n<h2>{}</h2>", escape(&section.title));
    for block in &section.blocks {
        match block {
            Block::Facts(facts) => {
                out.push_str("<dl class=\"facts\">\n");
                for (label, value) in facts {
                    let _ = writeln!(
                        out,
                        "<div><dt>{}</dt><dd{}>{}</dd></div>",
                        escape(label),
                        value.class(),
                        value.html()
                    );
                }
                out.push_str("</dl>\n");
            }
            Block::Table(t) => write_table(out, t),
            Block::Figure { svg, caption } => {
                let _ = writeln!(
                    out,
                    "<figure>\n{svg}<figcaption>{}</figcaption>\n</figure>",
                    escape(caption)
                );
            }
            Block::Text(t) => {
                let _ = writeln!(out, "<p>{}</p>", escape(t));
            }
            Block::Alerts(alerts) => {
                out.push_str("<ol class=\"alerts\" role=\"alert\">\n");
                for a in alerts {
                    let _ = writeln!(
                        out,
                        "<li><p class=\"where\">{}</p><p class=\"what\">{}</p>\
                         <p class=\"fix\"><span>Fix:</span> {}</p></li>",
                        escape(&a.heading),
                        escape(&a.message),
                        escape(&a.fix)
                    );
                }
                out.push_str("</ol>\n");
            }
            Block::Listing(t) => {
                let _ = writeln!(out, "<pre class=\"listing\">{}</pre>", escape(t));
            }
        }
    }
    out.push_str("</section>\n");
}

fn write_table(out: &mut String, t: &Table) {
    let class = if t.rows.len() <= SHORT_TABLE {
        "data whole"
    } else {
        "data"
    };
    let _ = writeln!(out, "<table class=\"{class}\">");
    if let Some(c) = &t.caption {
        let _ = writeln!(out, "<caption>{}</caption>", escape(c));
    }
    // A column of numbers has its heading over the figures, on the right.
    let numeric = |i: usize| {
        t.rows
            .first()
            .and_then(|r| r.get(i))
            .is_some_and(|c| matches!(c, Cell::Num(_) | Cell::Key(_)))
    };
    out.push_str("<thead><tr>");
    for (i, h) in t.header.iter().enumerate() {
        let class = if numeric(i) { " class=\"num\"" } else { "" };
        let _ = write!(out, "<th{class}>{}</th>", escape(h));
    }
    out.push_str("</tr></thead>\n<tbody>\n");
    for row in &t.rows {
        out.push_str("<tr>");
        for cell in row {
            let _ = write!(out, "<td{}>{}</td>", cell.class(), cell.html());
        }
        out.push_str("</tr>\n");
    }
    out.push_str("</tbody>\n</table>\n");
}

/// The cautions of several results (targets, steps) as one list: each once, in first-seen
/// order, and the deferral to local rules and the SDS, which ends every list, last.
pub fn merge_cautions<'a>(lists: impl IntoIterator<Item = &'a [String]>) -> Vec<String> {
    let lists: Vec<&[String]> = lists.into_iter().collect();
    let deferral = lists.iter().find_map(|l| l.last());
    let mut out: Vec<String> = Vec::new();
    for c in lists.iter().flat_map(|l| l.iter()) {
        if Some(c) != deferral && !out.contains(c) {
            out.push(c.clone());
        }
    }
    out.extend(deferral.cloned());
    out
}

/// Writes `html` to `path`. A path that cannot be a file (its folder is missing, or it names a
/// folder) is bad input (exit 2); a write that fails on a good path is an I/O error (exit 1).
pub fn write(path: &Path, html: &str) -> Result<()> {
    let shown = path.display();
    if path.is_dir() {
        return Err(Error::Input(format!(
            "--html {shown}: that is a directory; name a file such as report.html"
        )));
    }
    let parent = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    if !parent.is_dir() {
        return Err(Error::Input(format!(
            "--html {shown}: the directory {} does not exist",
            parent.display()
        )));
    }
    std::fs::write(path, html).map_err(|e| {
        Error::Io(std::io::Error::new(
            e.kind(),
            format!("cannot write the report to {shown}: {e}"),
        ))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> Report {
        let mut r = Report::new("adjust", "pH <8> & more");
        r.generated = "2025-01-02 03:04 UTC".into();
        r.summary = vec!["Add <b>1 mL</b>".into()];
        r.sections.push(Section {
            title: "Inputs".into(),
            blocks: vec![
                Block::Facts(vec![("solute".into(), Cell::Code("C[NH3+]<x>".into()))]),
                Block::Table(Table {
                    caption: Some("doses".into()),
                    header: vec!["SMILES".into(), "mmol".into()],
                    rows: vec![vec![Cell::Code("CC&O".into()), Cell::Num("2.50".into())]],
                }),
            ],
        });
        r.notes = vec!["a note".into(), "For pH 9: Warning: rough".into()];
        r.cautions = vec!["first".into(), "defer to the SDS".into()];
        r
    }

    #[test]
    fn user_text_is_escaped_everywhere() {
        let html = sample().to_html();
        assert!(html.contains("pH &lt;8&gt; &amp; more"));
        assert!(html.contains("<code class=\"whole\">C[NH3+]&lt;x&gt;</code>"));
        assert!(html.contains("<code class=\"whole\">CC&amp;O</code>"));
        assert!(html.contains("Add &lt;b&gt;1 mL&lt;/b&gt;"));
        assert!(!html.contains("<b>"));
    }

    #[test]
    fn the_page_fetches_nothing_and_prints_on_a4() {
        let html = sample().to_html();
        for outside in [
            "http:", "https:", "<script", "<link", "<img", "@import", "url(",
        ] {
            assert!(!html.contains(outside), "{outside}");
        }
        assert!(html.contains("@page") && html.contains("size: A4"));
        assert!(html.contains(&escape(crate::cli::shell::long_version())));
    }

    #[test]
    fn the_deferral_is_the_last_thing_before_the_footer() {
        let html = sample().to_html();
        let deferral = html.find("defer to the SDS").unwrap();
        assert!(html.find("first").unwrap() < deferral);
        assert!(html.find("a note").unwrap() < deferral);
        let after = &html[deferral..];
        assert!(!after.contains("<li>") && !after.contains("<table"));
        assert!(html.contains("2 cautions at the end"));
        assert!(html.contains("<li class=\"warn\">For pH 9: Warning: rough</li>"));
    }

    #[test]
    fn cautions_of_several_steps_merge_with_the_deferral_last() {
        let s = |v: &[&str]| v.iter().map(|x| x.to_string()).collect::<Vec<_>>();
        let first = s(&["corrosive", "defer"]);
        let second = s(&["gas", "corrosive", "defer"]);
        let merged = merge_cautions([first.as_slice(), second.as_slice()]);
        assert_eq!(merged, ["corrosive", "gas", "defer"]);
        assert!(merge_cautions([]).is_empty());
    }

    #[test]
    fn alerts_and_listings_are_escaped_and_set_apart() {
        let mut r = sample();
        r.sections.push(Section {
            title: "Problems".into(),
            blocks: vec![
                Block::Alerts(vec![Alert {
                    heading: "Step 3 (line 33)".into(),
                    message: "pH <8".into(),
                    fix: "go > 11".into(),
                }]),
                Block::Listing("do = \"add\"\n# a & b".into()),
            ],
        });
        let html = r.to_html();
        assert!(html.contains("<ol class=\"alerts\" role=\"alert\">"));
        assert!(html.contains("<p class=\"what\">pH &lt;8</p>"));
        assert!(html.contains("<span>Fix:</span> go &gt; 11"));
        assert!(html.contains("<pre class=\"listing\">do = &quot;add&quot;\n# a &amp; b</pre>"));
    }

    #[test]
    fn numeric_columns_are_right_aligned_with_their_heading() {
        let html = sample().to_html();
        assert!(html.contains("<th>SMILES</th><th class=\"num\">mmol</th>"));
        assert!(html.contains("<td class=\"num\">2.50</td>"));
    }

    #[test]
    fn a_missing_folder_is_bad_input_and_a_good_path_is_written() {
        let dir = std::env::temp_dir().join(format!("phdose-html-unit-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let missing = dir.join("no-such-dir").join("r.html");
        assert!(matches!(write(&missing, "x"), Err(Error::Input(_))));
        assert!(matches!(write(&dir, "x"), Err(Error::Input(_))));
        let good = dir.join("r.html");
        write(&good, "<p>x</p>").unwrap();
        assert_eq!(std::fs::read_to_string(&good).unwrap(), "<p>x</p>");
        std::fs::remove_dir_all(&dir).unwrap();
    }
}
