//! What each ingredient's ions do to pH, and why: the salt rule with Ka·Kb = Kw.
//!
//! Explanations are written once, in display notation (`Na⁺`, `Ka = 1.8×10⁻⁵`); `summary` and
//! `reason` hold that text, and [`IngredientEffect::summary_in`] / [`IonEffect::reason_in`]
//! give it in either [`Notation`] (ASCII for JSON).

use serde::Serialize;

use crate::library::{Library, ResolvedRelease, Species, form_names};
use crate::recipe::Batch;
use crate::solver::Constants;
use crate::text::{self, Notation};

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
    /// The effect in words, the same in every front end: `lowers pH`, `raises pH`, `no effect`.
    pub fn words(self) -> &'static str {
        match self {
            Self::Acidifies => "lowers pH",
            Self::Basifies => "raises pH",
            Self::Neutral => "no effect",
        }
    }
}

/// What one released ion does.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct IonEffect {
    /// The ion or form for display, e.g. `Na⁺` or `hydrogen citrate`.
    pub label: String,
    /// Its effect.
    pub effect: Effect,
    /// Ka of the ion as an acid, if it can give a proton.
    pub ka: Option<f64>,
    /// Kb of the ion as a base (Kw/Ka of its conjugate acid), if it can take one.
    pub kb: Option<f64>,
    /// Why, in one sentence, in display notation.
    pub reason: String,
}

impl IonEffect {
    /// The reason in the notation asked for.
    pub fn reason_in(&self, notation: Notation) -> String {
        notation.apply(&self.reason)
    }
}

/// What one ingredient does to pH, ion by ion.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct IngredientEffect {
    /// Ingredient id.
    pub ingredient: String,
    /// The net effect.
    pub effect: Effect,
    /// One line for a recipe table, in display notation.
    pub summary: String,
    /// Each released ion.
    pub ions: Vec<IonEffect>,
}

impl IngredientEffect {
    /// The summary in the notation asked for.
    pub fn summary_in(&self, notation: Notation) -> String {
        notation.apply(&self.summary)
    }
}

/// Where a spectator comes from, by its charge: cations from strong bases, anions from strong acids.
fn origin(charge: i32) -> &'static str {
    if charge > 0 {
        "a strong base"
    } else {
        "a strong acid"
    }
}

/// The effect of each line of a batch, in recipe order.
pub fn explain(library: &Library, constants: &Constants, batch: &Batch) -> Vec<IngredientEffect> {
    batch
        .lines
        .iter()
        .map(|l| explain_ingredient(library, constants, l.entry))
        .collect()
}

