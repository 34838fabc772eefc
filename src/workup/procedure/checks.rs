//! The mistakes a check looks for, each said in plain words with its fix: a reagent used up
//! before the pH gets where the step wants it, a pH that no amount of the stock reaches, a
//! layer kept or thrown away that holds the product, a top/bottom mix-up, a back-extraction at
//! a pH where the product is still ionized, an ionizable impurity left with the product.

use super::funnel::{Funnel, Phase};
use super::model::*;
use super::report::Problem;
use super::simulate::Run;
use crate::acidity::Kind;
use crate::equilibrium::{Protolyte, Role, Stock};
use crate::error::{Error, Result};
use crate::units::{fmt_moles, fmt_ph, fmt_volume};
use crate::workup::layers;

/// Why a layer left the procedure.
#[derive(Debug, Clone)]
pub enum Gone {
    /// The layer not kept at a separation.
    Separated {
        kept_organic: bool,
        organic_on_top: bool,
    },
    /// The pooled washes of a wash step.
    Washes { ph: Option<f64> },
    /// What an extraction step did not keep.
    Extracted { kept_organic: bool, ph: Option<f64> },
    /// The funnel's content set aside at a combine step, or water left at drying.
    Combined,
}

/// A layer that left: thrown away, or set aside and never used again.
#[derive(Debug, Clone)]
pub struct Departure {
    pub step: usize,
    pub phases: Vec<Phase>,
    pub gone: Gone,
    /// The name it was set aside under.
    pub set_aside: Option<String>,
    /// Already explained by an earlier problem (wrong pH before the extraction).
    pub flagged: bool,
}

/// Share of the start amount below which a loss is not worth a problem (common practice: a
/// few percent is the normal price of a workup).
const LOSS_PCT: f64 = 5.0;
/// A neutral fraction this high counts as extractable (pKa ± 2, common practice).
const NEUTRAL_ENOUGH: f64 = 0.99;

fn problem(step: &Step, kind: &'static str, message: String, fix: String) -> Problem {
    Problem {
        step: step.number,
        line: step.line,
        kind,
        message,
        fix,
    }
}

fn main_slot(run: &Run, compound: usize) -> Option<usize> {
    run.slots
        .iter()
        .position(|s| s.compound == compound && s.main)
}

/// Moles of a compound (its main parent) in a set of layers.
fn held_mol(run: &Run, compound: usize, phases: &[&Phase]) -> f64 {
    main_slot(run, compound).map_or(0.0, |i| phases.iter().map(|p| p.slot_mol[i]).sum())
}

/// The pH range where a protolyte is at least `share` neutral (ideal activities), scanned over
/// 0-14 in tenths; the range around the most neutral pH.
fn neutral_window(p: &Protolyte, share: f64) -> Option<(f64, f64)> {
    let grid: Vec<f64> = (0..=140).map(|i| i as f64 / 10.0).collect();
    let best = grid
        .iter()
        .copied()
        .max_by(|a, b| p.fraction_neutral(*a).total_cmp(&p.fraction_neutral(*b)))?;
    if p.fraction_neutral(best) < share {
        return None;
    }
    let ok = |ph: f64| p.fraction_neutral(ph) >= share;
    let lo = grid
        .iter()
        .copied()
        .filter(|&x| x <= best)
        .rev()
        .take_while(|&x| ok(x))
        .last()?;
    let hi = grid
        .iter()
        .copied()
        .filter(|&x| x >= best)
        .take_while(|&x| ok(x))
        .last()?;
    Some((lo, hi))
}

fn window_text(w: (f64, f64)) -> String {
    match w {
        (lo, hi) if lo <= 0.0 && hi >= 14.0 => "any pH".into(),
        (lo, _) if lo <= 0.0 => format!("pH {} or below", fmt_ph(w.1)),
        (_, hi) if hi >= 14.0 => format!("pH {} or above", fmt_ph(w.0)),
        (lo, hi) => format!("pH {} to {}", fmt_ph(lo), fmt_ph(hi)),
    }
}

/// Where the product is neutral, in words; `None` without a product or with no such pH.
fn product_window(run: &Run) -> Option<String> {
    let i = main_slot(run, run.procedure.product?)?;
    let p = &run.slots[i].protolyte;
    neutral_window(p, NEUTRAL_ENOUGH)
        .or_else(|| neutral_window(p, 0.9))
        .map(window_text)
}

fn product_name<'a>(run: &'a Run) -> Option<&'a str> {
    run.procedure
        .product
        .map(|i| run.procedure.mixture.compounds[i].name.as_str())
}

