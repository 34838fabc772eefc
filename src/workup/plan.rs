//! `plan`: a sequence of aqueous washes that splits a mixture dissolved in an organic solvent
//! into separate fractions, and how to get each compound back out of its aqueous fraction.
//!
//! Choosing the steps: for each compound still in the organic layer, the share a wash of N
//! portions takes at a pH follows from D(pH) = P·f_neutral(pH): the organic layer keeps
//! (D·Vo/(D·Vo + Va))^N. A compound *moves* at that pH when at least 98 % goes into the
//! portions, *stays* when at most 2 % does. A pH is clean when every remaining compound either
//! moves or stays and some do each. Among clean pH values the planner takes the one that moves
//! the fewest compounds, with the fewest portions (1-3), in the middle of the widest run of
//! clean pH values (robust to a pKa or logP off by some tenths); then repeats with what is left.
//! When no pH is clean, the remaining compounds stay together and the plan says which pairs no
//! pH separates.
//!
//! Each step is then simulated exactly ([`super::washes::wash`], partition inside the charge
//! balance): the mildest reagent that reaches the pH with the layers present and a practical
//! amount ([`super::layers::choose_auto`], the same choice as `adjust --reagent auto`), its
//! amount for the first portion (what the solutes consume included), and N portions of that
//! same solution. Purity (by mass, among the mixture's
//! compounds) and recovery of every fraction come from that simulation, not from the screen.
//! Getting a compound back ([`super::plan_recover`]): bring its aqueous fraction to the pH
//! where it is most extractable, and extract it with fresh solvent.

use serde::Serialize;

use super::adjust::SoluteInput;
use super::layers::{self, OrganicLayer};
use super::mixture::Mixture;
use super::plan_recover::{Recovery, recover};
use super::washes::{Portions, wash};
use crate::acidity::Handbook;
use crate::equilibrium::{self, AqueousLayer, Conditions, Reagent, StockOffer};
use crate::error::{Error, Result};

/// Share that counts as moved into the water (screen), and the share a staying compound may
/// lose; 98 % / 2 % leaves room for the exact simulation to reach 95 % purity.
const MOVES: f64 = 0.98;
const STAYS: f64 = 0.02;
/// pH values the screen tries: what common bench reagents reach.
const PH_FROM: f64 = 1.0;
const PH_TO: f64 = 14.0;
const PH_STEP: f64 = 0.1;

/// What `plan` needs.
#[derive(Debug, Clone)]
pub struct PlanRequest {
    pub solutes: Vec<SoluteInput>,
    pub solvent: String,
    /// Organic layer, L.
    pub organic_l: f64,
    /// Each aqueous portion, L; `None`: half the organic volume.
    pub water_l: Option<f64>,
    /// The compound the user wants (a SMILES among the solutes).
    pub keep: Option<String>,
    pub conditions: Conditions,
}

/// One wash step.
#[derive(Debug, Clone, Serialize)]
pub struct Step {
    /// 1, 2, ...
    pub step: usize,
    /// Target pH of the first portion.
    pub ph: f64,
    pub reagent: String,
    pub stock: String,
    /// Reagent per portion, mol (the first portion's need).
    pub reagent_mol: f64,
    /// Stock solution per portion, mL (solution stocks).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stock_volume_ml: Option<f64>,
    /// Solid per portion, g (solid stocks).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reagent_mass_g: Option<f64>,
    /// Water per portion, mL.
    pub water_ml: f64,
    pub portions: u32,
    /// pH of each portion as it comes out.
    pub portion_ph: Vec<f64>,
    /// SMILES (as given) that go into the aqueous portions at this step.
    pub moves: Vec<String>,
    /// Why this pH: each compound still in the organic layer, its ionized share and logD.
    pub why: Vec<Reason>,
    pub co2_released_mol: f64,
    /// How the reagent was chosen.
    pub reagent_reason: String,
}

/// One compound at a step's pH.
#[derive(Debug, Clone, Serialize)]
pub struct Reason {
    pub smiles: String,
    /// 1 - fraction neutral in the first portion.
    pub ionized: f64,
    pub log_d: Option<f64>,
    /// Share taken by this step's portions.
    pub to_water: f64,
}

/// A fraction at the end: a combined aqueous wash or the final organic layer.
#[derive(Debug, Clone, Serialize)]
pub struct Fraction {
    /// `aqueous (step 1)`, ..., `organic`.
    pub layer: String,
    /// The compounds this fraction is meant to hold.
    pub smiles: Vec<String>,
    /// Mass of those compounds over the mass of all the mixture's compounds in it.
    pub purity: f64,
    /// Share of those compounds (together) that ends here.
    pub recovery: f64,
    /// Every compound's amount here, mol, in input order.
    pub contents_mol: Vec<f64>,
}