/// A released ion that takes no part in acid–base reactions, kept for the summary.
struct Spectator {
    label: String,
    charge: i32,
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
    let mut spectators = Vec::new();
    for r in &e.releases {
        match *r {
            ResolvedRelease::Ion { ion, .. } => {
                let i = &library.ions()[ion];
                let label = text::ion_display(&i.symbol, i64::from(i.charge));
                let (effect, reason) = if ion == library.hydron() {
                    (
                        Effect::Acidifies,
                        format!("{label} from a strong acid lowers pH directly"),
                    )
                } else if ion == library.hydroxide() {
                    (
                        Effect::Basifies,
                        format!("{label} from a strong base raises pH directly"),
                    )
                } else if let Some(ka) = hydrolysis_ka(constants, ion) {
                    let c = text::constant_display;
                    ions.push(IonEffect {
                        label: label.clone(),
                        effect: Effect::Acidifies,
                        ka: Some(ka),
                        kb: None,
                        reason: format!(
                            "{label}, the aqua ion of a weak base, gives a proton to water from a bound water molecule: Ka = {} (pKa {:.2})",
                            c(ka),
                            -ka.log10()
                        ),
                    });
                    continue;
                } else {
                    spectators.push(Spectator {
                        label: label.clone(),
                        charge: i.charge,
                    });
                    let from = if i.conjugate_of.is_empty() {
                        origin(i.charge).to_owned()
                    } else {
                        i.conjugate_of.clone()
                    };
                    (
                        Effect::Neutral,
                        format!("{label} comes from {from}: it does not react with water"),
                    )
                };
                ions.push(IonEffect {
                    label,
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
                let charge = i64::from(s.charge_of_fully_protonated) - i64::from(form);
                let as_acid = ka.get(j).copied();
                let as_base = if j > 0 {
                    ka.get(j - 1).map(|k| kw / k)
                } else {
                    None
                };
                let c = text::constant_display;
                let (effect, reason) = match (as_acid, as_base) {
                    (Some(a), None) => (
                        Effect::Acidifies,
                        format!(
                            "{label} gives a proton to water: Ka = {} (pKa {:.2})",
                            c(a),
                            -a.log10()
                        ),
                    ),
                    (None, Some(b)) => {
                        let conj = names.get(j - 1).cloned().unwrap_or_default();
                        let what = if charge == 0 {
                            // Ammonia and amines: a neutral base.
                            format!("{label}, a neutral base, takes a proton from water")
                        } else {
                            format!(
                                "{label}, the conjugate base of the weak acid {conj}, takes a proton from water"
                            )
                        };
                        (Effect::Basifies, format!("{what}: Kb = Kw/Ka = {}", c(b)))
                    }
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
                                c(a),
                                c(b),
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
    let (effect, mut summary) = net_effect(&ions, e.ingredient.id == crate::library::WATER);
    // Name the ions that stay out of it, so the summary speaks of every ion of a salt.
    let reacting = ions.iter().any(|i| i.effect != Effect::Neutral);
    if reacting && !spectators.is_empty() {
        let labels: Vec<&str> = spectators.iter().map(|s| s.label.as_str()).collect();
        let from: Vec<&str> = dedup(spectators.iter().map(|s| origin(s.charge)));
        summary += &format!(
            "; {} {} from {} and {} not react",
            labels.join(" and "),
            if labels.len() > 1 { "come" } else { "comes" },
            from.join(" and "),
            if labels.len() > 1 { "do" } else { "does" },
        );
    } else if !reacting && !spectators.is_empty() {
        let labels: Vec<&str> = spectators.iter().map(|s| s.label.as_str()).collect();
        let from: Vec<&str> = dedup(spectators.iter().map(|s| origin(s.charge)));
        summary = if labels.len() > 1 {
            format!(
                "{} come from {}: neither reacts with water",
                labels.join(" and "),
                from.join(" and ")
            )
        } else {
            format!(
                "{} comes from {}: it does not react with water",
                labels[0], from[0]
            )
        };
    }
    IngredientEffect {
        ingredient: e.ingredient.id.clone(),
        effect,
        summary,
        ions,
    }
}

/// The acidity constant of a metal aqua ion's first hydrolysis, M + H2O ⇌ MOH + H⁺, from its
/// hydroxo complex, when it is strong enough to count: pKa below 10. Ca²⁺ and Mg²⁺ (pKa 12.8
/// and 11.4) are counted as cations that do not react, as is usual (common practice, no source).
fn hydrolysis_ka(constants: &Constants, ion: usize) -> Option<f64> {
    constants
        .complexes
        .iter()
        .find(|c| {
            c.metal == ion && c.ligand_count == 1 && c.ligand == Species::Ion(constants.hydroxide)
        })
        .map(|c| c.k * constants.kw)
        .filter(|&ka| ka > 1e-10)
}

fn dedup<'a>(it: impl Iterator<Item = &'a str>) -> Vec<&'a str> {
    let mut v: Vec<&str> = Vec::new();
    for s in it {
        if !v.contains(&s) {
            v.push(s);
        }
    }
    v
}

/// Combines ion effects: a strong acid or base decides; otherwise the larger constant wins.
fn net_effect(ions: &[IonEffect], is_water: bool) -> (Effect, String) {
    if is_water {
        return (Effect::Neutral, "the solvent".into());
    }
    // H⁺ and OH⁻ are the only ions that change pH without a constant of their own.
    if let Some(i) = ions
        .iter()
        .find(|i| i.effect == Effect::Acidifies && i.ka.is_none())
    {
        return (Effect::Acidifies, format!("strong acid: {}", i.reason));
    }
    if let Some(i) = ions
        .iter()
        .find(|i| i.effect == Effect::Basifies && i.kb.is_none())
    {
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
    let c = text::constant_display;
    match (acid, base) {
        (None, None) => {
            let why = ions
                .first()
                .map_or_else(|| "releases no ions".to_owned(), |i| i.reason.clone());
            (Effect::Neutral, why)
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
                        c(ka),
                        b.label,
                        c(kb)
                    ),
                )
            } else if ratio > 0.0 {
                (
                    Effect::Acidifies,
                    format!(
                        "both ions react: {} Ka = {} beats {} Kb = {} by {:.0}×",
                        a.label,
                        c(ka),
                        b.label,
                        c(kb),
                        ka / kb
                    ),
                )
            } else {
                (
                    Effect::Basifies,
                    format!(
                        "both ions react: {} Kb = {} beats {} Ka = {} by {:.0}×",
                        b.label,
                        c(kb),
                        a.label,
                        c(ka),
                        kb / ka
                    ),
                )
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::solver::Conditions;

    fn effect_of(id: &str) -> IngredientEffect {
        let lib = Library::built_in().unwrap();
        let c = Constants::new(&lib, Conditions::default());
        explain_ingredient(&lib, &c, lib.entry_index(id).unwrap())
    }

    #[test]
    fn a_neutral_salt_names_both_ions() {
        // NaCl: Na⁺ from NaOH and Cl⁻ from HCl, a strong base and a strong acid (the salt rule,
        // common practice, no source).
        let e = effect_of("sodium_chloride");
        assert_eq!(e.effect, Effect::Neutral);
        assert_eq!(
            e.summary,
            "Na⁺ and Cl⁻ come from a strong base and a strong acid: neither reacts with water"
        );
        assert_eq!(
            e.summary_in(Notation::Ascii),
            "Na+ and Cl- come from a strong base and a strong acid: neither reacts with water"
        );
    }

    #[test]
    fn weak_bases_take_a_proton_from_water() {
        // Acetate Kb = Kw/Ka = 10^−13.995 / 10^−4.756 ≈ 5.8e-10 (pKw 13.995 at 25 °C, IAPWS R11-07;
        // pKa 4.756, Goldberg et al. 2002; both from memory).
        let e = effect_of("sodium_acetate_trihydrate");
        assert_eq!(e.effect, Effect::Basifies);
        assert!(
            e.summary.starts_with(
                "acetate, the conjugate base of the weak acid acetic acid, takes a proton from water: Kb = Kw/Ka = 5.8×10⁻¹⁰"
            ),
            "{}",
            e.summary
        );
        assert!(
            e.summary
                .ends_with("Na⁺ comes from a strong base and does not react")
        );
        assert!(e.summary_in(Notation::Ascii).contains("5.8e-10"));
        // Ammonia Kb = 1.8e-5 (CRC Handbook, from memory).
        let e = effect_of("ammonia_25");
        assert!(
            e.summary.contains(
                "ammonia, a neutral base, takes a proton from water: Kb = Kw/Ka = 1.8×10⁻⁵"
            ),
            "{}",
            e.summary
        );
        assert_eq!(Effect::Basifies.words(), "raises pH");
    }

    #[test]
    fn strong_acids_and_bases_are_plain() {
        let e = effect_of("hydrochloric_acid_36");
        assert_eq!(e.effect.words(), "lowers pH");
        assert!(
            e.summary
                .starts_with("strong acid: H⁺ from a strong acid lowers pH directly")
        );
        let e = effect_of("water");
        assert_eq!(e.effect.words(), "no effect");
    }
}
