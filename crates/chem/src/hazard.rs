//! Cautions: hazards of the raw materials, the pH adjuster and the solved product, in plain
//! words, assembled once here for every front end ([`assemble`]).
//!
//! The rules, and where their thresholds come from, are in `docs/science.md` ("Cautions").

use serde::Serialize;

use crate::library::{Hazard, Library, ResolvedRelease};
use crate::recipe::Batch;
use crate::reserve::{self, Reserve};
use crate::solver::{Constants, Solution};

/// The closing sentence every caution list carries.
pub const DEFER: &str = "Check the safety data sheet of every raw material and follow local regulations and licensed practice; these predictions do not replace them.";

/// Title of the closing caution that carries [`DEFER`].
pub const DEFER_TITLE: &str = "Safety data";

/// Below this pH a hypochlorite product releases chlorine gas.
///
/// Cl₂ + H₂O ⇌ HOCl + H⁺ + Cl⁻ has K ≈ 4×10⁻⁴ at 25 °C (from memory), so
/// m(Cl₂)/m(HOCl) ≈ m(H⁺)·m(Cl⁻)/K: with the 0.1–1 mol/kg chloride that hypochlorite solutions carry,
/// Cl₂ is about 0.2–2.5 % of the free chlorine at pH 5 and 2.5–25 % at pH 4 (by hand from that
/// K). Chlorine gas escapes even from small fractions, so the caution starts at pH 5.
pub const CHLORINE_GAS_PH: f64 = 5.0;

/// Below this pH hypochlorous acid, not hypochlorite, is the main form (its pKa is 7.54 at 25 °C;
/// Morris 1966, from memory): the product loses strength faster and is closer to releasing
/// chlorine.
pub const HYPOCHLOROUS_PH: f64 = 7.5;

/// An acid whose next proton leaves below this pKa turns hypochlorite into hypochlorous acid
/// (it is stronger than hypochlorous acid, pKa 7.54; Morris 1966, from memory).
const ACID_PKA_BELOW: f64 = 7.5;

/// One caution to show.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Caution {
    /// A short headline, e.g. `Strong alkali`.
    pub title: String,
    /// The usual hazard in plain words, and what to do.
    pub text: String,
}

/// Every caution for a recipe, in the order to show them, and the reserve behind one of them.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Cautions {
    /// The cautions; when there are any, the last carries [`DEFER`].
    pub items: Vec<Caution>,
    /// The acid reserve (below pH 4) or alkaline reserve (above pH 10), when it could be found.
    pub reserve: Option<Reserve>,
}

impl Cautions {
    /// Whether there is nothing to show.
    pub fn is_empty(&self) -> bool {
        self.items.is_empty()
    }

    /// The cautions in order.
    pub fn iter(&self) -> std::slice::Iter<'_, Caution> {
        self.items.iter()
    }
}

/// Every caution for a batch, in one list for every front end: the ingredients' hazards and
/// the pairs that must not meet, the pH adjuster as supplied (`adjuster`, a library id), the
/// solved pH (extreme pH, hypochlorite below [`HYPOCHLOROUS_PH`] or [`CHLORINE_GAS_PH`]), the
/// acid or alkaline reserve, and — whenever anything is shown — the deferral to the safety
/// data sheet, local regulations and licensed practice, last.
pub fn assemble(
    library: &Library,
    constants: &Constants,
    batch: &Batch,
    solution: Option<&Solution>,
    adjuster: Option<&str>,
) -> Cautions {
    let adjuster_entry = adjuster.and_then(|id| library.entry_index(id));
    let mut items = ingredient_cautions(library, batch, solution, adjuster_entry);
    if let Some(a) = adjuster_entry
        && let Some(c) = adjuster_caution(library, batch, a)
    {
        items.push(c);
    }
    if let Some(c) = solution.and_then(extreme_ph) {
        items.push(c);
    }
    if let (Some(s), Ok(composition)) = (solution, batch.composition(library)) {
        let sp = crate::solver::speciation(library, constants, &composition, s);
        items.extend(scale_cautions(&sp));
    }
    // The reserve is a screening extra: a product it cannot be computed for simply has none.
    let reserve = solution.and_then(|s| {
        reserve::reserve(library, constants, batch, s.ph)
            .ok()
            .flatten()
    });
    if let Some(r) = &reserve {
        items.push(reserve::caution(r));
    }
    if !items.is_empty() {
        items.push(deferral());
    }
    Cautions { items, reserve }
}

