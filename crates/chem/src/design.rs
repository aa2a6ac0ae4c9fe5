//! Buffer design: the grams of an acid form and a salt form of one acid–base system that give a
//! target pH and a target buffer capacity, with the rest of the recipe present.
//!
//! Two nested bracketed roots. For a total `n` (mol of the system in the batch) the fraction `r`
//! of it brought by the base ingredient sets the pH, which rises with `r`: a bisection on
//! `r ∈ [0, 1]`. The buffer capacity at that pH rises with `n`: a bisection on `log n`, between a
//! vanishing total and the cap of [`MAX_SYSTEM_MOLAL`] mol/kg water (solubility is not
//! modelled, so the cap is a model bound, not a solubility).

use thiserror::Error;

use crate::error::RecipeError;
use crate::library::{Library, ResolvedRelease};
use crate::recipe::{Recipe, RecipeLine};
use crate::report::evaluate_with;
use crate::solver::Constants;

/// The most system the design may put in, mol per kg water (a model bound, not a solubility).
pub const MAX_SYSTEM_MOLAL: f64 = 5.0;

/// The system molality (mol/kg water) at which other pairs' pH ranges are compared: a typical
/// buffer strength (common practice, no source), well inside the activity models' range.
pub const ALTERNATIVE_MOLAL: f64 = 0.1;

/// Why a buffer cannot be designed.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum DesignError {
    /// An ingredient that does not release exactly one acid–base system.
    #[error(
        "{id} does not release one acid–base system, so it cannot be one side of a buffer pair"
    )]
    NotOneSystem {
        /// The ingredient id.
        id: String,
    },
    /// The acid and the base release different systems.
    #[error(
        "{acid} releases the {acid_system} system but {base} releases the {base_system} system: the pair must be two forms of one system"
    )]
    DifferentSystems {
        /// Acid ingredient id.
        acid: String,
        /// Its system.
        acid_system: String,
        /// Base ingredient id.
        base: String,
        /// Its system.
        base_system: String,
    },
    /// The acid ingredient is not a more protonated form than the base ingredient.
    #[error(
        "{acid} is not a more acidic form of the {system} system than {base}: give the more protonated form as --acid"
    )]
    NotAcidBase {
        /// Acid ingredient id.
        acid: String,
        /// Base ingredient id.
        base: String,
        /// The system.
        system: String,
    },
    /// A target pH that is not a finite number.
    #[error("target pH {target_ph} is not a finite number")]
    BadTarget {
        /// The target as given.
        target_ph: f64,
    },
    /// A target capacity that is not a positive finite number.
    #[error(
        "target buffer capacity {capacity} mol/kg water per pH is not allowed: it must be above 0"
    )]
    BadCapacity {
        /// The target as given.
        capacity: f64,
    },
    /// The pair cannot reach the target pH.
    #[error(
        "pH {target_ph} is outside what {acid} and {base} reach in this recipe (pH {low:.2} to {high:.2}, even at {molal:.2} mol/kg water of the system){}",
        alternatives_text(.alternatives)
    )]
    OutOfReach {
        /// The target pH.
        target_ph: f64,
        /// Acid ingredient id.
        acid: String,
        /// Base ingredient id.
        base: String,
        /// pH with the acid alone.
        low: f64,
        /// pH with the base alone.
        high: f64,
        /// The system molality the range was found at, mol/kg water.
        molal: f64,
        /// Library pairs (acid id, base id) of one system whose range at [`ALTERNATIVE_MOLAL`] covers the target.
        alternatives: Vec<(String, String)>,
    },
    /// The target capacity is below the least the recipe gives at the target pH.
    #[error(
        "a buffer capacity of {capacity} mol/kg water per pH is below the least the recipe has at pH {target_ph} ({least:.3e}, the rest of the recipe with just enough of the pair to reach that pH): raise the capacity"
    )]
    CapacityTooLow {
        /// The target capacity.
        capacity: f64,
        /// The target pH.
        target_ph: f64,
        /// The least capacity found at the target pH.
        least: f64,
    },
    /// The target capacity needs more of the system than the cap.
    #[error(
        "a buffer capacity of {capacity} mol/kg water per pH is not reachable: the most {acid} and {base} give at pH {target_ph} is {most:.4} with {molal:.3} mol/kg water of the system (capped at {MAX_SYSTEM_MOLAL} mol/kg water or the q.s. batch; solubility is not modelled)"
    )]
    CapacityTooHigh {
        /// The target capacity.
        capacity: f64,
        /// Acid ingredient id.
        acid: String,
        /// Base ingredient id.
        base: String,
        /// The target pH.
        target_ph: f64,
        /// The most capacity found under the cap.
        most: f64,
        /// The system molality at the cap, mol/kg water.
        molal: f64,
    },
    /// The recipe cannot be solved.
    #[error(transparent)]
    Recipe(#[from] RecipeError),
}

