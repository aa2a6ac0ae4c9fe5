//! What each ingredient's ions do to pH, and why: the salt rule with Ka·Kb = Kw.

use serde::Serialize;

use crate::library::{Library, ResolvedRelease, form_names};
use crate::recipe::Batch;
use crate::solver::Constants;

/// The direction an ion or ingredient pushes pH.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Effect {
    /// Lowers pH.
    Acidifies,
    /// Raises pH.
    Basifies,
    /// Leaves pH where water puts it.
    Neutral,
}

impl Effect {
    /// The effect in words.
    pub fn words(self) -> &'static str {
        match self {
            Self::Acidifies => "acidifies",
            Self::Basifies => "basifies",
            Self::Neutral => "no effect on pH",
        }
    }
}

/// What one released ion does.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct IonEffect {
    /// The ion or form, e.g. `Na+` or `hydrogen citrate`.
    pub label: String,
    /// Its effect.
    pub effect: Effect,
    /// Ka of the ion as an acid, if it can give a proton.
    pub ka: Option<f64>,
    /// Kb of the ion as a base (Kw/Ka of its conjugate acid), if it can take one.
    pub kb: Option<f64>,
    /// Why, in one sentence.
    pub reason: String,
}

/// What one ingredient does to pH, ion by ion.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct IngredientEffect {
    /// Ingredient id.
    pub ingredient: String,
    /// The net effect.
    pub effect: Effect,
    /// One line for a recipe table.
    pub summary: String,
    /// Each released ion.
    pub ions: Vec<IonEffect>,
}

/// The effect of each line of a batch, in recipe order.
pub fn explain(library: &Library, constants: &Constants, batch: &Batch) -> Vec<IngredientEffect> {
    batch
        .lines
        .iter()
        .map(|l| explain_ingredient(library, constants, l.entry))
        .collect()
}

/// The effect of one ingredient (by library index) at the constants' temperature.
pub fn explain_ingredient(
    library: &Library,
    constants: &Constants,
    entry: usize,
) -> IngredientEffect {
    let e = &library.entries()[entry];
    let kw = constants.kw;
    let mut ions = Vec::new();
    for r in &e.releases {
        match *r {
            ResolvedRelease::Ion { ion, .. } => {
                let i = &library.ions()[ion];
                let (effect, reason) = if ion == library.hydron() {
                    (
                        Effect::Acidifies,
                        "H+ from a strong acid: it lowers pH directly".to_owned(),
                    )
                } else if ion == library.hydroxide() {
                    (
                        Effect::Basifies,
                        "OH- from a strong base: it raises pH directly".to_owned(),
                    )
                } else {
                    let side = if i.charge > 0 { "acid" } else { "base" };
                    (
                        Effect::Neutral,
                        format!(
                            "{} is the conjugate {side} of {}: too weak to react with water",
                            i.symbol, i.conjugate_of
                        ),
                    )
                };
                ions.push(IonEffect {
                    label: i.symbol.clone(),
                    effect,
                    ka: None,
                    kb: None,
                    reason,
                });
            }
            ResolvedRelease::System { system, form, .. } => {
                let s = &library.systems()[system];
                let ka = constants.ka(system);
                let names = form_names(s);
                let j = form as usize;
                let label = names.get(j).cloned().unwrap_or_default();
                let as_acid = ka.get(j).copied();
                let as_base = if j > 0 {
                    ka.get(j - 1).map(|k| kw / k)
                } else {
                    None
                };
                let (effect, reason) = match (as_acid, as_base) {
                    (Some(a), None) => (
                        Effect::Acidifies,
                        format!(
                            "{label} gives up a proton: Ka = {} (pKa {:.2})",
                            sci(a),
                            -a.log10()
                        ),
                    ),
                    (None, Some(b)) => (
                        Effect::Basifies,
                        format!(
                            "{label} is the conjugate base of {}: Kb = Kw/Ka = {}",
                            names[j - 1],
                            sci(b)
                        ),
                    ),
                    (Some(a), Some(b)) => {
                        let winner = if a > b {
                            Effect::Acidifies
                        } else {
                            Effect::Basifies
                        };
                        let (big, small) = if a > b { ("Ka", "Kb") } else { ("Kb", "Ka") };
                        (
                            winner,
                            format!(
                                "{label} can give a proton (Ka = {}) or take one (Kb = Kw/Ka = {}): {big} is {:.0}× {small}",
                                sci(a),
                                sci(b),
                                (a / b).max(b / a)
                            ),
                        )
                    }
                    (None, None) => (
                        Effect::Neutral,
                        format!("{label} takes no part in acid–base reactions"),
                    ),
                };
                ions.push(IonEffect {
                    label,
                    effect,
                    ka: as_acid,
                    kb: as_base,
                    reason,
                });
            }
        }
    }
    let (effect, summary) = net_effect(&ions, e.ingredient.id == crate::library::WATER);
    IngredientEffect {
        ingredient: e.ingredient.id.clone(),
        effect,
        summary,
        ions,
    }
}

