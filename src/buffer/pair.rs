//! Recipe (a): weigh the acid form and the base form. The two forms are the user's, or the
//! preferred forms at the two protonation levels whose own solutions bracket the target pH
//! (NaH2PO4·H2O and Na2HPO4·7H2O for pH 7). The share of the system that comes as the base
//! form is found by bisection on the full equilibrium, so activity, temperature and the other
//! steps of a polyprotic system are all in the answer.

use super::mixture::{Mixture, reach};
use super::recipe::{Component, Made, Request};
use super::system::{BufferForm, BufferSystem};
use crate::error::{Error, Result};

/// The two forms and how much of each (formula units, mol), with the mixture they make.
pub struct Pair {
    pub acid: BufferForm,
    pub base: BufferForm,
    pub acid_mol: f64,
    pub base_mol: f64,
    pub mixture: Mixture,
    pub equilibrium: crate::equilibrium::Equilibrium,
}

/// The mixture of `acid` and `base` with share `t` of the system from `base`.
fn blend(acid: &BufferForm, base: &BufferForm, total: f64, volume_l: f64, t: f64) -> Mixture {
    Mixture::empty(volume_l)
        .with_form(acid, (1.0 - t) * total / acid.units)
        .with_form(base, t * total / base.units)
}

/// The two forms to mix: the user's two (ordered by level), or the bracketing defaults.
fn choose(system: &BufferSystem, request: &Request) -> Result<(BufferForm, BufferForm)> {
    let top = system.top_charge();
    let c = &request.conditions;
    let total = request.system_mol();
    if !request.forms.is_empty() {
        let [a, b] = request.forms.as_slice() else {
            return Err(Error::Input(
                "this recipe mixes two forms: give --forms ACID,BASE".into(),
            ));
        };
        let (a, b) = (system.form(a)?.clone(), system.form(b)?.clone());
        if (a.level(top) - b.level(top)).abs() < 1e-9 {
            return Err(Error::Input(format!(
                "{} and {} are the same protonation state of {}: they cannot set a pH",
                a.name, b.name, system.name
            )));
        }
        return Ok(if a.level(top) < b.level(top) {
            (a, b)
        } else {
            (b, a)
        });
    }
    let forms = system.default_forms();
    let mut alone = Vec::with_capacity(forms.len());
    for f in &forms {
        let ph = Mixture::empty(request.volume_l)
            .with_form(f, total / f.units)
            .solve(system, c)?
            .ph;
        alone.push(ph);
    }
    for i in 0..forms.len().saturating_sub(1) {
        if alone[i] <= request.ph && request.ph <= alone[i + 1] {
            return Ok((forms[i].clone(), forms[i + 1].clone()));
        }
    }
    let (lo, hi) = (alone[0], alone[alone.len() - 1]);
    Err(Error::Unreachable(format!(
        "the forms of {} in the table ({}) give pH {lo:.2} to {hi:.2} at this concentration; \
         for pH {:.2} use --recipe titrate",
        system.name,
        forms
            .iter()
            .map(|f| f.name.as_str())
            .collect::<Vec<_>>()
            .join(", "),
        request.ph
    )))
}

/// Solves the pair for the request.
pub fn solve(system: &BufferSystem, request: &Request) -> Result<Pair> {
    let (acid, base) = choose(system, request)?;
    let total = request.system_mol();
    let v = request.volume_l;
    let what = format!("mixing {} and {}", acid.name, base.name);
    let (t, equilibrium) = reach(
        request.ph,
        (0.0, 1.0),
        system,
        &request.conditions,
        &what,
        |t| blend(&acid, &base, total, v, t),
    )?;
    Ok(Pair {
        acid_mol: (1.0 - t) * total / acid.units,
        base_mol: t * total / base.units,
        mixture: blend(&acid, &base, total, v, t),
        acid,
        base,
        equilibrium,
    })
}

/// Recipe (a).
pub fn make(system: &BufferSystem, request: &Request) -> Result<Made> {
    let p = solve(system, request)?;
    let v = request.volume_l;
    Ok(Made {
        components: vec![
            Component::of_form(&p.acid, "acid form", p.acid_mol),
            Component::of_form(&p.base, "base form", p.base_mol),
        ],
        dissolved: vec![
            (p.acid.clone(), p.acid_mol / v),
            (p.base.clone(), p.base_mol / v),
        ],
        mixture: p.mixture,
        equilibrium: p.equilibrium,
        stocks: Vec::new(),
        water_ml: None,
        notes: vec![format!(
            "dissolve both in about 80 % of the volume, then make up to {:.0} mL with water",
            v * 1e3
        )],
    })
}
