//! The `buffer` report: the request as typed, what to weigh, titrate or pipette, the solution
//! it makes (pH, ionic strength, capacity, constants and their source), the species of the
//! system against pH with the target marked, and the notes, warnings and cautions.

use super::{Block, Cell, Report, Section, Table};
use crate::buffer::Recipe;
use crate::report::plot::{Band, Callout, Chart, LegendEntry, Mark, Panel, Series};
use crate::report::sig;
use crate::units::{fmt_mass, fmt_moles, fmt_ph, fmt_volume};

/// The run as the user asked for it, in the user's own words.
#[derive(Debug, Clone, Default)]
pub struct BufferInputs {
    /// `--system` as typed: a table name or a SMILES.
    pub system: String,
    pub ph: String,
    pub conc: String,
    pub volume: String,
    pub temp: String,
    pub recipe: String,
    pub forms: Option<String>,
    pub titrant: Option<String>,
    pub stock_conc: Option<String>,
    pub ideal: bool,
}

/// The report of `recipe`; `species` names the forms of the system from the most protonated
/// down, `cautions` ends with the deferral.
pub fn report(
    inputs: &BufferInputs,
    recipe: &Recipe,
    species: &[String],
    cautions: Vec<String>,
) -> Report {
    let title = format!(
        "{} buffer, pH {}, {} M, {}",
        recipe.system_label,
        fmt_ph(recipe.target_ph),
        sig(recipe.conc_mol_l, 3),
        fmt_volume(recipe.volume_ml / 1e3)
    );
    let mut r = Report::new("buffer", title);
    r.summary = summary(recipe);
    r.sections.push(Section {
        title: "Inputs".into(),
        blocks: vec![Block::Facts(facts(inputs, recipe))],
    });
    let mut blocks = vec![Block::Table(components(recipe))];
    if !recipe.stocks.is_empty() {
        blocks.push(Block::Table(stocks(recipe)));
    }
    blocks.push(Block::Table(solution(recipe)));
    r.sections.push(Section {
        title: "Recipe".into(),
        blocks,
    });
    r.sections.push(Section {
        title: "Species against pH".into(),
        blocks: vec![Block::Figure {
            svg: species_chart(recipe, species).to_svg(),
            caption: format!(
                "Share of each form of the system against pH from its pKa values at {} °C \
                 (activity coefficients 1); the line marks the target, the shaded window the \
                 range within one unit of a pKa where a buffer holds its pH best (common \
                 practice).",
                recipe.temperature_c
            ),
        }],
    });
    r.notes = recipe
        .warnings
        .iter()
        .map(|w| format!("Warning: {w}"))
        .chain(recipe.notes.iter().cloned())
        .collect();
    r.cautions = cautions;
    r
}

fn measure(mass_g: Option<f64>, volume_ml: Option<f64>) -> String {
    match (mass_g, volume_ml) {
        (Some(g), _) => fmt_mass(g),
        (None, Some(ml)) => fmt_volume(ml / 1e3),
        _ => "-".into(),
    }
}

fn summary(r: &Recipe) -> Vec<String> {
    let parts: Vec<String> = r
        .components
        .iter()
        .map(|c| format!("{} {}", measure(c.mass_g, c.volume_ml), c.label))
        .collect();
    let mut line = format!("Combine {}", parts.join(", "));
    match r.water_ml {
        Some(w) => line += &format!(" and {} of water.", fmt_volume(w / 1e3)),
        None => line += &format!("; make up to {} with water.", fmt_volume(r.volume_ml / 1e3)),
    }
    let mut out = vec![line];
    out.push(format!(
        "The solution is at pH {} at {} °C; ionic strength {} M, capacity {} M per pH unit.",
        fmt_ph(r.ph),
        r.temperature_c,
        sig(r.ionic_strength, 3),
        sig(r.capacity, 3)
    ));
    if let Some(ph25) = r.ph_at_25c {
        out.push(format!(
            "Set at room temperature (25 °C), it reads pH {}.",
            fmt_ph(ph25)
        ));
    }
    out
}

fn facts(i: &BufferInputs, r: &Recipe) -> Vec<(String, Cell)> {
    let text = |s: &str| Cell::Text(s.to_string());
    let system = if r.estimated {
        Cell::Code(i.system.clone())
    } else {
        text(&format!("{} ({})", i.system, r.system_label))
    };
    let mut facts = vec![
        ("System".to_string(), system),
        ("Target pH".into(), text(&i.ph)),
        ("Concentration".into(), text(&i.conc)),
        ("Volume".into(), text(&i.volume)),
        ("Temperature".into(), text(&format!("{} °C", i.temp))),
        ("Recipe".into(), text(&i.recipe)),
        (
            "Activity model".into(),
            text(if i.ideal {
                "ideal (activity coefficients 1)"
            } else {
                "Davies equation"
            }),
        ),
    ];
    for (label, value) in [
        ("Forms", &i.forms),
        ("Titrant", &i.titrant),
        ("Stock concentration", &i.stock_conc),
    ] {
        if let Some(v) = value {
            facts.push((label.into(), text(v)));
        }
    }
    facts
}

