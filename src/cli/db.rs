//! `phdose db`: the user's own measured pKa values — add, list, remove, import, export.
//!
//! Values are stored per structure (any spelling of one compound, salt or free form, finds the
//! same row) and win over the built-in handbook rows and the estimates in every later run.
//! Import and export use one CSV layout, `smiles,kind,pka,note,added`, one row per constant,
//! so an exported file imports back to the same rows.

use std::io::Read;
use std::path::{Path, PathBuf};

use clap::Subcommand;
use serde::{Deserialize, Serialize};
use tabled::Tabled;

use super::{Cli, Format, open_store};
use crate::acidity::group::Kind;
use crate::acidity::{Handbook, Profile};
use crate::error::{Error, ParseError, Result};
use crate::report;
use crate::store::Store;
use crate::store::measured::{
    Constant, UserEntry, UserMeasured, WrittenConstant, parse_constants, parse_kind,
};

#[derive(Debug, clap::Args)]
pub struct Args {
    #[command(subcommand)]
    pub action: Action,
}

#[derive(Debug, Subcommand)]
pub enum Action {
    /// Store your measured pKa value(s) for a structure (replaces your earlier values for it).
    Add {
        /// The structure as SMILES (a salt or charged spelling is stored for its neutral parent).
        smiles: String,
        /// The constant(s): `4.2`, `4.2,9.8`, or with kinds `acid:4.2,base:9.8`.
        #[arg(long, value_name = "LIST")]
        pka: String,
        /// Kind of each value (`acid`, `base`, comma-separated, or one for all). Without kinds,
        /// phdose takes them from the sites it finds when their number matches.
        #[arg(long, value_name = "LIST")]
        kind: Option<String>,
        /// Free text kept with the value (method, notebook page, conditions).
        #[arg(long, value_name = "TEXT", default_value = "")]
        note: String,
    },
    /// Your stored values (`--builtin`: the built-in handbook table instead).
    List {
        #[arg(long)]
        builtin: bool,
    },
    /// Remove stored values by id (from `list`) or by structure (all values of that compound).
    Remove {
        #[arg(required = true, value_name = "ID|SMILES")]
        targets: Vec<String>,
    },
    /// Add values from a CSV file (`smiles,kind,pka[,note][,added]`; `-` reads stdin).
    Import { file: PathBuf },
    /// Write your values as CSV (to FILE, or to standard output).
    Export { file: Option<PathBuf> },
}

/// One exported or imported row.
#[derive(Debug, Serialize, Deserialize, PartialEq)]
struct CsvRow {
    smiles: String,
    kind: String,
    pka: f64,
    #[serde(default)]
    note: String,
    #[serde(default)]
    added: String,
}

#[derive(Tabled, Serialize)]
struct ListRow {
    id: String,
    smiles: String,
    kind: String,
    pka: String,
    note: String,
    added: String,
}

fn list_rows(rows: &[UserMeasured]) -> Vec<ListRow> {
    rows.iter()
        .map(|r| ListRow {
            id: r.id.to_string(),
            smiles: r.smiles.clone(),
            kind: r.kind.as_str().into(),
            pka: r.pka.to_string(),
            note: r.note.clone(),
            added: r.added.clone(),
        })
        .collect()
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    // Opened per action, so a bad import file is reported before any store is created.
    let store = || open_store(&cli.db);
    match &args.action {
        Action::Add {
            smiles,
            pka,
            kind,
            note,
        } => add(&store()?, smiles, pka, kind.as_deref(), note, cli.format),
        Action::List { builtin: false } => show(&store()?.user_measured()?, cli.format),
        Action::List { builtin: true } => {
            let rows = store()?.builtin_measured()?;
            match cli.format {
                Format::Json => report::json(&rows),
                Format::Jsonl => report::jsonl(&rows),
                Format::Csv => report::csv(&rows),
                Format::Table => Ok(report::table(&builtin_table(&rows))),
            }
        }
        Action::Remove { targets } => remove(&store()?, targets),
        Action::Import { file } => {
            let entries = read_import(file)?;
            let (ids, replaced) = store()?.put_user_measured(&entries)?;
            Ok(format!(
                "imported {} value(s){}\n",
                ids.len(),
                replaced_text(replaced)
            ))
        }
        Action::Export { file } => {
            let store = store()?;
            let text = export(&store)?;
            match file {
                None => Ok(text),
                Some(path) => {
                    std::fs::write(path, &text).map_err(|e| {
                        Error::Input(format!("cannot write {}: {e}", path.display()))
                    })?;
                    let n = store.user_measured()?.len();
                    Ok(format!("exported {n} value(s) to {}\n", path.display()))
                }
            }
        }
    }
}

