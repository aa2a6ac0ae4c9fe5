//! Cautions: hazards of the raw materials and of the solved product, in plain words.

use serde::Serialize;

use crate::library::{Hazard, Library, ResolvedRelease};
use crate::recipe::Batch;
use crate::solver::Solution;

/// The closing sentence every caution list carries.
pub const DEFER: &str = "Check the safety data sheet of every raw material and follow local regulations and licensed practice; these predictions do not replace them.";

/// One caution to show.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Caution {
    /// A short headline, e.g. `Strong alkali`.
    pub title: String,
    /// The usual hazard in plain words, and what to do.
    pub text: String,
}

/// Cautions for a batch and, when solved, its pH.
pub fn cautions(library: &Library, batch: &Batch, solution: Option<&Solution>) -> Vec<Caution> {
    let has = |h: Hazard| -> Vec<String> {
        batch
            .lines
            .iter()
            .filter(|l| l.enabled && l.mass_g > 0.0)
            .filter(|l| library.entries()[l.entry].ingredient.hazards.contains(&h))
            .map(|l| library.entries()[l.entry].ingredient.name.clone())
            .collect()
    };
    let strong_acid = has(Hazard::StrongAcid);
    let strong_alkali = has(Hazard::StrongAlkali);
    let hypochlorite = has(Hazard::Hypochlorite);
    let ammonia = has(Hazard::Ammonia);
    let corrosive = has(Hazard::Corrosive);
    let any_acid_line = batch
        .lines
        .iter()
        .filter(|l| l.enabled && l.mass_g > 0.0)
        .any(|l| {
            library.entries()[l.entry]
                .releases
                .iter()
                .any(|r| match *r {
                    ResolvedRelease::Ion { ion, .. } => ion == library.hydron(),
                    ResolvedRelease::System { form, .. } => {
                        form == 0
                            && !library.entries()[l.entry]
                                .ingredient
                                .hazards
                                .contains(&Hazard::Ammonia)
                    }
                })
        });
    let mut out = Vec::new();
    let list = |v: &[String]| v.join(", ");
    // "X is" or "X, Y are".
    let is = |v: &[String]| format!("{} {}", list(v), if v.len() > 1 { "are" } else { "is" });
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
        if any_acid_line || solution.is_some_and(|s| s.ph < 7.0) {
            out.push(Caution {
                title: "Chlorine gas risk".into(),
                text: "This recipe puts hypochlorite together with an acid or below pH 7: that releases toxic chlorine gas. Do not mix these.".into(),
            });
        }
        if !ammonia.is_empty() {
            out.push(Caution {
                title: "Chloramine risk".into(),
                text: format!(
                    "Hypochlorite with {} forms toxic chloramines. Do not mix these.",
                    list(&ammonia)
                ),
            });
        }
    }
    if !ammonia.is_empty() {
        out.push(Caution {
            title: "Ammonia".into(),
            text: format!("{} can release ammonia gas, irritating to eyes and lungs, more so above pH 9 and when warm. Work with ventilation.", list(&ammonia)),
        });
    }
    if let Some(s) = solution {
        // UN GHS 3.2/3.3 and EU CLP Annex I point to corrosion at pH ≤ 2 or ≥ 11.5 (from memory).
        if s.ph <= 2.0 || s.ph >= 11.5 {
            out.push(Caution {
                title: "Extreme pH".into(),
                text: format!(
                    "Predicted pH {:.1}: products at pH 2 or below, or 11.5 or above, are usually treated as corrosive to skin and eyes unless the reserve acidity/alkalinity or other data show otherwise.",
                    s.ph
                ),
            });
        }
    }
    if !out.is_empty() {
        out.push(Caution {
            title: "Safety data".into(),
            text: DEFER.into(),
        });
    }
    out
}
