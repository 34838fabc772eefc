//! Runs a procedure step by step through the funnel: every addition shaken to the two-layer
//! equilibrium, every separation splitting the layers, every layer set aside or thrown away
//! remembered, so that [`super::checks`] can say where each compound went and what went wrong.

use super::checks::{self, Departure, Gone};
use super::funnel::{Funnel, Phase, PhaseKind, Slot};
use super::model::*;
use super::report::{Problem, StepReport};
use super::view;
use crate::equilibrium::{Conditions, Reagent, Stock};
use crate::error::{Error, Result};
use crate::workup::cautions::{Situation, cautions_for};
use crate::workup::layers;

/// Molar gas constant in L atm mol^-1 K^-1 (CODATA 2018: 8.314462618 J/(mol K) / 101325 Pa).
const GAS_CONSTANT_L_ATM: f64 = 0.082_057_366;

/// Everything the steps share.
pub struct Run<'a> {
    pub procedure: &'a Procedure,
    pub slots: Vec<Slot>,
    pub catalogue: &'a [Reagent],
    pub funnel: Funnel,
    /// Layers set aside under a name, with the step that set each aside.
    pub held: Vec<(String, Departure)>,
    /// Layers that left the procedure (thrown away, or set aside and never used again).
    pub gone: Vec<Departure>,
    pub steps: Vec<StepReport>,
    /// Set when a step left the funnel in a state the next steps cannot work on.
    pub stopped: bool,
    /// The product was found at a pH where it cannot be extracted; later losses from that
    /// same layer are the consequence, not a new problem.
    pub extraction_ph_flagged: bool,
}