/// The plan.
#[derive(Debug, Clone, Serialize)]
pub struct Plan {
    pub solvent: String,
    pub organic_volume_ml: f64,
    /// `upper` or `lower`.
    pub organic_layer: &'static str,
    pub water_per_portion_ml: f64,
    pub steps: Vec<Step>,
    pub fractions: Vec<Fraction>,
    /// Getting each compound back from its aqueous fraction.
    pub recoveries: Vec<Recovery>,
    pub notes: Vec<String>,
    pub cautions: Vec<String>,
}

/// Share of the compound a wash of `portions` takes into water at `ph` (screen, ideal).
fn to_water(mixture: &Mixture, member: usize, ph: f64, va: f64, vo: f64, portions: u32) -> f64 {
    let m = &mixture.members[member];
    let Some(partition) = m.main_partition() else {
        return 1.0;
    };
    let (solutes, _, _) = m.profile.protolytes(1.0);
    let f_n = solutes[m.main].state(ph).fraction_neutral;
    let p = partition.log_p();
    if p == f64::NEG_INFINITY {
        return 1.0;
    }
    let dvo = 10f64.powf(p.min(300.0)) * f_n * vo;
    1.0 - (dvo / (dvo + va)).powi(portions as i32)
}

/// A candidate step of the screen.
#[derive(Debug, Clone)]
struct Candidate {
    ph: f64,
    portions: u32,
    moves: Vec<usize>,
    width: usize,
}

/// The best clean pH for the compounds in `left`, if any.
fn choose_step(mixture: &Mixture, left: &[usize], va: f64, vo: f64) -> Option<Candidate> {
    let n = ((PH_TO - PH_FROM) / PH_STEP).round() as usize;
    let mut best: Option<Candidate> = None;
    for portions in 1..=3u32 {
        // Runs of consecutive clean pH values with the same moving set.
        let mut run: Vec<(f64, Vec<usize>)> = Vec::new();
        let mut flush = |run: &mut Vec<(f64, Vec<usize>)>| {
            if let Some((_, moves)) = run.first() {
                let c = Candidate {
                    ph: run[run.len() / 2].0,
                    portions,
                    moves: moves.clone(),
                    width: run.len(),
                };
                let key = |c: &Candidate| (c.moves.len(), c.portions, usize::MAX - c.width);
                if best.as_ref().is_none_or(|b| key(&c) < key(b)) {
                    best = Some(c);
                }
            }
            run.clear();
        };
        for k in 0..=n {
            let ph = PH_FROM + k as f64 * PH_STEP;
            let mut moves = Vec::new();
            let mut clean = true;
            for &m in left {
                let w = to_water(mixture, m, ph, va, vo, portions);
                if w >= MOVES {
                    moves.push(m);
                } else if w > STAYS {
                    clean = false;
                }
            }
            clean &= !moves.is_empty() && moves.len() < left.len();
            if clean && run.first().is_some_and(|(_, m)| *m == moves) {
                run.push((ph, moves));
            } else {
                flush(&mut run);
                if clean {
                    run.push((ph, moves));
                }
            }
        }
        flush(&mut run);
    }
    best
}

/// Pairs among `left` that no pH separates: at no pH of the screen (3 portions) does one
/// move while the other stays.
fn inseparable(mixture: &Mixture, left: &[usize], va: f64, vo: f64) -> Vec<(usize, usize)> {
    let n = ((PH_TO - PH_FROM) / PH_STEP).round() as usize;
    let mut out = Vec::new();
    for (i, &a) in left.iter().enumerate() {
        for &b in &left[i + 1..] {
            let apart = (0..=n).any(|k| {
                let ph = PH_FROM + k as f64 * PH_STEP;
                (1..=3).any(|p| {
                    let (wa, wb) = (
                        to_water(mixture, a, ph, va, vo, p),
                        to_water(mixture, b, ph, va, vo, p),
                    );
                    (wa >= MOVES && wb <= STAYS) || (wb >= MOVES && wa <= STAYS)
                })
            });
            if !apart {
                out.push((a, b));
            }
        }
    }
    out
}