fn replaced_text(replaced: usize) -> String {
    if replaced == 0 {
        String::new()
    } else {
        format!(" (replaced {replaced} earlier value(s) of the same structure)")
    }
}

fn show(rows: &[UserMeasured], format: Format) -> Result<String> {
    match format {
        Format::Json => report::json(rows),
        Format::Jsonl => report::jsonl(rows),
        Format::Csv => report::csv(&list_rows(rows)),
        Format::Table if rows.is_empty() => {
            Ok("no stored values yet; add one with `phdose db add SMILES --pka VALUE`\n".into())
        }
        Format::Table => Ok(report::table(&list_rows(rows))),
    }
}

#[derive(Tabled)]
struct BuiltinRow {
    name: String,
    smiles: String,
    kind: String,
    pka: String,
    source: String,
}

fn builtin_table(rows: &[crate::store::measured::BuiltinMeasured]) -> Vec<BuiltinRow> {
    rows.iter()
        .map(|r| BuiltinRow {
            name: r.name.clone(),
            smiles: r.smiles.clone(),
            kind: r.kind.as_str().into(),
            pka: format!("{:.2}", r.pka),
            source: r.source.clone(),
        })
        .collect()
}

fn add(
    store: &Store,
    smiles: &str,
    pka: &str,
    kind: Option<&str>,
    note: &str,
    format: Format,
) -> Result<String> {
    let written = parse_constants(pka)?;
    let constants = resolve_kinds(store, smiles, &written, kind)?;
    let entry = UserEntry {
        smiles: smiles.to_string(),
        constants,
        note: note.to_string(),
        added: None,
    };
    let (ids, replaced) = store.put_user_measured(&[entry])?;
    let rows: Vec<UserMeasured> = store
        .user_measured()?
        .into_iter()
        .filter(|r| ids.contains(&r.id))
        .collect();
    let mut out = show(&rows, format)?;
    if format == Format::Table && replaced > 0 {
        out += &format!("{}\n", replaced_text(replaced).trim());
    }
    Ok(out)
}

/// Gives every value a kind: its own `kind:` prefix, else `--kind` (one per value or one for
/// all), else the kinds of the sites phdose finds, paired in pKa order, when the counts match.
fn resolve_kinds(
    store: &Store,
    smiles: &str,
    written: &[WrittenConstant],
    kind: Option<&str>,
) -> Result<Vec<Constant>> {
    let given: Option<Vec<Kind>> = match kind {
        None => None,
        Some(text) => Some(read_kinds(text)?),
    };
    if let Some(kinds) = &given
        && kinds.len() != 1
        && kinds.len() != written.len()
    {
        return Err(Error::Input(format!(
            "--kind gives {} kind(s) for {} value(s); give one per value or one for all",
            kinds.len(),
            written.len()
        )));
    }
    let inferred = if written.iter().any(|w| w.0.is_none()) && given.is_none() {
        Some(kinds_from_sites(store, smiles, written)?)
    } else {
        None
    };
    Ok(written
        .iter()
        .enumerate()
        .map(|(i, &(own, pka))| {
            let kind = own
                .or_else(|| given.as_ref().map(|k| k[i.min(k.len() - 1)]))
                .or_else(|| inferred.as_ref().map(|k| k[i]))
                .unwrap_or(Kind::Acid);
            Constant { kind, pka }
        })
        .collect())
}

fn read_kinds(text: &str) -> Result<Vec<Kind>> {
    let mut out = Vec::new();
    let mut at = 0;
    for item in text.split(',') {
        let kind = parse_kind(item.trim())
            .ok_or_else(|| ParseError::new("kind list", text, at, "kind must be acid or base"))?;
        out.push(kind);
        at += item.len() + 1;
    }
    Ok(out)
}

/// The kinds of the estimated sites, lowest estimate first, matched to the values sorted the
/// same way; only when there are as many sites as values.
fn kinds_from_sites(store: &Store, smiles: &str, written: &[WrittenConstant]) -> Result<Vec<Kind>> {
    let handbook = Handbook::from_store(store, true)?;
    let profile = Profile::new(smiles, &handbook)?;
    if profile.sites.len() != written.len() {
        return Err(Error::Input(format!(
            "phdose finds {} site(s) in {smiles} but {} value(s) were given; say which kind each \
             value is: --pka acid:4.2,base:9.8 or --kind acid,base",
            profile.sites.len(),
            written.len()
        )));
    }
    let mut sites: Vec<(f64, Kind)> = profile.sites.iter().map(|s| (s.pka, s.kind)).collect();
    sites.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut order: Vec<usize> = (0..written.len()).collect();
    order.sort_by(|&a, &b| written[a].1.total_cmp(&written[b].1));
    let mut kinds = vec![Kind::Acid; written.len()];
    for (rank, &i) in order.iter().enumerate() {
        kinds[i] = sites[rank].1;
    }
    Ok(kinds)
}