/// The closing caution: the safety data sheet, local regulations and licensed practice.
pub fn deferral() -> Caution {
    Caution {
        title: DEFER_TITLE.into(),
        text: DEFER.into(),
    }
}

/// The caution for a pH adjuster as supplied, when it carries a hazard and is not already a
/// line of the recipe (whose cautions then cover it).
pub fn adjuster_caution(library: &Library, batch: &Batch, adjuster: usize) -> Option<Caution> {
    if batch.lines.iter().any(|l| l.entry == adjuster && l.enabled) {
        return None;
    }
    let ing = &library.entries().get(adjuster)?.ingredient;
    let words: Vec<&str> = ing
        .hazards
        .iter()
        .filter_map(|h| match h {
            Hazard::StrongAcid => Some("a strong acid"),
            Hazard::StrongAlkali => Some("a strong alkali"),
            Hazard::Corrosive => Some("corrosive to skin and eyes"),
            Hazard::Irritant => Some("irritating to skin and eyes"),
            Hazard::Oxidiser => Some("an oxidiser"),
            Hazard::Harmful => Some("harmful if swallowed or inhaled"),
            Hazard::Hypochlorite => Some("a hypochlorite"),
            Hazard::Ammonia => Some("a source of ammonia"),
            Hazard::Amine | Hazard::TertiaryAmine => None,
        })
        .collect();
    if words.is_empty() {
        return None;
    }
    let strong = ing
        .hazards
        .iter()
        .any(|h| matches!(h, Hazard::StrongAcid | Hazard::StrongAlkali));
    let handling = if strong {
        "Wear eye and skin protection; add it slowly to the stirred batch, in small portions near the target, as dissolving can release heat."
    } else {
        "Wear eye and skin protection and add it slowly to the stirred batch."
    };
    Some(Caution {
        title: "pH adjuster as supplied".into(),
        text: format!(
            "The adjuster {} is {} as supplied. {handling}",
            ing.name,
            join_and(&words)
        ),
    })
}

/// The extreme-pH caution, at pH 2 or below or 11.5 or above.
fn extreme_ph(s: &Solution) -> Option<Caution> {
    // UN GHS 3.2/3.3 and EU CLP Annex I point to corrosion at pH ≤ 2 or ≥ 11.5 (from memory).
    (s.ph <= 2.0 || s.ph >= 11.5).then(|| Caution {
        title: "Extreme pH".into(),
        text: format!(
            "Predicted pH {:.1}: products at pH 2 or below, or 11.5 or above, are usually treated as corrosive to skin and eyes unless the reserve acidity/alkalinity or other data show otherwise.",
            s.ph
        ),
    })
}

/// Whether an ingredient gives a proton to hypochlorite: it releases H⁺, or a form whose next
/// proton leaves below pKa 7.5 (a stronger acid than hypochlorous acid).
fn is_acid(library: &Library, entry: usize) -> bool {
    library.entries()[entry].releases.iter().any(|r| match *r {
        ResolvedRelease::Ion { ion, .. } => ion == library.hydron(),
        ResolvedRelease::System { system, form, .. } => library.systems()[system]
            .pka
            .get(form as usize)
            .is_some_and(|&pka| pka < ACID_PKA_BELOW),
    })
}