/// Highest logD of a member over the screen's pH range (minus infinity: never leaves water).
pub(super) fn max_log_d(mixture: &Mixture, member: usize) -> f64 {
    let m = &mixture.members[member];
    let Some(partition) = m.main_partition() else {
        return f64::NEG_INFINITY;
    };
    let (solutes, _, _) = m.profile.protolytes(1.0);
    let n = ((PH_TO - PH_FROM) / PH_STEP).round() as usize;
    (0..=n)
        .map(|k| {
            let f = solutes[m.main]
                .state(PH_FROM + k as f64 * PH_STEP)
                .fraction_neutral;
            partition.log_p() + f.max(1e-300).log10()
        })
        .fold(f64::NEG_INFINITY, f64::max)
}

/// What every step of one plan shares: the mixture, the layers' sizes, the conditions and the
/// reagents to choose from.
struct Bench<'a> {
    mixture: &'a Mixture,
    organic: &'a OrganicLayer,
    /// Each aqueous portion, L.
    va: f64,
    conditions: &'a Conditions,
    catalogue: &'a [Reagent],
}

/// A simulated step, as its recovery needs it: the portions, the reagent and stock, mol per
/// portion, and whether the salts' counter-ions went with it (the first step).
struct StepLayers {
    portions: Portions,
    reagent: Reagent,
    stock: StockOffer,
    mol: f64,
    with_ions: bool,
}

/// The wash steps and what they leave behind.
struct Washes {
    steps: Vec<Step>,
    /// One aqueous fraction per step, then the organic layer.
    fractions: Vec<Fraction>,
    layers: Vec<StepLayers>,
    /// Members still together in the organic layer at the end.
    left: Vec<usize>,
}

/// Makes the plan.
pub fn plan(request: &PlanRequest, handbook: &Handbook, catalogue: &[Reagent]) -> Result<Plan> {
    let organic = OrganicLayer::new(&request.solvent, request.organic_l)?;
    let va = portion_volume(request, organic.volume_l)?;
    let mixture = Mixture::new(&request.solutes, handbook, &organic.solvent, va)?;
    if let Some(keep) = &request.keep
        && !mixture.members.iter().any(|m| &m.smiles == keep)
    {
        return Err(Error::Input(format!(
            "--keep {keep} is not one of the --solute SMILES"
        )));
    }
    let bench = Bench {
        mixture: &mixture,
        organic: &organic,
        va,
        conditions: &request.conditions,
        catalogue,
    };
    let mut notes = mixture.partition_notes();
    if request.water_l.is_none() {
        notes.push(format!(
            "Each aqueous portion: {:.0} mL of water (half the organic volume; set --water to \
             change it).",
            va * 1e3
        ));
    }
    let (stuck, stuck_notes) = never_leave_water(&mixture, &organic);
    notes.extend(stuck_notes);
    let washes = wash_steps(&bench, &stuck)?;
    if washes.left.len() > 1 {
        notes.extend(inseparable_notes(&bench, &washes.left));
    }
    let recoveries = recoveries(&bench, &washes, &stuck)?;
    notes.extend(keep_notes(request, &mixture, &washes.fractions));
    let cautions = plan_cautions(&washes.steps, &recoveries, &organic)?;
    Ok(Plan {
        solvent: organic.solvent.name.clone(),
        organic_volume_ml: organic.volume_l * 1e3,
        organic_layer: organic.position(),
        water_per_portion_ml: va * 1e3,
        steps: washes.steps,
        fractions: washes.fractions,
        recoveries,
        notes,
        cautions,
    })
}

/// Each aqueous portion, L: `--water`, else half the organic volume.
fn portion_volume(request: &PlanRequest, organic_l: f64) -> Result<f64> {
    match request.water_l {
        Some(v) if v.is_finite() && v > 0.0 => Ok(v),
        Some(v) => Err(Error::Input(format!(
            "--water must be a positive volume, not {v} L"
        ))),
        None => Ok(organic_l / 2.0),
    }
}

/// Members whose logD stays below 0 at every pH of the screen, with a note for each: they go
/// with the first aqueous wash.
fn never_leave_water(mixture: &Mixture, organic: &OrganicLayer) -> (Vec<usize>, Vec<String>) {
    let mut stuck = Vec::new();
    let mut notes = Vec::new();
    for m in 0..mixture.members.len() {
        let best = max_log_d(mixture, m);
        if best >= 0.0 {
            continue;
        }
        stuck.push(m);
        let why = if mixture.members[m].profile.sites.len() > 1 {
            "a zwitterion or polyion at every pH"
        } else {
            "too polar"
        };
        notes.push(format!(
            "{} will not leave water at any pH (highest logD {} in {}: {why}); it goes \
             with the first aqueous wash and is not extracted back.",
            mixture.members[m].smiles,
            if best.is_finite() {
                format!("{best:.1}")
            } else {
                "none".into()
            },
            organic.solvent.name
        ));
    }
    (stuck, notes)
}

