//! Small bridges to chemistry the core does not expose yet: the dose curve, what each line does
//! to pH, and cautions. Each is meant to be replaced by the core's own function when it lands.

use saltwise_chem::Library;
use saltwise_chem::library::{Hazard, ResolvedRelease};
use saltwise_chem::recipe::Totals;
use saltwise_chem::report::Report;
use saltwise_chem::solver::{self, Constants, Guess};

use crate::engine::{CurveData, CurvePoint};

/// Bisection steps of the dose-to-target search (2⁻⁴⁸ of the largest dose).
const TARGET_STEPS: usize = 48;

/// pH against grams of an adjuster (as supplied) added to the finished batch.
pub fn dose_curve(
    library: &Library,
    constants: &Constants,
    report: &Report,
    adjuster: &str,
    dose_max_g: f64,
    target_ph: Option<f64>,
    points: usize,
) -> Result<CurveData, String> {
    let Some(entry) = library.entry_index(adjuster) else {
        return Err(format!(
            "'{adjuster}' is not in the library: choose a pH adjuster from the list"
        ));
    };
    if !(dose_max_g.is_finite() && dose_max_g > 0.0) {
        return Err(format!("largest dose {dose_max_g} g must be above 0"));
    }
    let per_gram = Totals::per_gram(library, entry);
    let moves_protons =
        per_gram.proton_excess_mol.abs() > 0.0 || per_gram.system_mol.iter().any(|m| *m > 0.0);
    if !moves_protons {
        return Err(format!(
            "{} releases no acid or base, so it does not adjust pH",
            library.entries()[entry].ingredient.name
        ));
    }
    let base = &report.batch.totals;
    let solve_at = |dose_g: f64, guess: Option<Guess>| {
        let totals = base.plus_scaled(&per_gram, dose_g);
        totals
            .composition(library)
            .map(|c| solver::solve(constants, &c, guess))
    };
    let n = points.max(2) - 1;
    let mut out = Vec::with_capacity(n + 1);
    let mut guess = Some(Guess {
        ph: report.solution.ph,
        ionic_strength: report.solution.ionic_strength,
    });
    for i in 0..=n {
        let dose_g = dose_max_g * i as f64 / n as f64;
        let Some(s) = solve_at(dose_g, guess) else {
            return Err("the batch has no water".into());
        };
        guess = Some(Guess {
            ph: s.ph,
            ionic_strength: s.ionic_strength,
        });
        out.push(CurvePoint {
            dose_g,
            ph: s.ph,
            buffer_capacity: s.buffer_capacity,
        });
    }
    let equivalence = equivalence_points(&out);
    let to_target = target_ph
        .map(|t| dose_to_target(&out, t, |d| solve_at(d, None).map(|s| s.ph), library, entry));
    Ok(CurveData {
        adjuster: adjuster.to_owned(),
        adjuster_name: library.entries()[entry].ingredient.name.clone(),
        points: out,
        equivalence,
        to_target,
    })
}

/// Local maxima of |dpH/d(dose)| that stand well above the curve's average slope.
fn equivalence_points(points: &[CurvePoint]) -> Vec<[f64; 2]> {
    let slopes: Vec<f64> = points
        .windows(2)
        .map(|w| ((w[1].ph - w[0].ph) / (w[1].dose_g - w[0].dose_g)).abs())
        .collect();
    if slopes.len() < 3 {
        return Vec::new();
    }
    let mean = slopes.iter().sum::<f64>() / slopes.len() as f64;
    let mut found = Vec::new();
    for i in 1..slopes.len() - 1 {
        if slopes[i] > slopes[i - 1] && slopes[i] >= slopes[i + 1] && slopes[i] > 2.0 * mean {
            let (a, b) = (points[i], points[i + 1]);
            found.push([0.5 * (a.dose_g + b.dose_g), 0.5 * (a.ph + b.ph)]);
        }
    }
    found
}

fn dose_to_target(
    points: &[CurvePoint],
    target_ph: f64,
    ph_at: impl Fn(f64) -> Option<f64>,
    library: &Library,
    entry: usize,
) -> Result<f64, String> {
    let name = &library.entries()[entry].ingredient.name;
    let (Some(first), Some(last)) = (points.first(), points.last()) else {
        return Err("the dose curve is empty".into());
    };
    if (first.ph - target_ph).abs() < 1e-9 {
        return Ok(0.0);
    }
    let Some(i) = points
        .windows(2)
        .position(|w| (w[0].ph - target_ph) * (w[1].ph - target_ph) <= 0.0)
    else {
        let direction = if last.ph > first.ph {
            "raises"
        } else {
            "lowers"
        };
        return Err(format!(
            "{name} {direction} the pH from {:.2} to {:.2} over the dose range, which does not reach pH {target_ph:.2}",
            first.ph, last.ph
        ));
    };
    let (mut lo, mut hi) = (points[i].dose_g, points[i + 1].dose_g);
    let rising = points[i + 1].ph > points[i].ph;
    for _ in 0..TARGET_STEPS {
        let mid = 0.5 * (lo + hi);
        let Some(ph) = ph_at(mid) else {
            return Err("the batch has no water".into());
        };
        if (ph < target_ph) == rising {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Ok(0.5 * (lo + hi))
}

/// Which way a recipe line moves pH.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Effect {
    /// Lowers pH.
    Lowers,
    /// Raises pH.
    Raises,
    /// Does not move pH (ions of strong acids and bases only).
    Neutral,
}

impl Effect {
    /// Short words for the table.
    pub fn words(self) -> &'static str {
        match self {
            Self::Lowers => "lowers pH",
            Self::Raises => "raises pH",
            Self::Neutral => "no effect",
        }
    }
}

