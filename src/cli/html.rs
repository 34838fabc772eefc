//! `--html FILE`: the printable report of a command, written beside its usual output.
//!
//! Each command makes one call here after its results are computed. [`write_report`] is the
//! hook every command shares: a command builds its [`Report`] and hands it over, as in
//! `write_report(args.html.as_deref(), || Ok(my_report(&result)))?`. [`adjust`] and
//! [`buffer`] gather what their reports need that the results do not hold: the flags as
//! typed, each solute's curves, the cautions of what is handled; [`plan`] and [`check`] the
//! same for theirs.

use std::path::Path;

use super::adjust::{Args, solute_pairs};
use super::curve::logp_of;
use super::{Cli, open_store};
use crate::acidity::{Handbook, Profile};
use crate::buffer::{BufferSystem, Recipe};
use crate::chem::formula::molar_mass;
use crate::equilibrium::StockForm;
use crate::error::{Error, Result};
use crate::report::html::adjust::{AdjustInputs, SoluteCurves, report};
use crate::report::html::buffer::BufferInputs;
use crate::report::html::check::CheckInputs;
use crate::report::html::plan::PlanInputs;
use crate::report::html::{self, Report, merge_cautions};
use crate::report::ionization::Compound;
use crate::workup::adjust::{Adjustment, Request, SoluteInput};
use crate::workup::cautions::{Situation, cautions_for};
use crate::workup::plan::{Plan, PlanRequest};
use crate::workup::procedure::Report as CheckedProcedure;

/// Builds the report and writes it to `path`, when one is asked for. Path problems are bad
/// input (exit 2), a failed write an I/O error (exit 1); see [`html::write`].
pub fn write_report(path: Option<&Path>, build: impl FnOnce() -> Result<Report>) -> Result<()> {
    match path {
        Some(path) => html::write(path, &build()?.to_html()),
        None => Ok(()),
    }
}

/// The `adjust` report of `results` for the run `args` / `request`, written to `args.html`.
pub fn adjust(
    args: &Args,
    request: &Request,
    handbook: &Handbook,
    results: &[Adjustment],
) -> Result<()> {
    write_report(args.html.as_deref(), || {
        let inputs = AdjustInputs {
            solutes: request
                .solutes
                .iter()
                .map(|s| (s.smiles.clone(), s.amount))
                .collect(),
            water: args.water.clone(),
            to_ph: args.to_ph.clone(),
            reagent: args.reagent.clone(),
            stock: args.stock.clone(),
            pka_overrides: args
                .pka
                .chunks(2)
                .filter_map(|p| Some((p.first()?.clone(), p.get(1)?.clone())))
                .collect(),
            estimate_only: args.estimate_only,
            organic: args.organic.clone(),
            solvent: args.solvent.clone(),
            washes: args.washes,
        };
        let curves = solute_curves(&request.solutes, handbook, args.estimate_only)?;
        Ok(report(&inputs, results, &curves))
    })
}

/// Each solute's curves and molar mass, from the same profile the command solved with (user
/// pKa values included), in input order.
fn solute_curves(
    solutes: &[SoluteInput],
    handbook: &Handbook,
    estimate_only: bool,
) -> Result<Vec<SoluteCurves>> {
    let mut curves = Vec::with_capacity(solutes.len());
    for s in solutes {
        let mut profile = Profile::new(&s.smiles, handbook)?;
        if let Some(values) = &s.pka_override {
            profile.override_pkas(values)?;
        }
        curves.push(SoluteCurves {
            compound: compound_of(&profile, estimate_only)?,
            molar_mass: molar_mass(&profile.molecule),
        });
    }
    Ok(curves)
}

/// The curves of one profile, with its octanol logP where one is known.
fn compound_of(profile: &Profile, estimate_only: bool) -> Result<Compound> {
    let logp = logp_of(profile, estimate_only)?;
    let mut compound = Compound::new(profile, logp.as_ref().map(|l| l.log_p));
    compound.logp_source = logp.map(|l| l.source);
    Ok(compound)
}

/// The `plan` report of `result` for the run `args` / `request`, written to `args.html`.
pub fn plan(
    args: &super::plan::Args,
    request: &PlanRequest,
    handbook: &Handbook,
    result: &Plan,
) -> Result<()> {
    write_report(args.html.as_deref(), || {
        let inputs = PlanInputs {
            solutes: solute_pairs(&args.solute)?,
            organic: args.organic.clone(),
            solvent: args.solvent.clone(),
            water: args.water.clone(),
            keep: args.keep.clone(),
            temp: args.temp.clone(),
            ideal: args.ideal,
            estimate_only: args.estimate_only,
        };
        let curves = solute_curves(&request.solutes, handbook, args.estimate_only)?;
        Ok(html::plan::report(&inputs, result, &curves))
    })
}

/// The `check` report of `checked`, written to `args.html` (problems or not). The file is read
/// again for the page, and each compound's curves come from the same store the check used.
pub fn check(args: &super::check::Args, cli: &Cli, checked: &CheckedProcedure) -> Result<()> {
    write_report(args.html.as_deref(), || {
        let text = std::fs::read_to_string(&args.file)
            .map_err(|e| Error::Input(format!("cannot read {}: {e}", args.file.display())))?;
        let handbook = Handbook::from_store(&open_store(&cli.db)?, args.estimate_only)?;
        let mut compounds = Vec::new();
        for h in checked.start.layers.iter().flat_map(|l| &l.compounds) {
            let profile = Profile::new(&h.smiles, &handbook)?;
            compounds.push(compound_of(&profile, args.estimate_only)?);
        }
        let inputs = CheckInputs {
            file: args.file.display().to_string(),
            text,
            estimate_only: args.estimate_only,
        };
        Ok(html::check::report(&inputs, checked, &compounds))
    })
}

/// The `buffer` report of `recipe`, written to `args.html`.
pub fn buffer(args: &super::buffer::Args, system: &BufferSystem, recipe: &Recipe) -> Result<()> {
    write_report(args.html.as_deref(), || {
        let inputs = BufferInputs {
            system: args.system.clone().unwrap_or_default(),
            ph: args.ph.clone().unwrap_or_default(),
            conc: args.conc.clone(),
            volume: args.volume.clone(),
            temp: args.temp.clone(),
            recipe: args.recipe.clone(),
            forms: args.forms.clone(),
            titrant: args.titrant.clone(),
            stock_conc: args.stock_conc.clone(),
            ideal: args.ideal,
        };
        // Each thing handled brings the cautions of its reagent and stock (a titrant as its
        // molar stock, a liquid form at its strength, a solid as such); the deferral ends each.
        let mut lists = Vec::new();
        for c in &recipe.components {
            let liquid = system
                .forms
                .iter()
                .find(|f| f.name == c.name)
                .and_then(|f| f.liquid);
            let stock = match (c.stock_molar, liquid) {
                (Some(m), _) => StockForm::Molar(m).label(),
                (None, Some((percent, _))) => StockForm::PercentWw(percent).label(),
                (None, None) => StockForm::Solid.label(),
            };
            lists.push(cautions_for(&c.name, &stock, &Situation::default())?);
        }
        if lists.is_empty() {
            lists.push(cautions_for("", "", &Situation::default())?);
        }
        let cautions = merge_cautions(lists.iter().map(Vec::as_slice));
        Ok(html::buffer::report(
            &inputs,
            recipe,
            &system.species,
            cautions,
        ))
    })
}