fn alternatives_text(pairs: &[(String, String)]) -> String {
    if pairs.is_empty() {
        "; no pair of one system in the library reaches it".into()
    } else {
        let list: Vec<String> = pairs.iter().map(|(a, b)| format!("{a} + {b}")).collect();
        format!(
            "; pairs of the library that reach it at {ALTERNATIVE_MOLAL} mol/kg water: {}",
            list.join(", ")
        )
    }
}

/// A designed buffer.
#[derive(Debug, Clone, PartialEq)]
pub struct Design {
    /// Grams of the acid ingredient as supplied.
    pub acid_g: f64,
    /// Grams of the base ingredient as supplied.
    pub base_g: f64,
    /// pH reached with both in the recipe.
    pub ph: f64,
    /// Buffer capacity reached, mol/kg water per pH.
    pub buffer_capacity: f64,
    /// Molality of the system in the batch, mol/kg water.
    pub system_molal: f64,
}

/// The one system an ingredient releases: (system, count per formula unit, form).
pub fn single_system(library: &Library, id: &str) -> Option<(usize, f64, u32)> {
    let e = library.entry(id)?;
    let mut found = None;
    for r in &e.releases {
        if let ResolvedRelease::System {
            system,
            count,
            form,
        } = *r
        {
            if found.is_some() {
                return None;
            }
            found = Some((system, count, form));
        }
    }
    found
}

/// A buffer pair in a recipe, ready to evaluate at a total and a ratio.
struct Pair<'a> {
    library: &'a Library,
    constants: &'a Constants,
    rest: &'a Recipe,
    acid: &'a str,
    base: &'a str,
    /// Grams of ingredient per mol of system (acid, base).
    g_per_mol: (f64, f64),
}

/// One evaluation: (pH, capacity, system molality).
type Point = (f64, f64, f64);

impl<'a> Pair<'a> {
    fn new(
        library: &'a Library,
        constants: &'a Constants,
        rest: &'a Recipe,
        acid: &'a str,
        base: &'a str,
    ) -> Option<Self> {
        let g = |id: &str| {
            let (_, count, _) = single_system(library, id)?;
            let e = library.entry(id)?;
            Some(e.molar_mass_g_per_mol / e.ingredient.assay / count)
        };
        Some(Self {
            library,
            constants,
            rest,
            acid,
            base,
            g_per_mol: (g(acid)?, g(base)?),
        })
    }

    fn grams(&self, n: f64, r: f64) -> (f64, f64) {
        (n * (1.0 - r) * self.g_per_mol.0, n * r * self.g_per_mol.1)
    }

    fn eval(&self, n: f64, r: f64) -> Result<Point, RecipeError> {
        let (ga, gb) = self.grams(n, r);
        let mut recipe = self.rest.clone();
        recipe.lines.push(RecipeLine::grams(self.acid, ga));
        recipe.lines.push(RecipeLine::grams(self.base, gb));
        let report = evaluate_with(self.library, self.constants, &recipe)?;
        Ok((
            report.solution.ph,
            report.solution.buffer_capacity,
            n / report.batch.totals.water_kg,
        ))
    }

    /// The pH range at total `n`: (acid alone, base alone).
    fn range(&self, n: f64) -> Result<(f64, f64, f64), RecipeError> {
        let lo = self.eval(n, 0.0)?;
        let hi = self.eval(n, 1.0)?;
        Ok((lo.0, hi.0, lo.2.max(hi.2)))
    }

    /// The base fraction that hits `target_ph` at total `n`, or `None` when out of reach.
    fn ratio(&self, n: f64, target_ph: f64) -> Result<Option<(f64, Point)>, RecipeError> {
        let (mut a, mut b) = (0.0, 1.0);
        let fa = self.eval(n, a)?.0 - target_ph;
        let fb = self.eval(n, b)?.0 - target_ph;
        if fa * fb > 0.0 {
            return Ok(None);
        }
        let rising = fb >= fa;
        for _ in 0..200 {
            let m = 0.5 * (a + b);
            let f = self.eval(n, m)?.0 - target_ph;
            if (f < 0.0) == rising {
                a = m;
            } else {
                b = m;
            }
            if b - a < 1e-13 || f.abs() < 1e-10 {
                break;
            }
        }
        let r = 0.5 * (a + b);
        Ok(Some((r, self.eval(n, r)?)))
    }

    /// Whether a total fits: the batch resolves and stays under the molality cap at both ends.
    fn fits(&self, n: f64) -> bool {
        [0.0, 1.0]
            .iter()
            .all(|&r| matches!(self.eval(n, r), Ok(p) if p.2 <= MAX_SYSTEM_MOLAL))
    }

    /// The largest total that fits, searched down from the cap on the rest's water.
    fn max_total(&self, water_kg: f64) -> Option<f64> {
        let mut n = MAX_SYSTEM_MOLAL * water_kg;
        for _ in 0..200 {
            if self.fits(n) {
                return Some(n);
            }
            n *= 0.9;
        }
        None
    }
}

