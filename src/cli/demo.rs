//! `phdose demo`: a workup scenario of our own, end to end — the washes after an amide
//! coupling of 3-phenylpropanoic acid with 4-fluorobenzylamine under 4-(dimethylamino)pyridine
//! catalysis. Invented amounts, real computation.

use serde::Serialize;

use super::{Cli, Format, open_store};
use crate::acidity::Handbook;
use crate::cli::pka::{PkaResult, annotate};
use crate::equilibrium::{Activity, Co2Mode, Conditions, Reagent};
use crate::error::Result;
use crate::report;
use crate::units::{Amount, fmt_moles, fmt_ph, fmt_volume};
use crate::workup::adjust::{Adjustment, Request, SoluteInput, adjust};

#[derive(Debug, clap::Args)]
pub struct Args {}

const ACID: &str = "OC(=O)CCc1ccccc1";
const AMINE: &str = "NCc1ccc(F)cc1";
const CATALYST: &str = "CN(C)c1ccncc1";
const PRODUCT: &str = "O=C(CCc1ccccc1)NCc1ccc(F)cc1";

/// One wash of the scenario.
#[derive(Debug, Serialize)]
struct Wash {
    purpose: &'static str,
    result: Adjustment,
}

#[derive(Debug, Serialize)]
struct Demo {
    scenario: &'static str,
    compounds: Vec<PkaResult>,
    washes: Vec<Wash>,
}

fn wash(
    solutes: &[(&str, f64)],
    target: f64,
    reagent: &str,
    stock: &str,
    handbook: &Handbook,
    catalogue: &[Reagent],
) -> Result<Adjustment> {
    let request = Request {
        solutes: solutes
            .iter()
            .map(|&(s, mmol)| SoluteInput {
                smiles: s.into(),
                amount: Amount::Moles(mmol * 1e-3),
                pka_override: None,
            })
            .collect(),
        water_l: 0.030,
        targets: vec![target],
        reagent: reagent.into(),
        stock: Some(stock.into()),
        // The defaults of `adjust`: Davies activities, a vented funnel.
        conditions: Conditions::standard()
            .with_activity(Activity::Davies)
            .with_co2(Co2Mode::Vented),
    };
    Ok(adjust(&request, handbook, catalogue)?.remove(0))
}

fn scenario(handbook: &Handbook) -> Result<Demo> {
    let catalogue = Reagent::builtin()?;
    let compounds = [ACID, AMINE, CATALYST, PRODUCT]
        .iter()
        .map(|s| annotate(s, handbook))
        .collect::<Result<Vec<_>>>()?;
    let washes = vec![
        Wash {
            purpose: "acid wash: protonate the leftover amine and the catalyst so they stay in water",
            result: wash(
                &[(AMINE, 0.50), (CATALYST, 0.20)],
                2.0,
                "hcl",
                "1M",
                handbook,
                &catalogue,
            )?,
        },
        Wash {
            purpose: "basic wash: deprotonate the leftover carboxylic acid so it stays in water",
            result: wash(&[(ACID, 0.80)], 7.0, "nahco3", "sat", handbook, &catalogue)?,
        },
    ];
    Ok(Demo {
        scenario: "Crude amide coupling in 40 mL ethyl acetate: 9.0 mmol amide product, 0.80 mmol \
                   unreacted 3-phenylpropanoic acid, 0.50 mmol unreacted 4-fluorobenzylamine, 0.20 mmol \
                   4-(dimethylamino)pyridine. Each wash uses 30 mL of water; the ionized compounds are \
                   taken to be in the aqueous layer.",
        compounds,
        washes,
    })
}

fn text(demo: &Demo) -> String {
    let mut out = format!(
        "Scenario: {}\n\nSites (pKa of the conjugate acid):\n",
        demo.scenario
    );
    for c in &demo.compounds {
        if c.sites.is_empty() {
            out += &format!(
                "  {:<32} no site that titrates in water: stays neutral, stays organic\n",
                c.smiles
            );
        }
        for s in &c.sites {
            out += &format!(
                "  {:<32} atom {:>2}  {:<30} {} pKa {:.1} ({:.1}-{:.1})\n",
                c.smiles,
                s.atom,
                s.group,
                s.kind.as_str(),
                s.pka,
                s.pka_low,
                s.pka_high
            );
        }
    }
    for (i, w) in demo.washes.iter().enumerate() {
        let r = &w.result;
        let measure =
            report::dose_measure(r.stock_volume_ml, r.reagent_mass_g, &r.stock, &r.reagent)
                .unwrap_or_default();
        out += &format!(
            "\nWash {}: {}\n  add {} ({}) to reach pH {} (layer now {})\n",
            i + 1,
            w.purpose,
            measure,
            fmt_moles(r.reagent_mol),
            fmt_ph(r.ph),
            fmt_volume(r.aqueous_volume_ml / 1e3)
        );
        for s in &r.solutes {
            out += &format!(
                "  {:<32} {:>5.1} % ionized\n",
                s.smiles,
                100.0 * (1.0 - s.fraction_neutral)
            );
        }
        out += "  Cautions:\n";
        for c in &r.cautions {
            out += &format!("    - {c}\n");
        }
    }
    out
}

pub fn run(_args: &Args, cli: &Cli) -> Result<String> {
    let handbook = Handbook::from_store(&open_store(&cli.db)?, false)?;
    let demo = scenario(&handbook)?;
    match cli.format {
        Format::Json | Format::Jsonl => report::json(&demo),
        Format::Table | Format::Csv => Ok(text(&demo)),
    }
}