/// The compounds in the funnel that a reagent of `role` reacts with, with their moles.
fn consumers(run: &Run, funnel: &Funnel, role: Role) -> String {
    let phases: Vec<&Phase> = funnel.organic.iter().chain(funnel.aqueous.iter()).collect();
    let mut out = Vec::new();
    for (ci, c) in run.procedure.mixture.compounds.iter().enumerate() {
        let reacts = c.profile.sites.iter().any(|s| match role {
            Role::Base => s.kind == Kind::Acid && s.pka < 11.0,
            Role::Acid => s.kind == Kind::Base && s.pka > 3.0,
        });
        let mol = held_mol(run, ci, &phases);
        if reacts && mol > 1e-9 {
            out.push(format!("{} {}", c.name, fmt_moles(mol)));
        }
    }
    if out.is_empty() {
        "none of the compounds; the layer itself".into()
    } else {
        out.join(", ")
    }
}

/// A reagent that ran out, or a pH the step aims for and misses.
pub fn shortfall(
    run: &Run,
    step: &Step,
    before: &Funnel,
    portion: &Portion,
    ph: Option<f64>,
    aim: &Aim,
) -> Result<Option<Problem>> {
    shortfall_wash(run, step, before, portion, ph, aim)
}

/// As [`shortfall`] for a wash: `ph` is the last portion's, the fix is worked out for the
/// first portion (`first`), the one that meets all the acid or base.
pub fn shortfall_wash(
    run: &Run,
    step: &Step,
    first: &Funnel,
    portion: &Portion,
    ph: Option<f64>,
    aim: &Aim,
) -> Result<Option<Problem>> {
    let Some(ph) = ph else { return Ok(None) };
    let role = match &portion.liquid {
        Liquid::Reagent { reagent, .. } => Some(reagent.role),
        Liquid::Plain(_) => None,
    };
    // The step's own aim, else the side of neutral the reagent is for.
    let (low, high) = match (aim.at_least, aim.at_most, role) {
        (None, None, Some(Role::Base)) => (Some(7.0), None),
        (None, None, Some(Role::Acid)) => (None, Some(7.0)),
        (lo, hi, _) => (lo, hi),
    };
    let short_low = low.is_some_and(|l| ph < l - 0.02);
    let short_high = high.is_some_and(|h| ph > h + 0.02);
    if !short_low && !short_high {
        return Ok(None);
    }
    let said = aim.at_least.is_some() || aim.at_most.is_some();
    let want = if short_low {
        format!("pH {} or above", fmt_ph(low.unwrap_or(7.0)))
    } else {
        format!("pH {} or below", fmt_ph(high.unwrap_or(7.0)))
    };
    let Liquid::Reagent { reagent, .. } = &portion.liquid else {
        return Ok(Some(problem(
            step,
            "shortfall",
            format!(
                "The aqueous layer ends at pH {}, not {want} as the step intends: {} does not move the pH.",
                fmt_ph(ph),
                portion.liquid.label()
            ),
            "Use an acid or base reagent for this step.".into(),
        )));
    };
    let message = format!(
        "The aqueous layer ends at pH {}, {}: the {} of {} {} used up by {}.",
        fmt_ph(ph),
        if said {
            format!("short of the {want} this step aims for")
        } else if short_low {
            "still acidic after a base".to_string()
        } else {
            "still basic after an acid".to_string()
        },
        fmt_moles(portion.mol),
        reagent.name,
        if short_low || short_high { "are" } else { "is" },
        consumers(run, first, reagent.role)
    );
    // What one portion needs to end 0.5 past neutral, or at the aim itself.
    let target = match (said, short_low) {
        (true, true) => low.unwrap_or(7.5),
        (true, false) => high.unwrap_or(6.5),
        (false, true) => 7.5,
        (false, false) => 6.5,
    };
    let fix = fix_amount(run, first, portion, target)?;
    Ok(Some(problem(step, "shortfall", message, fix)))
}