/// Solves for the grams of `acid` and `base` that give `target_ph` and `capacity` in `rest`.
pub fn design(
    library: &Library,
    constants: &Constants,
    rest: &Recipe,
    acid: &str,
    base: &str,
    target_ph: f64,
    capacity: f64,
) -> Result<Design, DesignError> {
    for id in [acid, base] {
        if library.entry_index(id).is_none() {
            return Err(RecipeError::UnknownIngredient {
                id: id.into(),
                suggestions: library.suggest(id),
            }
            .into());
        }
    }
    let one = |id: &str| {
        single_system(library, id).ok_or_else(|| DesignError::NotOneSystem { id: id.into() })
    };
    let (sa, _, fa) = one(acid)?;
    let (sb, _, fb) = one(base)?;
    let system_id = |s: usize| library.systems()[s].id.clone();
    if sa != sb {
        return Err(DesignError::DifferentSystems {
            acid: acid.into(),
            acid_system: system_id(sa),
            base: base.into(),
            base_system: system_id(sb),
        });
    }
    if fa >= fb {
        return Err(DesignError::NotAcidBase {
            acid: acid.into(),
            base: base.into(),
            system: system_id(sa),
        });
    }
    if !target_ph.is_finite() {
        return Err(DesignError::BadTarget { target_ph });
    }
    if !(capacity.is_finite() && capacity > 0.0) {
        return Err(DesignError::BadCapacity { capacity });
    }
    let rest_batch = rest.batch(library)?;
    let pair = Pair::new(library, constants, rest, acid, base).ok_or_else(|| {
        DesignError::NotOneSystem {
            id: acid.to_owned(),
        }
    })?;
    let water = rest_batch.totals.water_kg;
    let Some(n_hi) = pair.max_total(water) else {
        // Even a tiny amount does not fit: report the recipe's own refusal.
        pair.eval(MAX_SYSTEM_MOLAL * water * 1e-9, 0.5)?;
        return Err(RecipeError::NoWater.into());
    };
    let Some((_, hi)) = pair.ratio(n_hi, target_ph)? else {
        let (low, high, molal) = pair.range(n_hi)?;
        return Err(DesignError::OutOfReach {
            target_ph,
            acid: acid.into(),
            base: base.into(),
            low,
            high,
            molal,
            alternatives: alternatives(
                library,
                constants,
                rest,
                target_ph,
                ALTERNATIVE_MOLAL * water,
            ),
        });
    };
    if hi.1 < capacity {
        return Err(DesignError::CapacityTooHigh {
            capacity,
            acid: acid.into(),
            base: base.into(),
            target_ph,
            most: hi.1,
            molal: hi.2,
        });
    }
    let mut lo_n = n_hi * 1e-9;
    if let Some((_, lo)) = pair.ratio(lo_n, target_ph)?
        && lo.1 >= capacity
    {
        return Err(DesignError::CapacityTooLow {
            capacity,
            target_ph,
            least: lo.1,
        });
    }
    let mut hi_n = n_hi;
    let mut best = None;
    for _ in 0..200 {
        let mid = (lo_n * hi_n).sqrt();
        match pair.ratio(mid, target_ph)? {
            Some((r, p)) if p.1 >= capacity => {
                hi_n = mid;
                best = Some((mid, r, p));
            }
            Some((r, p)) => {
                lo_n = mid;
                best = best.or(Some((mid, r, p)));
            }
            None => lo_n = mid,
        }
        if hi_n / lo_n - 1.0 < 1e-12 {
            break;
        }
    }
    let (n, r, p) = match best {
        Some(b) => b,
        None => {
            let (r, p) = pair.ratio(n_hi, target_ph)?.unwrap_or((0.5, hi));
            (n_hi, r, p)
        }
    };
    if p.1 > capacity * (1.0 + 1e-6) {
        // Every total that reaches the pH gives more than the target.
        return Err(DesignError::CapacityTooLow {
            capacity,
            target_ph,
            least: p.1,
        });
    }
    let (acid_g, base_g) = pair.grams(n, r);
    Ok(Design {
        acid_g,
        base_g,
        ph: p.0,
        buffer_capacity: p.1,
        system_molal: p.2,
    })
}

/// Library pairs (acid id, base id) of one system whose pH range in `rest` covers `target_ph`.
fn alternatives(
    library: &Library,
    constants: &Constants,
    rest: &Recipe,
    target_ph: f64,
    n: f64,
) -> Vec<(String, String)> {
    let singles: Vec<(&str, usize, u32)> = library
        .entries()
        .iter()
        .filter_map(|e| {
            let id = e.ingredient.id.as_str();
            single_system(library, id).map(|(s, _, f)| (id, s, f))
        })
        .collect();
    let mut out = Vec::new();
    for &(a, sa, fa) in &singles {
        for &(b, sb, fb) in &singles {
            if sa != sb || fa >= fb {
                continue;
            }
            let Some(pair) = Pair::new(library, constants, rest, a, b) else {
                continue;
            };
            if let Ok((low, high, _)) = pair.range(n)
                && (low..=high).contains(&target_ph)
            {
                out.push((a.to_owned(), b.to_owned()));
            }
        }
    }
    out
}