/// Chooses and simulates steps until no clean pH is left; the organic layer is the last
/// fraction.
fn wash_steps(bench: &Bench, stuck: &[usize]) -> Result<Washes> {
    let mixture = bench.mixture;
    let mut left: Vec<usize> = (0..mixture.members.len())
        .filter(|m| !stuck.contains(m))
        .collect();
    let mut moles = mixture.initial_moles();
    let mut washes = Washes {
        steps: Vec::new(),
        fractions: Vec::new(),
        layers: Vec::new(),
        left: Vec::new(),
    };
    while let Some(candidate) = choose_step(mixture, &left, bench.va, bench.organic.volume_l) {
        // The members that never leave water go with the first step.
        let with: &[usize] = if washes.steps.is_empty() { stuck } else { &[] };
        let (step, fraction, layers) = simulate_step(
            bench,
            &candidate,
            &moles,
            &left,
            with,
            washes.steps.len() + 1,
        )?;
        moles = layers.portions.organic_mol.clone();
        left.retain(|m| !candidate.moves.contains(m));
        washes.steps.push(step);
        washes.fractions.push(fraction);
        washes.layers.push(layers);
    }
    let mains = mixture.main_solutes();
    let contents: Vec<f64> = mains.iter().map(|&i| moles[i]).collect();
    washes
        .fractions
        .push(fraction(mixture, "organic".into(), &left, contents));
    washes.left = left;
    Ok(washes)
}

/// Step `number` at the candidate's pH: the reagent and its dose for the first portion
/// (`moles` in the organic layer), the portions washed exactly, and what each compound did.
/// `stuck` members (first step only) go along with the movers.
fn simulate_step(
    bench: &Bench,
    candidate: &Candidate,
    moles: &[f64],
    left: &[usize],
    stuck: &[usize],
    number: usize,
) -> Result<(Step, Fraction, StepLayers)> {
    let (mixture, conditions, va) = (bench.mixture, bench.conditions, bench.va);
    let first_step = number == 1;
    let water = AqueousLayer::water(va);
    let first = mixture.layers(&water, bench.organic.volume_l, moles, first_step)?;
    let (choice, dosed) = layers::choose_auto(&first, candidate.ph, conditions, bench.catalogue)?;
    let mol = dosed.dose.reagent_mol;
    let with = layers::with_reagent(&first, &choice.reagent, &choice.stock.stock, mol);
    let fresh = equilibrium::dose::with_reagent(&water, &choice.reagent, &choice.stock.stock, mol);
    let portions = wash(&with, &fresh, candidate.portions, conditions)?;
    let mains = mixture.main_solutes();
    let moves: Vec<usize> = candidate.moves.iter().chain(stuck).copied().collect();
    let why = left
        .iter()
        .chain(stuck)
        .map(|&m| {
            let share = &dosed.state.shares[mains[m]];
            Reason {
                smiles: mixture.members[m].smiles.clone(),
                ionized: 1.0 - share.fraction_neutral,
                log_d: share.log_d,
                to_water: portions.aqueous_mol[mains[m]]
                    / mixture.members[m].amount_mol.max(1e-300),
            }
        })
        .collect();
    let contents: Vec<f64> = mains.iter().map(|&i| portions.aqueous_mol[i]).collect();
    let fraction = fraction(
        mixture,
        format!("aqueous (step {number})"),
        &moves,
        contents,
    );
    let step = Step {
        step: number,
        ph: candidate.ph,
        reagent: choice.reagent.name.clone(),
        stock: choice.stock.label(),
        reagent_mol: mol,
        stock_volume_ml: dosed.dose.stock_volume_l.map(|v| v * 1e3),
        reagent_mass_g: dosed.dose.solid_mass_g,
        water_ml: va * 1e3,
        portions: candidate.portions,
        portion_ph: portions.states.iter().map(|s| s.ph).collect(),
        moves: moves
            .iter()
            .map(|&m| mixture.members[m].smiles.clone())
            .collect(),
        why,
        co2_released_mol: portions.co2_released_mol,
        reagent_reason: choice.reason,
    };
    let layers = StepLayers {
        portions,
        reagent: choice.reagent,
        stock: choice.stock,
        mol,
        with_ions: first_step,
    };
    Ok((step, fraction, layers))
}