/// The amount of the portion's reagent that brings the layers of `before` to `target`.
fn fix_amount(run: &Run, before: &Funnel, portion: &Portion, target: f64) -> Result<String> {
    let Liquid::Reagent { reagent, offer } = &portion.liquid else {
        return Ok(String::new());
    };
    let mut pre = before.clone();
    if pre.aqueous.is_none() {
        if !matches!(offer.stock, Stock::Solution { .. }) {
            return Ok(format!(
                "Dissolve more {} (or add water first).",
                reagent.name
            ));
        }
        // A solution stock brings its own water: start from a drop (1 µL).
        pre.aqueous = Some(Phase::empty(
            super::funnel::PhaseKind::Aqueous,
            1e-6,
            run.slots.len(),
        ));
    }
    let Some(two) = pre.two_layers(&run.slots) else {
        return Ok(String::new());
    };
    match layers::dose_with_alternatives(
        &two,
        reagent,
        offer,
        target,
        run.conditions(),
        run.catalogue,
    ) {
        Ok(d) => {
            let how = match d.dose.stock_volume_l {
                Some(v) => format!(
                    "{} of {} {}",
                    fmt_volume(v.max(0.0)),
                    offer.label(),
                    reagent.name
                ),
                None => format!(
                    "{} g of solid {}",
                    crate::report::sig(d.dose.reagent_mol * reagent.molar_mass_g_mol, 3),
                    reagent.name
                ),
            };
            Ok(format!(
                "Use at least {how} ({}) in this portion to reach pH {}, or add further portions \
                 until the aqueous layer stays there.",
                fmt_moles(d.dose.reagent_mol),
                fmt_ph(target)
            ))
        }
        Err(Error::Unreachable(m)) => Ok(format!("{m}.")),
        Err(e) => Err(e),
    }
}

/// A `to_ph` that the reagent and stock cannot reach.
pub fn unreachable(step: &Step, target: f64, message: &str) -> Problem {
    problem(
        step,
        "unreachable_ph",
        format!(
            "The step asks for pH {}, which this reagent cannot reach here; nothing was added \
             and the check goes on without it.",
            fmt_ph(target)
        ),
        format!("{message}."),
    )
}

/// A solid reagent put into a funnel that holds no water.
pub fn no_water(step: &Step) -> Problem {
    problem(
        step,
        "no_water",
        "A solid reagent goes into a funnel with no aqueous layer: it has nothing to dissolve in \
         and does not act on the organic solution."
            .into(),
        "Add water first, or use a solution of the reagent.".into(),
    )
}

pub fn nothing_to_separate(run: &Run, step: &Step) -> Problem {
    let what = if run.funnel.organic.is_some() {
        "organic"
    } else {
        "aqueous"
    };
    problem(
        step,
        "nothing_to_separate",
        format!("There is nothing to separate: the funnel holds only the {what} layer."),
        "Add the aqueous (or organic) liquid first, or drop this step.".into(),
    )
}

/// A step that needs the organic (`organic` true) or aqueous layer and finds only the other.
pub fn wrong_layer(run: &Run, step: &Step, organic: bool) -> Problem {
    let (need, have) = if organic {
        ("organic", "aqueous")
    } else {
        ("aqueous", "organic")
    };
    let _ = run;
    problem(
        step,
        "wrong_layer",
        format!(
            "This `{}` step works on the {need} layer, but the funnel holds only the {have} \
             layer; the check stops here.",
            step.action.verb()
        ),
        format!("Keep the {need} layer at the separation before this step."),
    )
}

pub fn water_left(run: &Run, step: &Step) -> Problem {
    let _ = run;
    problem(
        step,
        "wrong_layer",
        format!(
            "The aqueous layer is still in the funnel when this `{}` step comes.",
            step.action.verb()
        ),
        "Separate the layers (keep the organic one) before drying or concentrating.".into(),
    )
}

/// Whether a later step shows which layer the procedure meant to keep: `Some(true)` for the
/// organic layer (wash, dry, concentrate), `Some(false)` for the aqueous one (acidify, basify,
/// extract), with that step.
fn next_need<'p>(run: &'p Run, step: &Step) -> Option<(bool, &'p Step)> {
    for s in run.procedure.steps.iter().skip(step.number) {
        match &s.action {
            Action::Wash { .. } | Action::Dry { .. } | Action::Concentrate => {
                return Some((true, s));
            }
            Action::Adjust { .. } | Action::Extract { .. } => return Some((false, s)),
            Action::Separate { .. } | Action::Combine { .. } => return None,
            Action::Add { .. } => {}
        }
    }
    None
}