fn components(r: &Recipe) -> Table {
    Table {
        caption: Some("What to weigh, measure or pipette".into()),
        header: ["role", "what", "formula", "amount", "weigh / measure"]
            .map(String::from)
            .to_vec(),
        rows: r
            .components
            .iter()
            .map(|c| {
                vec![
                    Cell::Text(c.role.clone()),
                    Cell::Text(c.label.clone()),
                    Cell::Text(c.formula.clone()),
                    Cell::Num(fmt_moles(c.mol)),
                    Cell::Key(measure(c.mass_g, c.volume_ml)),
                ]
            })
            .collect(),
    }
}

fn stocks(r: &Recipe) -> Table {
    Table {
        caption: Some("Stock solutions to make first".into()),
        header: ["stock", "formula", "molarity", "per litre of stock"]
            .map(String::from)
            .to_vec(),
        rows: r
            .stocks
            .iter()
            .map(|s| {
                vec![
                    Cell::Text(s.label.clone()),
                    Cell::Text(s.formula.clone()),
                    Cell::Num(format!("{} M", sig(s.molar, 3))),
                    Cell::Key(measure(s.mass_g_per_l, s.volume_ml_per_l)),
                ]
            })
            .collect(),
    }
}

fn solution(r: &Recipe) -> Table {
    let pkas: Vec<String> = r.pkas.iter().map(|p| format!("{p:.2}")).collect();
    Table {
        caption: Some("The buffer made".into()),
        header: [
            "pH",
            "ionic strength",
            "capacity (M/pH)",
            "pKa at temperature",
            "constants from",
        ]
        .map(String::from)
        .to_vec(),
        rows: vec![vec![
            Cell::Key(fmt_ph(r.ph)),
            Cell::Num(format!("{} M", sig(r.ionic_strength, 3))),
            Cell::Num(sig(r.capacity, 3)),
            Cell::Num(pkas.join(", ")),
            Cell::Text(r.source.clone()),
        ]],
    }
}

/// Fraction of each form of a polyprotic system with stepwise constants `pkas` (ascending)
/// at `ph`, most protonated first: the form that has lost i protons weighs
/// prod_{j<i} Ka_j / [H+]^i (ideal solution).
fn shares(pkas: &[f64], ph: f64) -> Vec<f64> {
    let mut logs = vec![0.0];
    for pka in pkas {
        let last = *logs.last().unwrap_or(&0.0);
        logs.push(last + ph - pka);
    }
    // Scale by the largest term so that no power of ten overflows.
    let top = logs.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let terms: Vec<f64> = logs.iter().map(|l| 10f64.powf(l - top)).collect();
    let sum: f64 = terms.iter().sum();
    terms.iter().map(|t| t / sum).collect()
}

fn species_chart(r: &Recipe, species: &[String]) -> Chart {
    let name = |i: usize| {
        species
            .get(i)
            .cloned()
            .unwrap_or_else(|| format!("form {i}"))
    };
    let n = 700;
    let grid: Vec<f64> = (0..=n).map(|k| 14.0 * k as f64 / n as f64).collect();
    let series = (0..=r.pkas.len())
        .map(|i| Series {
            label: name(i),
            look: i,
            points: grid
                .iter()
                .map(|&ph| (ph, shares(&r.pkas, ph)[i]))
                .collect(),
            // Each pKa sits where this form and the next are equal, at half or less.
            callouts: r
                .pkas
                .get(i)
                .map(|&pka| Callout {
                    x: pka,
                    y: shares(&r.pkas, pka)[i],
                    text: format!("pKa {pka:.2}"),
                })
                .into_iter()
                .collect(),
        })
        .collect();
    let nearest = r
        .pkas
        .iter()
        .copied()
        .min_by(|a, b| (a - r.target_ph).abs().total_cmp(&(b - r.target_ph).abs()));
    Chart {
        title: format!("{}: forms against pH", r.system_label),
        x_label: format!("pH ({} °C)", r.temperature_c),
        x_min: 0.0,
        x_max: 14.0,
        x_ends: ("acidic".into(), "basic".into()),
        panels: vec![Panel {
            y_label: "share of the system (%)".into(),
            y_min: 0.0,
            y_max: 1.0,
            percent: true,
            height: 300.0,
            series,
        }],
        marks: vec![Mark {
            x: r.target_ph.clamp(0.0, 14.0),
            label: format!("pH {}", fmt_ph(r.target_ph)),
        }],
        band: nearest.map(|p| Band {
            x0: (p - 1.0).max(0.0),
            x1: (p + 1.0).min(14.0),
            label: format!("pKa {p:.2} \u{b1} 1"),
        }),
        legend: (0..=r.pkas.len())
            .map(|i| LegendEntry {
                look: i,
                text: name(i),
            })
            .collect(),
        notes: vec![],
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shares_follow_henderson_hasselbalch() {
        // One constant: at pH = pKa the two forms are equal; one unit above, the base form
        // is ten times the acid form (Henderson–Hasselbalch).
        let s = shares(&[7.2], 7.2);
        assert!((s[0] - 0.5).abs() < 1e-12 && (s[1] - 0.5).abs() < 1e-12);
        let s = shares(&[7.2], 8.2);
        assert!((s[1] / s[0] - 10.0).abs() < 1e-9);
        // Three constants far apart: between the second and third pKa nearly all of it is
        // the doubly deprotonated form, and the shares add to one.
        let s = shares(&[2.15, 7.2, 12.35], 9.8);
        assert!((s.iter().sum::<f64>() - 1.0).abs() < 1e-12);
        assert!(s[2] > 0.99);
    }
}