/// One note per pair of the members left together that no pH separates.
fn inseparable_notes(bench: &Bench, left: &[usize]) -> Vec<String> {
    let mixture = bench.mixture;
    inseparable(mixture, left, bench.va, bench.organic.volume_l)
        .into_iter()
        .map(|(a, b)| {
            format!(
                "No pH separates {} and {}: their logD curves run too close together (acid or \
                 base strengths too alike for this solvent); they stay together in the {} layer \
                 — use chromatography or crystallization for that pair.",
                mixture.members[a].smiles, mixture.members[b].smiles, bench.organic.solvent.name
            )
        })
        .collect()
}

/// Getting the compounds of each aqueous fraction back (none for the members that never
/// leave water).
fn recoveries(bench: &Bench, washes: &Washes, stuck: &[usize]) -> Result<Vec<Recovery>> {
    let mixture = bench.mixture;
    washes
        .steps
        .iter()
        .zip(&washes.layers)
        .zip(&washes.fractions)
        .filter_map(|((step, layers), fr)| {
            let intended: Vec<usize> = (0..mixture.members.len())
                .filter(|&m| step.moves.contains(&mixture.members[m].smiles) && !stuck.contains(&m))
                .collect();
            if intended.is_empty() {
                return None;
            }
            let used = (
                &layers.reagent,
                &layers.stock,
                layers.mol,
                step.portions,
                layers.with_ions,
            );
            Some(recover(
                mixture,
                bench.organic,
                fr,
                &intended,
                &layers.portions,
                used,
                bench.conditions,
                bench.catalogue,
            ))
        })
        .collect()
}

/// The cautions of every reagent the plan handles, once each, the general deferral last.
fn plan_cautions(
    steps: &[Step],
    recoveries: &[Recovery],
    organic: &OrganicLayer,
) -> Result<Vec<String>> {
    let gas = steps.iter().any(|s| s.co2_released_mol > 0.0)
        || recoveries.iter().any(|r| r.co2_released_mol > 0.0);
    let situation = super::cautions::Situation {
        gas,
        solvent: Some(organic.solvent.name.clone()),
    };
    let mut cautions: Vec<String> = Vec::new();
    for (reagent, stock) in steps
        .iter()
        .map(|s| (&s.reagent, &s.stock))
        .chain(recoveries.iter().map(|r| (&r.reagent, &r.stock)))
    {
        for c in super::cautions::cautions_for(reagent, stock, &situation)? {
            if !cautions.contains(&c) {
                cautions.push(c);
            }
        }
    }
    if let Some(pos) = cautions.iter().position(|c| c.contains("SDS")) {
        let last = cautions.remove(pos);
        cautions.push(last);
    }
    Ok(cautions)
}

/// Purity by mass and recovery of the compounds `intended` in a fraction holding `contents`.
fn fraction(mixture: &Mixture, layer: String, intended: &[usize], contents: Vec<f64>) -> Fraction {
    let mass = |m: usize| contents[m] * mixture.members[m].molar_mass_g_mol;
    let all: f64 = (0..contents.len()).map(mass).sum();
    let wanted: f64 = intended.iter().map(|&m| mass(m)).sum();
    let total: f64 = intended
        .iter()
        .map(|&m| mixture.members[m].amount_mol)
        .sum();
    let here: f64 = intended.iter().map(|&m| contents[m]).sum();
    Fraction {
        layer,
        smiles: intended
            .iter()
            .map(|&m| mixture.members[m].smiles.clone())
            .collect(),
        purity: if all > 0.0 { wanted / all } else { 0.0 },
        recovery: if total > 0.0 { here / total } else { 0.0 },
        contents_mol: contents,
    }
}

/// Where the compound of `--keep` ends, in one sentence.
fn keep_notes(request: &PlanRequest, mixture: &Mixture, fractions: &[Fraction]) -> Vec<String> {
    let Some(keep) = &request.keep else {
        return Vec::new();
    };
    let Some(m) = mixture.members.iter().position(|x| &x.smiles == keep) else {
        return Vec::new();
    };
    match fractions.iter().find(|f| f.smiles.contains(keep)) {
        Some(f) if f.smiles.len() == 1 => vec![format!(
            "{keep} (kept) ends in the {} fraction: {:.1} % of it, {:.1} % pure by mass.",
            f.layer,
            100.0 * f.recovery,
            100.0 * f.purity
        )],
        Some(f) => vec![format!(
            "{keep} (kept) ends in the {} fraction together with {}; no pH separates them.",
            f.layer,
            f.smiles
                .iter()
                .filter(|s| *s != keep)
                .cloned()
                .collect::<Vec<_>>()
                .join(", ")
        )],
        None => vec![format!(
            "{keep} (kept) does not leave water at any pH (highest logD {:.1}); it ends in the \
             first aqueous wash.",
            max_log_d(mixture, m)
        )],
    }
}