/// A kept layer that the next steps treat as the other one (top/bottom mixed up, or the wrong
/// word). The check then goes on as if the intended layer had been kept.
pub fn mixup(
    run: &Run,
    step: &Step,
    keep: Which,
    keep_organic: bool,
    organic_on_top: bool,
) -> Option<Problem> {
    let (need_organic, next) = next_need(run, step)?;
    if need_organic == keep_organic {
        return None;
    }
    let kept = if keep_organic { "organic" } else { "aqueous" };
    let want = if need_organic { "organic" } else { "aqueous" };
    let solvent = run.procedure.mixture.solvent;
    let want_pos = if need_organic == organic_on_top {
        "top"
    } else {
        "bottom"
    };
    let message = match keep {
        Which::Top | Which::Bottom => format!(
            "Step {} keeps the {} layer, but with {} (density {:.2} g/mL) the organic layer is the \
             {} one: the {} layer is the {kept} layer, while step {} ({}) needs the {want} layer.",
            step.number,
            keep.as_str(),
            solvent.name,
            solvent.density_g_ml,
            if organic_on_top { "top" } else { "bottom" },
            keep.as_str(),
            next.number,
            next.action.verb()
        ),
        _ => format!(
            "Step {} keeps the {kept} layer, but step {} ({}) works on the {want} layer.",
            step.number,
            next.number,
            next.action.verb()
        ),
    };
    Some(problem(
        step,
        "layer_mixup",
        message + " The check goes on as if the right layer had been kept.",
        format!("Keep the {want_pos} layer (write keep = \"{want}\" to avoid the mix-up)."),
    ))
}

/// After acidifying or basifying a layer that holds the product, before an extraction meant to
/// take it out: is the product neutral enough to leave the water?
pub fn extraction_ph(run: &Run, step: &Step, before: &Funnel, raise: bool) -> Option<Problem> {
    let product = run.procedure.product?;
    let slot = main_slot(run, product)?;
    let in_water = before.aqueous.as_ref().map_or(0.0, |a| a.slot_mol[slot]);
    let in_organic = before.organic.as_ref().map_or(0.0, |o| o.slot_mol[slot]);
    if in_water <= in_organic {
        return None;
    }
    // Only when an extraction that keeps the organic layer follows.
    let next = run.procedure.steps.iter().skip(step.number).find(|s| {
        matches!(
            s.action,
            Action::Extract { .. } | Action::Adjust { .. } | Action::Combine { .. }
        )
    })?;
    if !matches!(next.action, Action::Extract { keep, .. } if keep != Which::Aqueous) {
        return None;
    }
    let ph = run.funnel.aqueous.as_ref()?.ph?;
    let p = &run.slots[slot].protolyte;
    let neutral = p.fraction_neutral(ph);
    if neutral >= 0.9 {
        return None;
    }
    let window = product_window(run)?;
    let verb = if raise { "basify" } else { "acidify" };
    Some(problem(
        step,
        "extraction_ph",
        format!(
            "At pH {} only {:.1}% of the product ({}) is in its neutral form, so the extraction \
             at step {} leaves most of it in the water.",
            fmt_ph(ph),
            100.0 * neutral,
            product_name(run)?,
            next.number
        ),
        format!(
            "Bring the aqueous layer to {window} (at least 99% neutral) before extracting{}.",
            match (raise, window.contains("above")) {
                (true, false) | (false, true) => format!(" (this step should not {verb} it)"),
                _ => String::new(),
            }
        ),
    ))
}

/// The product problems of every layer that left the procedure.
pub fn departures(run: &Run) -> Vec<Problem> {
    let Some(product) = run.procedure.product else {
        return Vec::new();
    };
    let start = run.procedure.mixture.compounds[product].amount_mol;
    let name = product_name(run).unwrap_or("product");
    let mut out = Vec::new();
    for d in run.gone.iter().filter(|d| !d.flagged) {
        let phases: Vec<&Phase> = d.phases.iter().collect();
        let pct = 100.0 * held_mol(run, product, &phases) / start;
        if pct < LOSS_PCT {
            continue;
        }
        let Some(step) = run.procedure.steps.get(d.step - 1) else {
            continue;
        };
        let loss = Loss {
            step: step.number,
            pct,
            name,
            fate: match &d.set_aside {
                Some(n) => format!("set aside as `{n}` and never used again"),
                None => "thrown away".into(),
            },
            window: product_window(run).unwrap_or_else(|| "a pH where it is neutral".into()),
        };
        let kind = if loss.major() {
            "product_discarded"
        } else {
            "product_loss"
        };
        let (message, fix) = loss.wording(&d.gone);
        out.push(problem(step, kind, message, fix));
    }
    out
}

/// The product leaving with a layer: what a problem about it says.
struct Loss<'a> {
    /// Step number.
    step: usize,
    /// Share of the product in the layer, %.
    pct: f64,
    name: &'a str,
    /// `thrown away` or `set aside as ... and never used again`.
    fate: String,
    /// Where the product is neutral (`pH 9.5 or above`).
    window: String,
}

