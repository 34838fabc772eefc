//! Reading lists of structures: a CSV file with a `smiles` column, or one SMILES per line
//! (`-` reads standard input).

use std::io::Read;
use std::path::Path;

use crate::error::{Error, Result};

/// The SMILES of `path`, in file order.
pub fn read_smiles_file(path: &Path) -> Result<Vec<String>> {
    let mut text = String::new();
    if path == Path::new("-") {
        std::io::stdin().read_to_string(&mut text)?;
    } else {
        text = std::fs::read_to_string(path)
            .map_err(|e| Error::Input(format!("cannot read {}: {e}", path.display())))?;
    }
    parse_smiles_list(&text, path)
}

fn parse_smiles_list(text: &str, path: &Path) -> Result<Vec<String>> {
    let first = text.lines().next().unwrap_or("");
    let is_csv = first
        .split(',')
        .any(|h| h.trim().eq_ignore_ascii_case("smiles"));
    if !is_csv {
        return Ok(text
            .lines()
            .map(str::trim)
            .filter(|l| !l.is_empty() && !l.starts_with('#'))
            .map(String::from)
            .collect());
    }
    let mut reader = csv::ReaderBuilder::new()
        .flexible(true)
        .from_reader(text.as_bytes());
    let headers = reader
        .headers()
        .map_err(|e| Error::Input(format!("{}: {e}", path.display())))?
        .clone();
    let column = headers
        .iter()
        .position(|h| h.trim().eq_ignore_ascii_case("smiles"))
        .ok_or_else(|| Error::Input(format!("{}: no `smiles` column", path.display())))?;
    let mut out = Vec::new();
    for (i, record) in reader.records().enumerate() {
        let record =
            record.map_err(|e| Error::Input(format!("{} row {}: {e}", path.display(), i + 2)))?;
        out.push(record.get(column).unwrap_or("").trim().to_string());
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn csv_with_a_smiles_column() {
        let list =
            parse_smiles_list("id,SMILES,kind\n1,CCO,acid\n2,CCN,base\n", Path::new("x")).unwrap();
        assert_eq!(list, vec!["CCO", "CCN"]);
    }

    #[test]
    fn one_smiles_per_line() {
        let list = parse_smiles_list("CCO\n\n# note\nc1ccccc1O\n", Path::new("x")).unwrap();
        assert_eq!(list, vec!["CCO", "c1ccccc1O"]);
    }
}
