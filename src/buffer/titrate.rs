//! Recipe (b): weigh one form, dissolve it in most of the volume, titrate with a strong acid or
//! base stock to the pH, make up to volume. The titrant amount is the one that gives the
//! target pH in the final volume (the bisection runs on the full equilibrium). Without a named
//! form (and for a table system), every preferred form on the right side of the target is tried and the one that needs
//! the least titrant wins, among those the table says prep rooms titrate with that reagent.

use super::mixture::{Mixture, reach};
use super::recipe::{Component, Made, Request};
use super::system::{BufferForm, BufferSystem};
use crate::equilibrium::{Reagent, Role, Stock, StockForm};
use crate::error::{Error, Result};

/// The titrant as the recipe uses it.
struct Titrant<'a> {
    reagent: &'a Reagent,
    stock: Stock,
    label: String,
}

fn titrant<'a>(catalogue: &'a [Reagent], name: &str, form: &StockForm) -> Result<Titrant<'a>> {
    let reagent = Reagent::find(catalogue, name)?;
    if reagent.system.is_some() || reagent.carbonate != 0.0 {
        return Err(Error::Input(format!(
            "{name} is not a strong acid or base; titrate with naoh, koh or hcl"
        )));
    }
    let offer = reagent.offer(form)?;
    Ok(Titrant {
        reagent,
        stock: offer.stock,
        label: offer.label(),
    })
}

/// One candidate: a form, the titrant, and the titrant moles that reach the target.
struct Trial<'a> {
    form: BufferForm,
    titrant: Titrant<'a>,
    titrant_mol: f64,
    mixture: Mixture,
    equilibrium: crate::equilibrium::Equilibrium,
}

fn with_titrant(mix: Mixture, reagent: &Reagent, mol: f64) -> Mixture {
    Mixture {
        strong_cations_mol: mix.strong_cations_mol + mol * reagent.strong_cations,
        strong_anions_mol: mix.strong_anions_mol + mol * reagent.strong_anions,
        ..mix
    }
}

fn trial<'a>(
    system: &BufferSystem,
    request: &Request,
    form: &BufferForm,
    t: Titrant<'a>,
) -> Result<Trial<'a>> {
    let v = request.volume_l;
    let base = Mixture::empty(v).with_form(form, request.system_mol() / form.units);
    // At most the whole final volume of a solution; a solid is bounded by the system amount
    // many times over (far past the last equivalence point).
    let most = match t.stock {
        Stock::Solution { molar } => molar * v,
        Stock::Solid => 10.0 * (system.pkas.len() as f64 + 1.0) * request.system_mol(),
    };
    let reagent = t.reagent;
    let what = format!("{} with {} {}", form.name, t.label, reagent.name);
    let (x, equilibrium) = match reagent.role {
        Role::Base => reach(
            request.ph,
            (0.0, most),
            system,
            &request.conditions,
            &what,
            |x| with_titrant(base, reagent, x),
        )?,
        // Acid: pH falls as x grows, so search on y = most - x.
        Role::Acid => {
            let (y, eq) = reach(
                request.ph,
                (0.0, most),
                system,
                &request.conditions,
                &what,
                |y| with_titrant(base, reagent, most - y),
            )?;
            (most - y, eq)
        }
    };
    Ok(Trial {
        mixture: with_titrant(base, reagent, x),
        form: form.clone(),
        titrant: t,
        titrant_mol: x,
        equilibrium,
    })
}

fn default_titrant(role: Role) -> &'static str {
    match role {
        Role::Base => "naoh",
        Role::Acid => "hcl",
    }
}

/// The form and titrant to use: the user's form, or the preferred form that needs the least
/// titrant among those usually titrated with it.
fn best_trial<'a>(
    system: &BufferSystem,
    request: &Request,
    catalogue: &'a [Reagent],
) -> Result<Trial<'a>> {
    let c = &request.conditions;
    let one_molar = StockForm::Molar(1.0);
    let forms: Vec<BufferForm> = match request.forms.as_slice() {
        // A structure given as SMILES: the compound as written is what the user has.
        [] if system.estimated => vec![system.forms[0].clone()],
        [] => system.default_forms().into_iter().cloned().collect(),
        [one] => vec![system.form(one)?.clone()],
        _ => {
            return Err(Error::Input(
                "titration starts from one form: give --forms NAME".into(),
            ));
        }
    };
    let mut trials = Vec::new();
    let mut last_error = None;
    for form in &forms {
        let alone = Mixture::empty(request.volume_l)
            .with_form(form, request.system_mol() / form.units)
            .solve(system, c)?
            .ph;
        let needed = if alone < request.ph {
            Role::Base
        } else {
            Role::Acid
        };
        let t = match &request.titrant {
            Some((name, stock)) => titrant(catalogue, name, stock)?,
            None => titrant(catalogue, default_titrant(needed), &one_molar)?,
        };
        if t.reagent.role != needed && forms.len() > 1 {
            continue;
        }
        match trial(system, request, form, t) {
            Ok(found) => trials.push(found),
            Err(e) => last_error = Some(e),
        }
    }
    let usual = |t: &Trial| t.form.titrate_with.contains(&t.titrant.reagent.name);
    let best = trials
        .iter()
        .enumerate()
        .min_by(|(_, a), (_, b)| {
            usual(b)
                .cmp(&usual(a))
                .then(a.titrant_mol.total_cmp(&b.titrant_mol))
        })
        .map(|(i, _)| i);
    let Some(best) = best else {
        return Err(last_error.unwrap_or_else(|| {
            Error::Unreachable(format!(
                "no form of {} reaches pH {:.2} with that titrant",
                system.name, request.ph
            ))
        }));
    };
    Ok(trials.swap_remove(best))
}

/// Recipe (b).
pub fn make(system: &BufferSystem, request: &Request, catalogue: &[Reagent]) -> Result<Made> {
    let t = best_trial(system, request, catalogue)?;
    let form_mol = request.system_mol() / t.form.units;
    let reagent = t.titrant.reagent;
    let (mass_g, volume_ml, stock_molar) = match t.titrant.stock {
        Stock::Solution { molar } => (None, Some(t.titrant_mol / molar * 1e3), Some(molar)),
        Stock::Solid => (Some(t.titrant_mol * reagent.molar_mass_g_mol), None, None),
    };
    let total_ml = request.volume_l * 1e3;
    let mut notes = vec![format!(
        "dissolve the {} in about 80 % of the volume, add the {} {} with stirring to pH {:.2}, \
         then make up to {total_ml:.0} mL with water",
        t.form.label, t.titrant.label, reagent.formula, request.ph
    )];
    if let Some(ml) = volume_ml
        && ml > 0.5 * total_ml
    {
        notes.push(format!(
            "the titrant is {ml:.0} mL of {total_ml:.0} mL: a stronger stock leaves room to \
             dissolve the solid"
        ));
    }
    Ok(Made {
        components: vec![
            Component::of_form(&t.form, "form", form_mol),
            Component {
                name: reagent.name.clone(),
                label: format!("{} {}", t.titrant.label, reagent.formula),
                formula: reagent.formula.clone(),
                role: "titrant".into(),
                mol: t.titrant_mol,
                mass_g,
                volume_ml,
                stock_molar,
            },
        ],
        dissolved: vec![(t.form.clone(), form_mol / request.volume_l)],
        mixture: t.mixture,
        equilibrium: t.equilibrium,
        stocks: Vec::new(),
        water_ml: None,
        notes,
    })
}