/// What one ingredient does to pH once dissolved, and a one-line reason.
pub fn line_effect(library: &Library, entry: usize, pkw: f64) -> (Effect, String) {
    let Some(e) = library.entries().get(entry) else {
        return (Effect::Neutral, String::new());
    };
    let mut lowers = Vec::new();
    let mut raises = Vec::new();
    let mut strongest: Option<(f64, Effect)> = None;
    let mut consider = |pk: f64, effect: Effect| {
        if strongest.is_none_or(|(best, _)| pk < best) {
            strongest = Some((pk, effect));
        }
    };
    for r in &e.releases {
        match *r {
            ResolvedRelease::Ion { ion, .. } => {
                if ion == library.hydron() {
                    lowers.push("releases H+: a strong acid".to_owned());
                    consider(-10.0, Effect::Lowers);
                } else if ion == library.hydroxide() {
                    raises.push("releases OH−: a strong base".to_owned());
                    consider(-10.0, Effect::Raises);
                }
            }
            ResolvedRelease::System { system, form, .. } => {
                let Some(s) = library.systems().get(system) else {
                    continue;
                };
                let names = saltwise_chem::library::form_names(s);
                let j = form as usize;
                let form_name = names.get(j).cloned().unwrap_or_default();
                let acid_pk = s.pka.get(j).copied();
                let base_pk = j.checked_sub(1).and_then(|k| s.pka.get(k)).map(|p| pkw - p);
                if let Some(pka) = acid_pk {
                    consider(pka, Effect::Lowers);
                }
                if let Some(pkb) = base_pk {
                    consider(pkb, Effect::Raises);
                }
                match (acid_pk, base_pk) {
                    (Some(pka), Some(pkb)) if pka < pkb => lowers.push(format!(
                        "{form_name} gives up a proton (pKa {pka:.2}) more than it takes one (pKb {pkb:.2})"
                    )),
                    (Some(pka), Some(pkb)) => raises.push(format!(
                        "{form_name} takes a proton (pKb {pkb:.2}) more than it gives one up (pKa {pka:.2})"
                    )),
                    (Some(pka), None) => {
                        lowers.push(format!("{form_name} is a weak acid (pKa {pka:.2})"));
                    }
                    (None, Some(pkb)) => raises.push(format!(
                        "{form_name} is the conjugate base of a weak acid (pKb {pkb:.2})"
                    )),
                    (None, None) => {}
                }
            }
        }
    }
    match strongest {
        None => (
            Effect::Neutral,
            "only ions of strong acids and bases: they do not react with water".into(),
        ),
        Some((_, effect)) => {
            let reasons = if effect == Effect::Lowers {
                lowers
            } else {
                raises
            };
            (effect, reasons.join("; "))
        }
    }
}

/// A caution shown in the cautions area.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Caution {
    /// Short title.
    pub title: String,
    /// Plain words: the hazard and what to consult.
    pub text: String,
}

/// Cautions for the enabled lines of a batch and its solved pH.
pub fn cautions(library: &Library, report: Option<&Report>, entries: &[usize]) -> Vec<Caution> {
    let has = |h: Hazard| {
        entries
            .iter()
            .filter_map(|&i| library.entries().get(i))
            .find(|e| e.ingredient.hazards.contains(&h))
    };
    let mut out = Vec::new();
    if let Some(e) = has(Hazard::StrongAlkali) {
        out.push(Caution {
            title: "Strong alkali".into(),
            text: format!(
                "{} is corrosive: it burns skin and eyes and heats up when diluted. Add it slowly to water, never water to it, with eye protection.",
                e.ingredient.name
            ),
        });
    }
    if let Some(e) = has(Hazard::StrongAcid) {
        out.push(Caution {
            title: "Strong acid".into(),
            text: format!(
                "{} is corrosive to skin, eyes and metals and may give off fumes. Add acid to water, never water to acid.",
                e.ingredient.name
            ),
        });
    }
    let hypochlorite = has(Hazard::Hypochlorite);
    if let Some(e) = hypochlorite {
        out.push(Caution {
            title: "Hypochlorite".into(),
            text: format!(
                "{} releases chlorine gas with acids and chloramines with ammonium salts or ammonia. Keep it alkaline and away from both.",
                e.ingredient.name
            ),
        });
    }
    if let Some(e) = has(Hazard::Ammonia) {
        out.push(Caution {
            title: "Ammonia source".into(),
            text: format!(
                "{} can release ammonia, which irritates eyes and lungs, more so at high pH{}.",
                e.ingredient.name,
                if hypochlorite.is_some() {
                    "; with hypochlorite it forms toxic chloramines"
                } else {
                    ""
                }
            ),
        });
    }
    if let Some(r) = report {
        let ph = r.solution.ph;
        if ph <= 2.0 {
            out.push(Caution {
                title: "Extreme pH".into(),
                text: format!("pH {ph:.1} is strongly acidic: the product is likely corrosive to skin and eyes."),
            });
        } else if ph >= 11.5 {
            out.push(Caution {
                title: "Extreme pH".into(),
                text: format!("pH {ph:.1} is strongly alkaline: the product is likely corrosive to skin and eyes."),
            });
        }
    }
    out
}