impl<'a> Run<'a> {
    pub fn new(
        procedure: &'a Procedure,
        catalogue: &'a [Reagent],
        estimate_only: bool,
    ) -> Result<Run<'a>> {
        let m = &procedure.mixture;
        let (slots, ions) = super::funnel::slots(&m.compounds, estimate_only)?;
        let mut organic = Phase::empty(PhaseKind::Organic(m.solvent), m.organic_l, slots.len());
        for (i, slot) in slots.iter().enumerate() {
            organic.slot_mol[i] = m.compounds[slot.compound].amount_mol;
        }
        for (c, (cations, anions)) in m.compounds.iter().zip(ions) {
            organic.ions.strong_cations_mol += cations * c.amount_mol;
            organic.ions.strong_anions_mol += anions * c.amount_mol;
        }
        let mut funnel = Funnel::default();
        funnel.pour(organic);
        if m.water_l > 0.0 {
            funnel.pour(Phase::empty(PhaseKind::Aqueous, m.water_l, slots.len()));
        }
        let mut run = Run {
            procedure,
            slots,
            catalogue,
            funnel,
            held: Vec::new(),
            gone: Vec::new(),
            steps: Vec::new(),
            stopped: false,
            extraction_ph_flagged: false,
        };
        run.funnel.shake(&run.slots, run.conditions())?;
        Ok(run)
    }

    pub fn conditions(&self) -> &'a Conditions {
        &self.procedure.mixture.conditions
    }

    /// CO2 mol to mL of gas at the temperature and 1 atm.
    pub fn gas_ml(&self, mol: f64) -> f64 {
        mol * GAS_CONSTANT_L_ATM * self.conditions().temperature_k() * 1e3
    }

    /// Runs every step; a step that cannot be carried out stops the simulation there.
    pub fn all(&mut self) -> Result<()> {
        for step in &self.procedure.steps {
            if self.stopped {
                break;
            }
            let mut report = view::blank(step);
            self.step(step, &mut report)?;
            report.layers = view::layers(self);
            self.steps.push(report);
        }
        let left: Vec<_> = std::mem::take(&mut self.held);
        self.gone.extend(left.into_iter().map(|(_, d)| d));
        Ok(())
    }

    fn step(&mut self, step: &Step, r: &mut StepReport) -> Result<()> {
        match &step.action {
            Action::Add { portion, aim } => {
                r.did = portion.describe();
                let before = self.funnel.clone();
                self.funnel
                    .aqueous
                    .get_or_insert_with(|| Phase::empty(PhaseKind::Aqueous, 0.0, self.slots.len()))
                    .add(portion);
                self.shake_into(r)?;
                r.reagent_mol = reagent_mol(portion);
                self.cautions(r, portion);
                if self
                    .funnel
                    .aqueous
                    .as_ref()
                    .is_some_and(|a| a.volume_l() <= 0.0)
                {
                    r.problems.push(checks::no_water(step));
                }
                if let Some(p) = checks::shortfall(self, step, &before, portion, r.ph, aim)? {
                    r.problems.push(p);
                }
            }
            Action::Separate { keep, set_aside } => self.separate(step, *keep, set_aside, r)?,
            Action::Wash {
                portion,
                portions,
                set_aside,
                aim,
            } => self.wash(step, portion, *portions, set_aside, aim, r)?,
            Action::Adjust {
                raise,
                reagent,
                offer,
                by,
            } => self.adjust(step, *raise, reagent, offer, by, r)?,
            Action::Extract {
                solvent,
                volume_l,
                portions,
                keep,
                set_aside,
            } => self.extract(step, solvent, *volume_l, *portions, *keep, set_aside, r)?,
            Action::Combine { layers, set_aside } => {
                r.did = format!("combine {}", layers.join(", "));
                if set_aside.is_some() {
                    let phases = self.take_funnel();
                    self.put_away(step.number, set_aside, phases, Gone::Combined);
                    r.did += "; the funnel's content set aside";
                }
                for name in layers {
                    let at = self.held.iter().position(|(n, _)| n == name);
                    let Some(at) = at else {
                        return Err(Error::Internal(format!("layer `{name}` not held")));
                    };
                    let (_, d) = self.held.remove(at);
                    d.phases.into_iter().for_each(|p| self.funnel.pour(p));
                }
                self.shake_into(r)?;
            }
            Action::Dry { agent } => {
                r.did = match agent {
                    Some(a) => format!("dry the organic layer over {a}"),
                    None => "dry the organic layer".into(),
                };
                self.need_organic_alone(step, r);
            }
            Action::Concentrate => {
                r.did = "concentrate the organic layer".into();
                self.need_organic_alone(step, r);
            }
        }
        Ok(())
    }

    /// Shakes and records the pH and gas in the report.
    pub fn shake_into(&mut self, r: &mut StepReport) -> Result<Option<f64>> {
        let shake = self.funnel.shake(&self.slots, self.conditions())?;
        if let Some(s) = &shake {
            r.ph = Some(s.ph);
            r.co2_released_ml += self.gas_ml(s.co2_released_mol);
        }
        Ok(shake.map(|s| s.ph))
    }

    /// Empties the funnel.
    pub fn take_funnel(&mut self) -> Vec<Phase> {
        let f = std::mem::take(&mut self.funnel);
        f.organic.into_iter().chain(f.aqueous).collect()
    }

    /// Sets `phases` aside under `name`, or throws them away.
    fn put_away(&mut self, step: usize, name: &Option<String>, phases: Vec<Phase>, what: Gone) {
        let d = Departure {
            step,
            phases,
            gone: what,
            set_aside: name.clone(),
            flagged: self.extraction_ph_flagged,
        };
        match name {
            Some(n) => self.held.push((n.clone(), d)),
            None => self.gone.push(d),
        }
    }

    fn separate(
        &mut self,
        step: &Step,
        keep: Which,
        set_aside: &Option<String>,
        r: &mut StepReport,
    ) -> Result<()> {
        r.did = format!("separate, keep the {} layer", keep.as_str());
        if let Some(n) = set_aside {
            r.did += &format!(", set the other aside as `{n}`");
        }
        if self.funnel.organic.is_none() || self.funnel.aqueous.is_none() {
            r.problems.push(checks::nothing_to_separate(self, step));
            return Ok(());
        }
        r.ph = self.funnel.aqueous.as_ref().and_then(|a| a.ph);
        let organic_on_top = self.funnel.organic_on_top();
        let mut keep_organic = match keep {
            Which::Organic => true,
            Which::Aqueous => false,
            Which::Top => organic_on_top,
            Which::Bottom => !organic_on_top,
        };
        if let Some(p) = checks::mixup(self, step, keep, keep_organic, organic_on_top) {
            r.problems.push(p);
            keep_organic = !keep_organic;
        }
        let (kept, other) = if keep_organic {
            (self.funnel.organic.take(), self.funnel.aqueous.take())
        } else {
            (self.funnel.aqueous.take(), self.funnel.organic.take())
        };
        self.funnel.pour(kept.expect("both layers present"));
        let other = other.expect("both layers present");
        let what = Gone::Separated {
            kept_organic: keep_organic,
            organic_on_top,
        };
        self.put_away(step.number, set_aside, vec![other], what);
        Ok(())
    }

    fn wash(
        &mut self,
        step: &Step,
        portion: &Portion,
        portions: u32,
        set_aside: &Option<String>,
        aim: &Aim,
        r: &mut StepReport,
    ) -> Result<()> {
        r.did = format!("wash with {}, {} portion(s)", portion.describe(), portions);
        if self.funnel.organic.is_none() {
            r.problems.push(checks::wrong_layer(self, step, true));
            self.stopped = true;
            return Ok(());
        }
        let mut washes: Option<Phase> = None;
        let mut first_before = None;
        if !is_solution(portion) && self.funnel.aqueous.is_none() {
            r.problems.push(checks::no_water(step));
            return Ok(());
        }
        for _ in 0..portions {
            first_before.get_or_insert_with(|| self.funnel.clone());
            self.funnel
                .aqueous
                .get_or_insert_with(|| Phase::empty(PhaseKind::Aqueous, 0.0, self.slots.len()))
                .add(portion);
            if let Some(ph) = self.shake_into(r)? {
                r.portion_ph.push(ph);
            }
            let spent = self.funnel.aqueous.take().expect("just added");
            match washes.as_mut() {
                Some(w) => w.merge(spent),
                None => washes = Some(spent),
            }
        }
        r.reagent_mol = reagent_mol(portion).map(|m| m * portions as f64);
        self.cautions(r, portion);
        let first_before = first_before.unwrap_or_else(|| self.funnel.clone());
        if let Some(p) = checks::shortfall_wash(self, step, &first_before, portion, r.ph, aim)? {
            r.problems.push(p);
        }
        if let Some(w) = washes {
            self.put_away(step.number, set_aside, vec![w], Gone::Washes { ph: r.ph });
        }
        Ok(())
    }

    fn adjust(
        &mut self,
        step: &Step,
        raise: bool,
        reagent: &Reagent,
        offer: &crate::equilibrium::StockOffer,
        by: &AdjustBy,
        r: &mut StepReport,
    ) -> Result<()> {
        let verb = if raise { "basify" } else { "acidify" };
        if self.funnel.aqueous.is_none() {
            r.did = format!("{verb} with {}", reagent.name);
            r.problems.push(checks::wrong_layer(self, step, false));
            self.stopped = true;
            return Ok(());
        }
        let before = self.funnel.clone();
        let portion = match by {
            AdjustBy::Given(p) => (**p).clone(),
            AdjustBy::ToPh(target) => {
                let two = self
                    .funnel
                    .two_layers(&self.slots)
                    .expect("aqueous present");
                match layers::dose_with_alternatives(
                    &two,
                    reagent,
                    offer,
                    *target,
                    self.conditions(),
                    self.catalogue,
                ) {
                    Ok(d) => Portion {
                        liquid: Liquid::Reagent {
                            reagent: Box::new(reagent.clone()),
                            offer: offer.clone(),
                        },
                        mol: d.dose.reagent_mol,
                        volume_l: d.dose.stock_volume_l.unwrap_or(0.0),
                    },
                    Err(Error::Unreachable(message)) => {
                        r.did = format!(
                            "{verb} to pH {target:.1} with {} ({})",
                            reagent.name,
                            offer.label()
                        );
                        r.ph = before.aqueous.as_ref().and_then(|a| a.ph);
                        r.problems
                            .push(checks::unreachable(step, *target, &message));
                        return Ok(());
                    }
                    Err(e) => return Err(e),
                }
            }
        };
        r.did = match by {
            AdjustBy::ToPh(t) => format!("{verb} to pH {t:.1}: {}", portion.describe()),
            AdjustBy::Given(_) => format!("{verb} with {}", portion.describe()),
        };
        self.funnel
            .aqueous
            .as_mut()
            .expect("aqueous present")
            .add(&portion);
        self.shake_into(r)?;
        r.reagent_mol = reagent_mol(&portion);
        self.cautions(r, &portion);
        self.extraction_ph_flagged = false;
        if matches!(by, AdjustBy::Given(_)) {
            let aim = if raise {
                Aim {
                    at_least: Some(7.0),
                    at_most: None,
                }
            } else {
                Aim {
                    at_least: None,
                    at_most: Some(7.0),
                }
            };
            if let Some(p) = checks::shortfall(self, step, &before, &portion, r.ph, &aim)? {
                r.problems.push(p);
            }
        }
        if let Some(p) = checks::extraction_ph(self, step, &before, raise) {
            r.problems.push(p);
            self.extraction_ph_flagged = true;
        }
        Ok(())
    }

    #[allow(clippy::too_many_arguments)]
    fn extract(
        &mut self,
        step: &Step,
        solvent: &'static crate::partition::solvents::Solvent,
        volume_l: f64,
        portions: u32,
        keep: Which,
        set_aside: &Option<String>,
        r: &mut StepReport,
    ) -> Result<()> {
        r.did = format!(
            "extract with {} of {}, {} portion(s), keep the {} layer",
            crate::units::fmt_volume(volume_l),
            solvent.name,
            portions,
            keep.as_str()
        );
        if self.funnel.aqueous.is_none() {
            r.problems.push(checks::wrong_layer(self, step, false));
            self.stopped = true;
            return Ok(());
        }
        let mut extracts: Option<Phase> = None;
        // An organic layer still in the funnel joins the first portion.
        let mut carried = self.funnel.organic.take();
        for _ in 0..portions {
            let mut fresh = Phase::empty(PhaseKind::Organic(solvent), volume_l, self.slots.len());
            if let Some(old) = carried.take() {
                fresh.merge(old);
            }
            self.funnel.organic = Some(fresh);
            if let Some(ph) = self.shake_into(r)? {
                r.portion_ph.push(ph);
            }
            let used = self.funnel.organic.take().expect("just added");
            match extracts.as_mut() {
                Some(e) => e.merge(used),
                None => extracts = Some(used),
            }
        }
        let extracts = extracts.expect("at least one portion");
        let aqueous = self.funnel.aqueous.take().expect("aqueous present");
        let organic_on_top = extracts.density_g_ml < aqueous.density_g_ml;
        let keep_organic = match keep {
            Which::Organic => true,
            Which::Aqueous => false,
            Which::Top => organic_on_top,
            Which::Bottom => !organic_on_top,
        };
        let (kept, other) = if keep_organic {
            (extracts, aqueous)
        } else {
            (aqueous, extracts)
        };
        self.funnel.pour(kept);
        let what = Gone::Extracted {
            kept_organic: keep_organic,
            ph: r.ph,
        };
        self.put_away(step.number, set_aside, vec![other], what);
        Ok(())
    }

    /// Dry and concentrate work on the organic layer alone.
    fn need_organic_alone(&mut self, step: &Step, r: &mut StepReport) {
        if self.funnel.organic.is_none() {
            r.problems.push(checks::wrong_layer(self, step, true));
            self.stopped = true;
        } else if let Some(water) = self.funnel.aqueous.take() {
            r.problems.push(checks::water_left(self, step));
            self.gone.push(Departure {
                step: step.number,
                phases: vec![water],
                gone: Gone::Combined,
                set_aside: None,
                flagged: true,
            });
        }
    }

    /// Reagent and stock cautions for a portion (not the closing deferral: it is said once),
    /// with the CO2 volume when gas forms.
    fn cautions(&self, r: &mut StepReport, portion: &Portion) {
        let Liquid::Reagent { reagent, offer } = &portion.liquid else {
            return;
        };
        let gas = r.co2_released_ml > 0.05;
        let situation = Situation { gas, solvent: None };
        if let Ok(mut list) = cautions_for(&reagent.name, &offer.label(), &situation) {
            list.pop();
            r.cautions.extend(list);
        }
        if gas {
            r.cautions.push(format!(
                "About {:.0} mL of CO2 gas forms in this step (at {} °C and 1 atm).",
                r.co2_released_ml,
                self.conditions().temperature_c()
            ));
        }
    }
}

/// Reagent moles of a portion (none for water and brine).
fn reagent_mol(portion: &Portion) -> Option<f64> {
    match &portion.liquid {
        Liquid::Reagent { .. } => Some(portion.mol),
        Liquid::Plain(_) => None,
    }
}

/// Whether a stock adds volume.
pub fn is_solution(portion: &Portion) -> bool {
    match &portion.liquid {
        Liquid::Reagent { offer, .. } => matches!(offer.stock, Stock::Solution { .. }),
        Liquid::Plain(_) => true,
    }
}

/// Problems of a step in file order are collected here for the report's flat list.
pub fn all_problems(steps: &[StepReport], extra: &[Problem]) -> Vec<Problem> {
    let mut out: Vec<Problem> = steps.iter().flat_map(|s| s.problems.clone()).collect();
    out.extend(extra.iter().cloned());
    out.sort_by_key(|p| p.step);
    out
}
