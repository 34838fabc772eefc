//! Reads a procedure file: TOML syntax through the `toml` crate, then every value checked for
//! sense (known solvent, reagent and stock, SMILES that parse, amounts and volumes with units,
//! layer names defined before use). Every error points at a line and column of the file.

use std::collections::HashSet;
use std::ops::Range;

use toml::Spanned;

use super::format::{
    ACTIONS, RawCompound, RawMixture, RawProcedure, RawStep, allowed_keys, key_position,
};
use super::model::*;
use crate::acidity::{Handbook, Profile};
use crate::chem::formula::molar_mass;
use crate::equilibrium::{Activity, Co2Mode, Conditions, Reagent, Stock, StockForm};
use crate::error::{Error, ParseError, Result};
use crate::partition::solvents;
use crate::units::{self, Amount, PH_MAX, PH_MIN};

/// Line (1-based), column (1-based, in characters) and the line's text for a byte offset.
pub fn locate(text: &str, at: usize) -> (usize, usize, &str) {
    let at = floor_char_boundary(text, at.min(text.len()));
    let line_start = text[..at].rfind('\n').map_or(0, |i| i + 1);
    let line_end = text[at..].find('\n').map_or(text.len(), |i| at + i);
    let line = text[..at].matches('\n').count() + 1;
    let column = text[line_start..at].chars().count() + 1;
    (
        line,
        column,
        text[line_start..line_end].trim_end_matches('\r'),
    )
}

fn floor_char_boundary(text: &str, mut at: usize) -> usize {
    while at > 0 && !text.is_char_boundary(at) {
        at -= 1;
    }
    at
}

/// An error at byte `at` of the file: the line is shown with a caret under the column.
pub fn error_at(text: &str, at: usize, message: impl Into<String>) -> Error {
    let at = floor_char_boundary(text, at.min(text.len()));
    let (line, column, line_text) = locate(text, at);
    let line_start = text[..at].rfind('\n').map_or(0, |i| i + 1);
    Error::Parse(ParseError::new(
        "procedure",
        line_text,
        (at - line_start).min(line_text.len()),
        format!("line {line}, column {column}: {}", message.into()),
    ))
}

/// Offset of a string value's first character: past the opening quote(s).
fn content_start(text: &str, span: &Range<usize>) -> usize {
    let rest = text.get(span.start..span.end).unwrap_or("");
    if rest.starts_with("\"\"\"") || rest.starts_with("'''") {
        span.start + 3
    } else if rest.starts_with('"') || rest.starts_with('\'') {
        span.start + 1
    } else {
        span.start
    }
}

/// Reads and checks a whole procedure.
pub fn read(text: &str, handbook: &Handbook, catalogue: &[Reagent]) -> Result<Procedure> {
    let raw: RawProcedure = toml::from_str(text).map_err(|e| {
        let at = e.span().map_or(0, |s| s.start);
        error_at(text, at, e.message().trim().to_string())
    })?;
    let r = Reader {
        text,
        catalogue,
        plain: PlainLiquid::builtin()?,
    };
    let mixture = r.mixture(raw.mixture.get_ref(), raw.mixture.span(), handbook)?;
    let product = match &raw.product {
        None => None,
        Some(p) => Some(
            mixture
                .compounds
                .iter()
                .position(|c| c.name == *p.get_ref())
                .ok_or_else(|| {
                    r.err(
                        content_start(text, &p.span()),
                        format!(
                            "product `{}` is not one of the compounds ({})",
                            p.get_ref(),
                            names(&mixture.compounds)
                        ),
                    )
                })?,
        ),
    };
    let product_mol = product.map(|i| mixture.compounds[i].amount_mol);
    let mut held = HashSet::new();
    let mut steps = Vec::new();
    for (i, step) in raw.step.iter().enumerate() {
        let (line, _, _) = locate(text, step.get_ref().action.span().start);
        let action = r.action(step.get_ref(), product_mol, &mut held)?;
        steps.push(Step {
            number: i + 1,
            line,
            note: step.get_ref().note.as_ref().map(|n| n.get_ref().clone()),
            action,
        });
    }
    Ok(Procedure {
        title: raw.title.map(Spanned::into_inner),
        product,
        mixture,
        steps,
    })
}