fn ingredient_cautions(
    library: &Library,
    batch: &Batch,
    solution: Option<&Solution>,
    adjuster: Option<usize>,
) -> Vec<Caution> {
    let present: Vec<usize> = batch
        .lines
        .iter()
        .filter(|l| l.enabled && l.mass_g > 0.0)
        .map(|l| l.entry)
        .collect();
    let name = |e: usize| library.entries()[e].ingredient.name.clone();
    let has = |h: Hazard| -> Vec<String> {
        let mut v: Vec<String> = present
            .iter()
            .filter(|&&e| library.entries()[e].ingredient.hazards.contains(&h))
            .map(|&e| name(e))
            .collect();
        v.dedup();
        v
    };
    let strong_acid = has(Hazard::StrongAcid);
    let strong_alkali = has(Hazard::StrongAlkali);
    let hypochlorite = has(Hazard::Hypochlorite);
    let ammonia = has(Hazard::Ammonia);
    let amine = has(Hazard::Amine);
    let tertiary = has(Hazard::TertiaryAmine);
    let corrosive = has(Hazard::Corrosive);
    let mut acids: Vec<String> = present
        .iter()
        .filter(|&&e| is_acid(library, e))
        .map(|&e| name(e))
        .collect();
    acids.dedup();
    let acid_adjuster = adjuster.filter(|&a| is_acid(library, a)).map(name);
    let mut out = Vec::new();
    // "X is" or "X, Y are".
    let is = |v: &[String]| format!("{} {}", join_and(v), if v.len() > 1 { "are" } else { "is" });
    if !strong_acid.is_empty() {
        out.push(Caution {
            title: "Strong acid".into(),
            text: format!("{} corrosive to skin and eyes. Wear eye and skin protection, add acid to water (never water to acid) and dilute slowly.", is(&strong_acid)),
        });
    }
    if !strong_alkali.is_empty() {
        out.push(Caution {
            title: "Strong alkali".into(),
            text: format!("{} corrosive and can cause severe eye damage; dissolving releases heat. Wear eye and skin protection and add slowly to water.", is(&strong_alkali)),
        });
    }
    let other_corrosive: Vec<String> = corrosive
        .into_iter()
        .filter(|n| !strong_acid.contains(n) && !strong_alkali.contains(n))
        .collect();
    if !other_corrosive.is_empty() {
        out.push(Caution {
            title: "Corrosive raw material".into(),
            text: format!(
                "{} corrosive as supplied: wear eye and skin protection.",
                is(&other_corrosive)
            ),
        });
    }
    if !hypochlorite.is_empty() {
        out.push(Caution {
            title: "Hypochlorite".into(),
            text: format!("{} an oxidiser and corrosive. Mixed with acids, hypochlorite releases chlorine gas; keep its products alkaline.", is(&hypochlorite)),
        });
        let ph = solution.map(|s| s.ph);
        let low_ph = ph.is_some_and(|p| p < CHLORINE_GAS_PH);
        if !acids.is_empty() || acid_adjuster.is_some() || low_ph {
            let mut why = Vec::new();
            if !acids.is_empty() {
                why.push(format!("the acid {}", join_and(&acids)));
            }
            if let Some(a) = &acid_adjuster {
                why.push(format!("the acid chosen as pH adjuster, {a}"));
            }
            if let Some(p) = ph.filter(|_| low_ph) {
                why.push(format!(
                    "a predicted pH of {p:.1}, below pH {CHLORINE_GAS_PH}"
                ));
            }
            out.push(Caution {
                title: "Chlorine gas risk".into(),
                text: format!(
                    "This recipe puts hypochlorite together with {}: acid turns hypochlorite into chlorine, and toxic chlorine gas is released. Do not mix these; keep hypochlorite products alkaline.",
                    join_and(&why)
                ),
            });
        } else if let Some(p) = ph.filter(|&p| p < HYPOCHLOROUS_PH) {
            out.push(Caution {
                title: "Hypochlorite below pH 7.5".into(),
                text: format!(
                    "At the predicted pH {p:.1} most of the hypochlorite is hypochlorous acid: the product loses strength faster, and any further acid releases chlorine gas. Hypochlorite products are usually kept alkaline."
                ),
            });
        }
        let nh: Vec<String> = ammonia.iter().chain(&amine).cloned().collect();
        if !nh.is_empty() {
            out.push(Caution {
                title: "Chloramine risk".into(),
                text: format!(
                    "Hypochlorite with {} forms toxic chloramines. Do not mix these.",
                    join_and(&nh)
                ),
            });
        }
        if !tertiary.is_empty() {
            // Tertiary amines have no N–H to chlorinate directly and react more slowly than
            // ammonia or primary amines; they are still oxidised by hypochlorite, which can
            // break them down to smaller amines that do form chloramines, and amines of this
            // kind are known nitrosamine precursors (from memory; general chemistry of
            // amine chlorination, no single source).
            out.push(Caution {
                title: "Hypochlorite with a tertiary amine".into(),
                text: format!(
                    "Hypochlorite with {}: tertiary amines react with hypochlorite more slowly than ammonia or primary amines, but they use up available chlorine and can break down into chloramines and other chlorinated by-products; amines of this kind are also a nitrosamine concern. Check stability and safety before combining them.",
                    join_and(&tertiary)
                ),
            });
        }
    }
    if !ammonia.is_empty() {
        out.push(Caution {
            title: "Ammonia".into(),
            text: format!("{} can release ammonia gas, irritating to eyes and lungs, more so above pH 9 and when warm. Work with ventilation.", join_and(&ammonia)),
        });
    }
    out
}