/// Combines ion effects: a strong acid or base decides; otherwise the larger constant wins.
fn net_effect(ions: &[IonEffect], is_water: bool) -> (Effect, String) {
    if is_water {
        return (Effect::Neutral, "the solvent".into());
    }
    if let Some(i) = ions.iter().find(|i| i.label == "H+") {
        return (Effect::Acidifies, format!("strong acid: {}", i.reason));
    }
    if let Some(i) = ions.iter().find(|i| i.label == "OH-") {
        return (Effect::Basifies, format!("strong base: {}", i.reason));
    }
    let strength = |i: &IonEffect| match i.effect {
        Effect::Acidifies => i.ka.unwrap_or(0.0),
        Effect::Basifies => i.kb.unwrap_or(0.0),
        Effect::Neutral => 0.0,
    };
    let acid = ions
        .iter()
        .filter(|i| i.effect == Effect::Acidifies)
        .max_by(|a, b| strength(a).total_cmp(&strength(b)));
    let base = ions
        .iter()
        .filter(|i| i.effect == Effect::Basifies)
        .max_by(|a, b| strength(a).total_cmp(&strength(b)));
    match (acid, base) {
        (None, None) => {
            let why = ions
                .first()
                .map_or_else(|| "releases no ions".to_owned(), |i| i.reason.clone());
            (Effect::Neutral, format!("neutral salt: {why}"))
        }
        (Some(a), None) => (Effect::Acidifies, a.reason.clone()),
        (None, Some(b)) => (Effect::Basifies, b.reason.clone()),
        (Some(a), Some(b)) => {
            let (ka, kb) = (strength(a), strength(b));
            let ratio = (ka / kb).log10();
            if ratio.abs() < 0.3 {
                (
                    Effect::Neutral,
                    format!(
                        "both ions react: {} Ka = {} and {} Kb = {} nearly cancel",
                        a.label,
                        sci(ka),
                        b.label,
                        sci(kb)
                    ),
                )
            } else if ratio > 0.0 {
                (
                    Effect::Acidifies,
                    format!(
                        "both ions react: {} Ka = {} beats {} Kb = {} by {:.0}×",
                        a.label,
                        sci(ka),
                        b.label,
                        sci(kb),
                        ka / kb
                    ),
                )
            } else {
                (
                    Effect::Basifies,
                    format!(
                        "both ions react: {} Kb = {} beats {} Ka = {} by {:.0}×",
                        b.label,
                        sci(kb),
                        a.label,
                        sci(ka),
                        kb / ka
                    ),
                )
            }
        }
    }
}

/// A constant in short scientific notation, e.g. `1.8e-5`.
pub fn sci(x: f64) -> String {
    format!("{x:.1e}")
}