fn names(compounds: &[Compound]) -> String {
    compounds
        .iter()
        .map(|c| c.name.as_str())
        .collect::<Vec<_>>()
        .join(", ")
}

struct Reader<'a> {
    text: &'a str,
    catalogue: &'a [Reagent],
    plain: Vec<PlainLiquid>,
}

impl Reader<'_> {
    fn err(&self, at: usize, message: impl Into<String>) -> Error {
        error_at(self.text, at, message)
    }

    /// Re-anchors an error from reading a string value onto the file.
    fn at_value(&self, value: &Spanned<String>, e: Error) -> Error {
        let start = content_start(self.text, &value.span());
        match e {
            Error::Parse(p) => self.err(start + p.position, format!("{}: {}", p.what, p.message)),
            Error::Input(m) => self.err(start, m),
            other => other,
        }
    }

    fn volume(&self, value: &Spanned<String>) -> Result<f64> {
        units::parse_volume(value.get_ref())
            .map(|v| v.litres)
            .map_err(|e| self.at_value(value, e.into()))
    }

    fn ph(&self, value: &Spanned<f64>) -> Result<f64> {
        let ph = *value.get_ref();
        if !(PH_MIN..=PH_MAX).contains(&ph) {
            return Err(self.err(
                value.span().start,
                format!("pH {ph} is outside {PH_MIN}..{PH_MAX}"),
            ));
        }
        Ok(ph)
    }

    fn mixture(
        &self,
        raw: &RawMixture,
        span: Range<usize>,
        handbook: &Handbook,
    ) -> Result<Mixture> {
        let solvent =
            solvents::find(raw.solvent.get_ref()).map_err(|e| self.at_value(&raw.solvent, e))?;
        let organic_l = self.volume(&raw.volume)?;
        let water_l = match &raw.water {
            Some(w) => self.volume(w)?,
            None => 0.0,
        };
        let temperature = raw.temperature.as_ref().map_or(25.0, |t| *t.get_ref());
        let conditions = Conditions::new(temperature).map_err(|e| match e {
            Error::Input(m) => self.err(raw.temperature.as_ref().map_or(0, |t| t.span().start), m),
            other => other,
        })?;
        let co2 = match &raw.co2 {
            Some(c) => Co2Mode::parse(c.get_ref()).map_err(|_| {
                self.err(
                    content_start(self.text, &c.span()),
                    format!("co2 `{}`: use closed, vented or air", c.get_ref()),
                )
            })?,
            None => Co2Mode::Vented,
        };
        let ideal = raw.ideal.as_ref().is_some_and(|b| *b.get_ref());
        let activity = if ideal {
            Activity::Ideal
        } else {
            Activity::Davies
        };
        let conditions = conditions.with_activity(activity).with_co2(co2);
        if raw.compound.is_empty() {
            return Err(self.err(
                span.start,
                "the mixture needs at least one [[mixture.compound]] (name, smiles, amount)",
            ));
        }
        let mut compounds: Vec<Compound> = Vec::new();
        for c in &raw.compound {
            let compound = self.compound(c.get_ref(), handbook, organic_l)?;
            if compounds.iter().any(|o| o.name == compound.name) {
                let name = &c.get_ref().name;
                return Err(self.err(
                    content_start(self.text, &name.span()),
                    format!("compound name `{}` is used twice", compound.name),
                ));
            }
            compounds.push(compound);
        }
        Ok(Mixture {
            solvent,
            organic_l,
            water_l,
            conditions,
            compounds,
        })
    }

    fn compound(&self, raw: &RawCompound, handbook: &Handbook, volume_l: f64) -> Result<Compound> {
        if raw.name.get_ref().trim().is_empty() {
            return Err(self.err(raw.name.span().start, "a compound name cannot be empty"));
        }
        let profile = Profile::new(raw.smiles.get_ref(), handbook)
            .map_err(|e| self.at_value(&raw.smiles, e))?;
        let amount = units::parse_amount(raw.amount.get_ref())
            .map_err(|e| self.at_value(&raw.amount, e.into()))?;
        if matches!(amount, Amount::Equivalents(_)) {
            return Err(self.at_value(
                &raw.amount,
                Error::Input("give a compound's amount in mol or g, not equivalents".into()),
            ));
        }
        let amount_mol = amount
            .to_moles(Some(molar_mass(&profile.molecule)), Some(volume_l))
            .map_err(|e| self.at_value(&raw.amount, e))?;
        Ok(Compound {
            name: raw.name.get_ref().clone(),
            smiles: raw.smiles.get_ref().clone(),
            profile,
            amount_mol,
        })
    }

    /// A step's action, after checking that every key it carries belongs to it.
    fn action(
        &self,
        raw: &RawStep,
        product_mol: Option<f64>,
        held: &mut HashSet<String>,
    ) -> Result<Action> {
        let verb = raw.action.get_ref().trim().to_ascii_lowercase();
        let Some(allowed) = allowed_keys(&verb) else {
            return Err(self.err(
                content_start(self.text, &raw.action.span()),
                format!(
                    "unknown action `{}`; use one of {}",
                    raw.action.get_ref(),
                    ACTIONS.join(", ")
                ),
            ));
        };
        for (key, at) in raw.keys() {
            if !allowed.contains(&key) {
                return Err(self.err(
                    key_position(self.text, at),
                    format!(
                        "`{key}` does not belong to a `{verb}` step (it takes: {})",
                        if allowed.is_empty() {
                            "no other keys".to_string()
                        } else {
                            allowed.join(", ")
                        }
                    ),
                ));
            }
        }
        let step_at = raw.action.span().start;
        Ok(match verb.as_str() {
            "add" => Action::Add {
                portion: self.portion(raw, step_at, product_mol)?,
                aim: self.aim(raw)?,
            },
            "separate" => {
                let keep = self.keep(raw, step_at, None)?;
                Action::Separate {
                    keep,
                    set_aside: self.define(&raw.set_aside, held)?,
                }
            }
            "wash" => Action::Wash {
                portion: self.portion(raw, step_at, product_mol)?,
                portions: self.portions(raw)?,
                set_aside: self.define(&raw.set_aside, held)?,
                aim: self.aim(raw)?,
            },
            "acidify" | "basify" => self.adjust(raw, verb == "basify", step_at, product_mol)?,
            "extract" => Action::Extract {
                solvent: match &raw.solvent {
                    Some(s) => solvents::find(s.get_ref()).map_err(|e| self.at_value(s, e))?,
                    None => return Err(self.missing(step_at, "extract", "solvent")),
                },
                volume_l: match &raw.volume {
                    Some(v) => self.volume(v)?,
                    None => return Err(self.missing(step_at, "extract", "volume")),
                },
                portions: self.portions(raw)?,
                keep: self.keep(raw, step_at, Some(Which::Organic))?,
                set_aside: self.define(&raw.set_aside, held)?,
            },
            "combine" => self.combine(raw, step_at, held)?,
            "dry" => Action::Dry {
                agent: raw.agent.as_ref().map(|a| a.get_ref().clone()),
            },
            _ => Action::Concentrate,
        })
    }

    fn missing(&self, at: usize, verb: &str, key: &str) -> Error {
        self.err(at, format!("a `{verb}` step needs `{key}`"))
    }

    fn keep(&self, raw: &RawStep, step_at: usize, default: Option<Which>) -> Result<Which> {
        match (&raw.keep, default) {
            (Some(k), _) => Which::parse(k.get_ref()).ok_or_else(|| {
                self.err(
                    content_start(self.text, &k.span()),
                    format!(
                        "keep `{}`: use organic, aqueous, top or bottom",
                        k.get_ref()
                    ),
                )
            }),
            (None, Some(d)) => Ok(d),
            (None, None) => Err(self.missing(step_at, "separate", "keep")),
        }
    }

    fn portions(&self, raw: &RawStep) -> Result<u32> {
        match &raw.portions {
            None => Ok(1),
            Some(p) => match u32::try_from(*p.get_ref()) {
                Ok(n @ 1..=20) => Ok(n),
                _ => Err(self.err(
                    p.span().start,
                    "portions must be a whole number from 1 to 20",
                )),
            },
        }
    }

    fn aim(&self, raw: &RawStep) -> Result<Aim> {
        Ok(Aim {
            at_least: raw.ph_at_least.as_ref().map(|p| self.ph(p)).transpose()?,
            at_most: raw.ph_at_most.as_ref().map(|p| self.ph(p)).transpose()?,
        })
    }

    /// A new layer name: not empty, not held already.
    fn define(
        &self,
        name: &Option<Spanned<String>>,
        held: &mut HashSet<String>,
    ) -> Result<Option<String>> {
        let Some(n) = name else { return Ok(None) };
        let text = n.get_ref().trim().to_string();
        let at = content_start(self.text, &n.span());
        if text.is_empty() {
            return Err(self.err(at, "a layer name cannot be empty"));
        }
        if !held.insert(text.clone()) {
            return Err(self.err(
                at,
                format!("a layer named `{text}` is already set aside; choose another name"),
            ));
        }
        Ok(Some(text))
    }

    fn combine(&self, raw: &RawStep, step_at: usize, held: &mut HashSet<String>) -> Result<Action> {
        let Some(list) = &raw.layers else {
            return Err(self.missing(step_at, "combine", "layers"));
        };
        if list.get_ref().is_empty() {
            return Err(self.err(list.span().start, "name at least one layer to combine"));
        }
        let mut layers = Vec::new();
        for name in list.get_ref() {
            let text = name.get_ref().trim().to_string();
            if !held.remove(&text) {
                let mut known: Vec<&String> = held.iter().collect();
                known.sort();
                return Err(self.err(
                    content_start(self.text, &name.span()),
                    format!(
                        "no layer named `{text}` is set aside at this point{}",
                        if known.is_empty() {
                            String::new()
                        } else {
                            format!(
                                " (set aside: {})",
                                known
                                    .iter()
                                    .map(|s| s.as_str())
                                    .collect::<Vec<_>>()
                                    .join(", ")
                            )
                        }
                    ),
                ));
            }
            layers.push(text);
        }
        Ok(Action::Combine {
            layers,
            set_aside: self.define(&raw.set_aside, held)?,
        })
    }

    fn adjust(
        &self,
        raw: &RawStep,
        raise: bool,
        step_at: usize,
        product_mol: Option<f64>,
    ) -> Result<Action> {
        let verb = if raise { "basify" } else { "acidify" };
        let Liquid::Reagent { reagent, offer } = self.liquid(raw, step_at)? else {
            let r = raw
                .reagent
                .as_ref()
                .map_or(step_at, |r| content_start(self.text, &r.span()));
            return Err(self.err(r, format!("to {verb}, name an acid or base reagent")));
        };
        let by = match &raw.to_ph {
            Some(ph) if raw.volume.is_some() || raw.amount.is_some() => {
                return Err(self.err(
                    key_position(self.text, ph.span().start),
                    "give either `to_ph` or a `volume`/`amount`, not both",
                ));
            }
            Some(ph) => AdjustBy::ToPh(self.ph(ph)?),
            None => AdjustBy::Given(Box::new(self.portion(raw, step_at, product_mol)?)),
        };
        Ok(Action::Adjust {
            raise,
            reagent,
            offer,
            by,
        })
    }

    /// The liquid named by `reagent` and `stock`.
    fn liquid(&self, raw: &RawStep, step_at: usize) -> Result<Liquid> {
        let Some(name) = &raw.reagent else {
            return Err(self.err(
                step_at,
                "this step needs `reagent` (a reagent name, water or brine)",
            ));
        };
        let name_at = content_start(self.text, &name.span());
        if let Some(p) = self.plain.iter().find(|p| p.answers_to(name.get_ref())) {
            if let Some(s) = &raw.stock {
                return Err(self.err(
                    key_position(self.text, s.span().start),
                    format!("{} takes no `stock`", p.name),
                ));
            }
            return Ok(Liquid::Plain(p.clone()));
        }
        let reagent = Reagent::find(self.catalogue, name.get_ref()).map_err(|e| match e {
            Error::Input(m) => self.err(name_at, format!("{m}, water, brine")),
            other => other,
        })?;
        let Some(stock) = &raw.stock else {
            return Err(self.err(
                step_at,
                format!(
                    "say which stock of {} (`stock = ...`; offered: {})",
                    reagent.name,
                    reagent.offered_labels().join(", ")
                ),
            ));
        };
        let form = StockForm::parse(stock.get_ref()).map_err(|e| self.at_value(stock, e.into()))?;
        let offer = reagent
            .offer(&form)
            .map_err(|e| self.at_value(stock, e))?
            .clone();
        Ok(Liquid::Reagent {
            reagent: Box::new(reagent.clone()),
            offer,
        })
    }

    /// A liquid with its quantity: `volume` for solutions and plain liquids, `amount` (mol,
    /// g or equivalents of the product) for solids or solutions.
    fn portion(&self, raw: &RawStep, step_at: usize, product_mol: Option<f64>) -> Result<Portion> {
        let liquid = self.liquid(raw, step_at)?;
        let (molar, formula_mass) = match &liquid {
            Liquid::Reagent { reagent, offer } => (
                match offer.stock {
                    Stock::Solution { molar } => Some(molar),
                    Stock::Solid => None,
                },
                Some(reagent.molar_mass_g_mol),
            ),
            Liquid::Plain(_) => (None, None),
        };
        let solid = formula_mass.is_some() && molar.is_none();
        match (&raw.volume, &raw.amount) {
            (Some(_), Some(a)) => Err(self.err(
                key_position(self.text, a.span().start),
                "give either `volume` or `amount`, not both",
            )),
            (None, None) => Err(self.err(
                step_at,
                if solid {
                    "say how much: `amount` (mol, g or equiv of the product)"
                } else {
                    "say how much: `volume` (or `amount` for a reagent)"
                },
            )),
            (Some(v), None) => {
                if solid {
                    return Err(self.err(
                        key_position(self.text, v.span().start),
                        "a solid is weighed: give `amount` (mol, g or equiv), not `volume`",
                    ));
                }
                let volume_l = self.volume(v)?;
                Ok(Portion {
                    mol: molar.map_or(0.0, |m| m * volume_l),
                    volume_l,
                    liquid,
                })
            }
            (None, Some(a)) => {
                let Some(mass) = formula_mass else {
                    return Err(self.err(
                        key_position(self.text, a.span().start),
                        "water and brine are measured by `volume`",
                    ));
                };
                let amount =
                    units::parse_amount(a.get_ref()).map_err(|e| self.at_value(a, e.into()))?;
                let mol = match amount {
                    Amount::Equivalents(eq) => match product_mol {
                        Some(p) => eq * p,
                        None => {
                            return Err(self.at_value(
                                a,
                                Error::Input("equivalents need a `product` to count from".into()),
                            ));
                        }
                    },
                    Amount::Molar(_) => {
                        return Err(self.at_value(
                            a,
                            Error::Input(
                                "give the stock's strength in `stock` and here mol, g or equiv"
                                    .into(),
                            ),
                        ));
                    }
                    other => other
                        .to_moles(Some(mass), None)
                        .map_err(|e| self.at_value(a, e))?,
                };
                Ok(Portion {
                    mol,
                    volume_l: molar.map_or(0.0, |m| mol / m),
                    liquid,
                })
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn locate_counts_lines_and_characters() {
        let text = "a = 1\n# µ comment\nbad = \"x\"\n";
        let at = text.find("bad").unwrap();
        assert_eq!(locate(text, at), (3, 1, "bad = \"x\""));
        let mu = text.find('µ').unwrap() + 'µ'.len_utf8();
        // Column in characters: `µ` is one character, two bytes.
        assert_eq!(locate(text, mu).1, 4);
        // Past the end and inside a character do not panic.
        assert_eq!(locate(text, 10_000).0, 4);
        let _ = error_at(text, mu - 1, "inside");
    }

    #[test]
    fn content_start_skips_the_quotes() {
        let text = "k = \"abc\"\nm = '''x'''";
        let s = text.find('"').unwrap();
        assert_eq!(content_start(text, &(s..s + 5)), s + 1);
        let t = text.find("'''").unwrap();
        assert_eq!(content_start(text, &(t..t + 7)), t + 3);
    }
}
