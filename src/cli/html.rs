//! `--html FILE`: the printable report of a command, written beside its usual output.
//!
//! Each command makes one call here after its results are computed. [`write_report`] is the
//! hook every command shares (`plan`, `check` and `buffer` build their [`Report`] and hand it
//! over); [`adjust`] gathers what the `adjust` report needs that its results do not hold: the
//! flags as typed and each solute's curves.

use std::path::Path;

use super::adjust::Args;
use super::curve::logp_of;
use crate::acidity::{Handbook, Profile};
use crate::chem::formula::molar_mass;
use crate::error::Result;
use crate::report::html::adjust::{AdjustInputs, SoluteCurves, report};
use crate::report::html::{self, Report};
use crate::report::ionization::Compound;
use crate::workup::adjust::{Adjustment, Request};

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
        };
        let mut curves = Vec::with_capacity(request.solutes.len());
        for s in &request.solutes {
            // The same profile `adjust` solved with, user pKa values included.
            let mut profile = Profile::new(&s.smiles, handbook)?;
            if let Some(values) = &s.pka_override {
                profile.override_pkas(values)?;
            }
            let logp = logp_of(&profile, args.estimate_only)?;
            let mut compound = Compound::new(&profile, logp.as_ref().map(|l| l.log_p));
            compound.logp_source = logp.map(|l| l.source);
            curves.push(SoluteCurves {
                compound,
                molar_mass: molar_mass(&profile.molecule),
            });
        }
        Ok(report(&inputs, results, &curves))
    })
}