impl Loss<'_> {
    /// Half the product or more: the wrong layer was kept, rather than some lost.
    fn major(&self) -> bool {
        self.pct >= 50.0
    }

    /// The message and the fix for a layer gone this way.
    fn wording(&self, gone: &Gone) -> (String, String) {
        let Loss {
            step,
            pct,
            name,
            fate,
            window,
        } = self;
        match gone {
            Gone::Separated {
                kept_organic,
                organic_on_top,
            } => self.separated(*kept_organic, *organic_on_top),
            Gone::Washes { ph } => (
                format!(
                    "The washes of step {step} (pH {}) carry away {pct:.0}% of the product \
                     ({name}); they are {fate}.",
                    ph.map_or("n/a".into(), fmt_ph)
                ),
                format!(
                    "Wash at {window}, where the product stays neutral, or keep the washes and back-extract them."
                ),
            ),
            Gone::Extracted {
                kept_organic: true,
                ph,
            } => (
                format!(
                    "After the extraction of step {step}, {pct:.0}% of the product ({name}) is \
                     still in the aqueous layer (pH {}), which is {fate}.",
                    ph.map_or("n/a".into(), fmt_ph)
                ),
                format!(
                    "Bring the aqueous layer to {window} first, or use more portions of solvent."
                ),
            ),
            Gone::Extracted {
                kept_organic: false,
                ..
            } => (
                format!(
                    "The organic extracts of step {step} hold {pct:.0}% of the product ({name}) and are {fate}."
                ),
                "Keep the organic extracts (keep = \"organic\").".into(),
            ),
            Gone::Combined => (
                format!("{pct:.0}% of the product ({name}) is in the layer {fate} at step {step}."),
                "Use that layer again (combine) or do not set it aside.".into(),
            ),
        }
    }

    /// A separation that kept the layer without the product.
    fn separated(&self, kept_organic: bool, organic_on_top: bool) -> (String, String) {
        let Loss {
            step,
            pct,
            name,
            fate,
            window,
        } = self;
        let (kept, other) = if kept_organic {
            ("organic", "aqueous")
        } else {
            ("aqueous", "organic")
        };
        let pos = |organic: bool| {
            if organic == organic_on_top {
                "top"
            } else {
                "bottom"
            }
        };
        let message = format!(
            "Step {step} keeps the {kept} layer ({}), but {pct:.0}% of the product ({name}) is in \
             the {other} layer ({}), which is {fate}.",
            pos(kept_organic),
            pos(!kept_organic)
        );
        let fix = if self.major() {
            format!("Keep the {other} layer ({}) instead.", pos(!kept_organic))
        } else {
            format!(
                "Bring the aqueous layer to {window} before separating, or extract the {other} \
                 layer again and combine."
            )
        };
        (message, fix)
    }
}

/// Ionizable compounds other than the product still in the final layer that a wash at some
/// pH would remove while the product stays.
pub fn impurities(run: &Run, last: &Step, end: &Phase) -> Vec<Problem> {
    let Some(product) = run.procedure.product else {
        return Vec::new();
    };
    let Some(ps) = main_slot(run, product) else {
        return Vec::new();
    };
    let product_p = &run.slots[ps].protolyte;
    let mut out = Vec::new();
    for (ci, c) in run.procedure.mixture.compounds.iter().enumerate() {
        if ci == product || c.profile.sites.is_empty() {
            continue;
        }
        let pct = 100.0 * held_mol(run, ci, &[end]) / c.amount_mol;
        if pct < 10.0 {
            continue;
        }
        let Some(slot) = main_slot(run, ci) else {
            continue;
        };
        let p: &Protolyte = &run.slots[slot].protolyte;
        // A pH where the impurity is at least 99.9% ionized and the product 99% neutral.
        let fitting: Vec<f64> = (0..=140)
            .map(|i| i as f64 / 10.0)
            .filter(|&ph| {
                p.fraction_neutral(ph) <= 1e-3 && product_p.fraction_neutral(ph) >= NEUTRAL_ENOUGH
            })
            .collect();
        let (Some(lo), Some(hi)) = (fitting.first(), fitting.last()) else {
            continue;
        };
        out.push(problem(
            last,
            "impurity_left",
            format!(
                "{pct:.0}% of {} is still in the final organic layer with the product.",
                c.name
            ),
            format!(
                "A wash at {} removes it into water while the product stays in the organic layer.",
                window_text((*lo, *hi))
            ),
        ));
    }
    out
}