/// "a", "a and b", "a, b and c".
fn join_and<S: AsRef<str>>(v: &[S]) -> String {
    match v {
        [] => String::new(),
        [one] => one.as_ref().to_owned(),
        [init @ .., last] => format!(
            "{} and {}",
            init.iter()
                .map(AsRef::as_ref)
                .collect::<Vec<_>>()
                .join(", "),
            last.as_ref()
        ),
    }
}

/// Saturation index above which a scale caution is raised (common practice, no source: an index
/// within ±0.2 of 0 is within the uncertainty of the constants).
pub const SCALE_SI: f64 = 0.2;

/// A caution for each solid the solution is supersaturated in.
pub fn scale_cautions(speciation: &crate::solver::Speciation) -> Vec<Caution> {
    speciation
        .saturation
        .iter()
        .filter(|x| x.saturation_index > SCALE_SI)
        .map(|x| Caution {
            title: format!("Scale: {} can deposit", x.solid.replace('_', " ")),
            text: format!(
                "The liquid is supersaturated in {} (saturation index {:+.2}): it can deposit \
                 as scale or haze, on standing, on heating or on surfaces. Whether and how fast \
                 it forms depends on nucleation, which the model does not predict; add chelant, \
                 lower the hardness or the pH, and check on the bench.",
                x.solid.replace('_', " "),
                x.saturation_index
            ),
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::recipe::{Recipe, RecipeLine};
    use crate::report::evaluate_with;
    use crate::solver::Conditions;

    /// The cautions of a recipe by grams, solved at 25 °C, with an optional adjuster.
    fn cautions_of(lines: &[(&str, f64)], adjuster: Option<&str>) -> Cautions {
        let lib = Library::built_in().unwrap();
        let c = Constants::new(&lib, Conditions::default());
        let recipe = Recipe {
            lines: lines
                .iter()
                .map(|&(id, g)| RecipeLine::grams(id, g))
                .collect(),
            qs_to_g: None,
            water_hardness: None,
        };
        let report = evaluate_with(&lib, &c, &recipe).unwrap();
        assemble(&lib, &c, &report.batch, Some(&report.solution), adjuster)
    }

    fn titles(c: &Cautions) -> Vec<&str> {
        c.iter().map(|c| c.title.as_str()).collect()
    }

    fn text_of<'a>(c: &'a Cautions, title: &str) -> &'a str {
        c.iter()
            .find(|c| c.title == title)
            .map_or("", |c| c.text.as_str())
    }

    // A bleach-like base: 12 % hypochlorite diluted in water (invented scenario).
    const BLEACH: [(&str, f64); 2] = [("water", 900.0), ("sodium_hypochlorite_12", 100.0)];

    fn with<'a>(extra: &[(&'a str, f64)]) -> Vec<(&'a str, f64)> {
        let mut v: Vec<(&str, f64)> = BLEACH.to_vec();
        v.extend_from_slice(extra);
        v
    }

    #[test]
    fn hypochlorite_with_a_primary_amine_warns_of_chloramines() {
        // Hypochlorite + primary/secondary amines → chloramines (common practice, no source).
        let c = cautions_of(&with(&[("monoethanolamine", 5.0)]), None);
        assert!(
            text_of(&c, "Chloramine risk").contains("monoethanolamine"),
            "{c:?}"
        );
        let c = cautions_of(&with(&[("glycine", 5.0)]), None);
        assert!(text_of(&c, "Chloramine risk").contains("glycine"), "{c:?}");
    }

    #[test]
    fn hypochlorite_with_a_tertiary_amine_has_its_own_wording() {
        // Tertiary amines react more slowly (from memory; see the comment in the rule).
        let c = cautions_of(&with(&[("triethanolamine", 5.0)]), None);
        let t = text_of(&c, "Hypochlorite with a tertiary amine");
        assert!(
            t.contains("triethanolamine") && t.contains("more slowly"),
            "{c:?}"
        );
        assert!(t.contains("nitrosamine") && t.contains("use up available chlorine"));
        assert!(!titles(&c).contains(&"Chloramine risk"), "{c:?}");
    }

    #[test]
    fn hypochlorite_with_an_acid_line_warns_of_chlorine_gas() {
        // Acid + hypochlorite releases chlorine (common practice, no source).
        let c = cautions_of(&with(&[("citric_acid", 1.0)]), None);
        let t = text_of(&c, "Chlorine gas risk");
        assert!(t.contains("the acid citric acid (anhydrous)"), "{c:?}");
    }

    #[test]
    fn an_acid_chosen_only_as_adjuster_warns_of_chlorine_gas() {
        let c = cautions_of(&BLEACH, Some("hydrochloric_acid_36"));
        let t = text_of(&c, "Chlorine gas risk");
        assert!(
            t.contains("the acid chosen as pH adjuster, hydrochloric acid 36 %"),
            "{c:?}"
        );
        // The adjuster as supplied has its own caution too.
        assert!(text_of(&c, "pH adjuster as supplied").contains("a strong acid"));
        // An alkaline adjuster raises no chlorine caution.
        let c = cautions_of(&BLEACH, Some("sodium_hydroxide_50"));
        assert!(!titles(&c).contains(&"Chlorine gas risk"), "{c:?}");
    }

    #[test]
    fn hypochlorite_below_the_threshold_ph_warns_of_chlorine_gas() {
        // 100 g 36 % HCl (0.99 mol) swamps 12 g NaOCl (0.16 mol): strongly acid (by hand).
        let lines = [
            ("water", 800.0),
            ("sodium_hypochlorite_12", 100.0),
            ("hydrochloric_acid_36", 100.0),
        ];
        let c = cautions_of(&lines, None);
        let t = text_of(&c, "Chlorine gas risk");
        assert!(t.contains("below pH 5"), "{c:?}");
    }

    #[test]
    fn a_reserve_alone_ends_with_the_deferral() {
        // 20 g gluconic acid 50 % in 1 kg water: 0.051 mol/kg, pKa 3.86 → pH ≈ 2.6 (by hand):
        // below pH 4, so an acid reserve, but above pH 2 and with no hazard tags, so the reserve
        // is the only caution besides the deferral.
        let list = cautions_of(&[("water", 1000.0), ("gluconic_acid_50", 20.0)], None);
        assert!(list.reserve.is_some(), "{list:?}");
        assert_eq!(titles(&list), ["Acid reserve", DEFER_TITLE]);
        assert_eq!(list.items.last().map(|c| c.text.as_str()), Some(DEFER));
        let reserve = text_of(&list, "Acid reserve");
        assert!(
            reserve.contains("sodium hydroxide into an acid product, to pH 4"),
            "{reserve}"
        );
        // Young et al. (1988), from memory: the acid-side threshold is −0.5.
        assert!(reserve.contains("threshold -0.5"), "{reserve}");
        assert!(reserve.contains("not a classification"), "{reserve}");
    }

    #[test]
    fn the_alkaline_reserve_says_which_way_it_is_titrated() {
        // 40 g trisodium phosphate dodecahydrate per kg water is near pH 12 (by hand): alkaline
        // reserve, titrated with acid to pH 10; threshold 14.5 (Young et al. 1988, from memory).
        let list = cautions_of(
            &[
                ("water", 1000.0),
                ("trisodium_phosphate_dodecahydrate", 40.0),
            ],
            None,
        );
        let reserve = text_of(&list, "Alkaline reserve");
        assert!(
            reserve.contains("acid into an alkaline product, to pH 10"),
            "{reserve}"
        );
        assert!(reserve.contains("threshold 14.5"), "{reserve}");
        assert_eq!(list.items.last().map(|c| c.text.as_str()), Some(DEFER));
    }

    #[test]
    fn nothing_to_say_means_an_empty_list() {
        // Dilute citrate buffer near pH 4.5: no hazard tags in force, no reserve, no extreme pH.
        let c = cautions_of(
            &[
                ("water", 1000.0),
                ("trisodium_citrate_dihydrate", 2.0),
                ("sodium_chloride", 1.0),
            ],
            None,
        );
        assert!(c.is_empty(), "{c:?}");
    }
}