fn remove(store: &Store, targets: &[String]) -> Result<String> {
    let mut removed = 0;
    for target in targets {
        let n = match target.trim().parse::<i64>() {
            Ok(id) => store.remove_user_measured_id(id)?,
            Err(_) => store.remove_user_measured_smiles(target)?,
        };
        if n == 0 {
            return Err(Error::Input(format!(
                "no stored value matches {target} (see `phdose db list`)"
            )));
        }
        removed += n;
    }
    Ok(format!("removed {removed} value(s)\n"))
}

fn export(store: &Store) -> Result<String> {
    let rows: Vec<CsvRow> = store
        .user_measured()?
        .into_iter()
        .map(|r| CsvRow {
            smiles: r.smiles,
            kind: r.kind.as_str().into(),
            pka: r.pka,
            note: r.note,
            added: r.added,
        })
        .collect();
    if rows.is_empty() {
        return Ok("smiles,kind,pka,note,added\n".into());
    }
    report::csv(&rows)
}

/// Reads and checks a whole import file before anything is stored.
fn read_import(path: &Path) -> Result<Vec<UserEntry>> {
    let mut text = String::new();
    if path == Path::new("-") {
        std::io::stdin().read_to_string(&mut text)?;
    } else {
        text = std::fs::read_to_string(path)
            .map_err(|e| Error::Input(format!("cannot read {}: {e}", path.display())))?;
    }
    let mut reader = csv::Reader::from_reader(text.as_bytes());
    let mut entries = Vec::new();
    for (i, row) in reader.deserialize::<CsvRow>().enumerate() {
        // Line numbers count the header as line 1.
        let line = i + 2;
        let bad = |why: String| Error::Input(format!("{} line {line}: {why}", path.display()));
        let row = row.map_err(|e| bad(e.to_string()))?;
        let kind = parse_kind(row.kind.trim())
            .ok_or_else(|| bad(format!("kind '{}' is not acid or base", row.kind)))?;
        // The same range `db add` accepts (see `parse_constants`).
        if !(-5.0..=25.0).contains(&row.pka) {
            return Err(bad(format!(
                "pKa {} is not an aqueous value (-5 to 25)",
                row.pka
            )));
        }
        crate::chem::canon::key(&row.smiles).map_err(|e| bad(e.to_string()))?;
        let added = row.added.trim();
        if !added.is_empty() && !is_date(added) {
            return Err(bad(format!("added '{added}' is not a date YYYY-MM-DD")));
        }
        entries.push(UserEntry {
            smiles: row.smiles,
            constants: vec![Constant { kind, pka: row.pka }],
            note: row.note,
            added: (!added.is_empty()).then(|| added.to_string()),
        });
    }
    Ok(entries)
}

fn is_date(text: &str) -> bool {
    let b = text.as_bytes();
    b.len() == 10
        && b[4] == b'-'
        && b[7] == b'-'
        && b.iter()
            .enumerate()
            .all(|(i, c)| i == 4 || i == 7 || c.is_ascii_digit())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates_are_checked() {
        assert!(is_date("2026-11-02"));
        assert!(!is_date("2026/11/02"));
        assert!(!is_date("yesterday"));
    }

    #[test]
    fn kinds_come_from_prefixes_flags_or_sites() {
        let store = Store::in_memory().unwrap();
        let k = |smiles, pka, kind| -> Result<Vec<Kind>> {
            let written = parse_constants(pka)?;
            Ok(resolve_kinds(&store, smiles, &written, kind)?
                .iter()
                .map(|c| c.kind)
                .collect())
        };
        assert_eq!(
            k("NCC(=O)O", "acid:2.3,base:9.6", None).unwrap(),
            [Kind::Acid, Kind::Base]
        );
        assert_eq!(
            k("NCCN", "7,10", Some("base")).unwrap(),
            [Kind::Base, Kind::Base]
        );
        // Glycine: the lower value goes with the carboxylic acid site, the higher with the amine.
        assert_eq!(
            k("NCC(=O)O", "9.6,2.3", None).unwrap(),
            [Kind::Base, Kind::Acid]
        );
        assert!(matches!(k("NCC(=O)O", "9.6", None), Err(Error::Input(_))));
        assert!(matches!(
            k("NCC(=O)O", "2,9", Some("acid,base,acid")),
            Err(Error::Input(_))
        ));
        assert!(matches!(
            k("NCC(=O)O", "2", Some("acd")),
            Err(Error::Parse(_))
        ));
    }
}
