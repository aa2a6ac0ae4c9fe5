//! QC titrations predicted: the titrant volume to each end point for a sample of product, the
//! titration curve, the plant-floor titration factor, and P and M values after carbonation.
//!
//! The sample is `sample_g` g of the product as is (its water and solutes, in proportion:
//! [`Batch::scaled_to`]). The titrant is a strong acid or a strong base of the library at a
//! normality N (mol of H⁺ or OH⁻ per L, above 0 and at most 1). Its density is taken as
//! 1.00 kg/L, which holds within a few per cent up to 1 mol/L: each mL brings 1 g of water and
//! N mmol of H⁺ (or OH⁻) with its counter-ion — N/e mmol of the named substance, e being the
//! equivalents per formula unit (H⁺ released plus the protons held by any system released with
//! it, so sulfuric acid counts 2; OH⁻ released for a base). The solute's own mass (at most about
//! 40 mg per mL at 1 N) is neglected. The titrant is a dose of [`Doser::with_dose_unit`] counted
//! in mL, so every point is a plain solve of the sample with that much titrant in it.
//!
//! The volume to an end point is the root of pH(V) = end point, bracketed and searched up to
//! [`MAX_TITRANT_ML`]; an end point not reached by then is an error naming it. A sample already at
//! or past an end point before any titrant needs 0 mL there (so a sample below pH 8.3 has no P
//! alkalinity, common practice). Default end points: with an acid titrant pH 8.3 (P alkalinity,
//! phenolphthalein) and pH 4.3 (M alkalinity, total, methyl orange); with a base titrant pH 8.3
//! (acidity to phenolphthalein), pH 7.0 being the documented alternative ([`NEUTRAL_ACIDITY_PH`]).
//!
//! Titration factor, the plant floor's % of product in an in-use solution per mL of titrant, for a
//! sample of V mL of in-use solution: if x mL reach the end point for V mL of a c % solution, the
//! factor is F = c/x (common practice). Taking the in-use solution's density as 1 g/mL, V mL of it
//! hold V·c/100 g of product; with the titrant volume in proportion to the product titrated, the
//! product's own titration (x₀ mL for m g) gives x = (V·c/100)·x₀/m, so
//! F = 100·(m/x₀)/(V·1 g/mL): 100 times the grams of product per mL of titrant at the end point,
//! over the grams of in-use sample. The proportion holds when dilution does not move the end point
//! (strong alkalinity or acidity, or a system fully converted there).
//!
//! Carbonation of a caustic product: x % of its free hydroxide (the solved m(OH⁻) times its
//! water) takes up CO₂ as carbonate, 2 OH⁻ + CO₂ → CO₃²⁻ + H₂O: x/200 mol of CO₂ per mol of free
//! OH⁻ joins the carbonic system as dissolved CO₂ (its fully protonated form, so the proton excess
//! is unchanged and the solver turns OH⁻ into carbonate), with 18.015 g of water formed and 44.010 g
//! of mass taken up per mol; the sample is then weighed from the carbonated product.

use thiserror::Error;

use crate::curve::Doser;
use crate::drift::CARBONIC_ID;
use crate::error::{LimitError, RecipeError};
use crate::formula::WATER_MOLAR_MASS_G_PER_MOL;
use crate::library::{Library, ResolvedRelease};
use crate::limits;
use crate::recipe::{Batch, Totals};
use crate::report;
use crate::solver::{Constants, Guess, Solution};
use crate::sweep::POINTS_MAX;

/// Density of the titrant taken for every normality allowed (up to 1 mol/L), kg/L.
pub const TITRANT_DENSITY_KG_PER_L: f64 = 1.00;

/// Water one mL of titrant brings, g (the density above, the solute's mass neglected).
pub const TITRANT_WATER_G_PER_ML: f64 = 1.0;

/// Density taken for an in-use solution in the titration factor, g/mL.
pub const IN_USE_DENSITY_G_PER_ML: f64 = 1.0;

/// Largest titrant volume searched for an end point, mL.
pub const MAX_TITRANT_ML: f64 = 1000.0;

/// P alkalinity end point (phenolphthalein), pH.
pub const P_END_POINT_PH: f64 = 8.3;

/// M (total) alkalinity end point (methyl orange), pH.
pub const M_END_POINT_PH: f64 = 4.3;

/// Acidity end point with a base titrant (phenolphthalein), pH.
pub const ACIDITY_END_POINT_PH: f64 = 8.3;

/// The alternative acidity end point at neutrality, pH.
pub const NEUTRAL_ACIDITY_PH: f64 = 7.0;

/// The curve runs this fraction past the last end point's volume.
pub const CURVE_MARGIN: f64 = 0.25;

/// Curve length when no end point needs any titrant, mL.
pub const FALLBACK_CURVE_ML: f64 = 10.0;

/// Points of a titration curve unless told otherwise.
pub const DEFAULT_POINTS: usize = 101;

/// Least free hydroxide for the carbonation scenario, mol/kg water (about pH 11).
pub const CAUSTIC_MIN_OH_MOLAL: f64 = 1e-3;

/// Molar mass of CO₂ from the atomic weights of `formula.rs`, g/mol.
const CO2_MOLAR_MASS_G_PER_MOL: f64 = 12.010_7 + 2.0 * 15.999_4;

/// Why a titration cannot be predicted.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum QcError {
    /// A number outside its limits (sample, normality, end point, in-use sample, carbonation).
    #[error(transparent)]
    Limit(#[from] LimitError),
    /// A titrant the library does not hold, by id, formula or grade-less id.
    #[error("unknown titrant '{name}'; the strong acids and bases in the library are {}", .known.join(", "))]
    UnknownTitrant {
        /// The name as given.
        name: String,
        /// The strong acids and bases of the library, with their formulas.
        known: Vec<String>,
    },
    /// An ingredient that is neither a strong acid nor a strong base.
    #[error("{id} is neither a strong acid (releasing H+) nor a strong base (releasing OH- and no weak system), so it cannot be a titrant; the strong acids and bases in the library are {}", .known.join(", "))]
    NotStrong {
        /// The ingredient id.
        id: String,
        /// The strong acids and bases of the library, with their formulas.
        known: Vec<String>,
    },
    /// An end point the titration does not reach within the largest volume searched.
    #[error(
        "end point pH {end_point_ph} is not reached within {max_ml} mL of {normality} N {titrant}: the pH there is {ph_at_max:.2}; take a smaller sample, a stronger titrant or an end point it reaches"
    )]
    EndPointNotReached {
        /// The end point, pH.
        end_point_ph: f64,
        /// The titrant id.
        titrant: String,
        /// The titrant's normality, mol/L.
        normality: f64,
        /// The largest volume searched, mL.
        max_ml: f64,
        /// The pH with that volume in, pH.
        ph_at_max: f64,
    },
    /// A titration factor at an end point the sample is already past.
    #[error(
        "no titration factor at end point pH {end_point_ph}: the sample is already past it before any titrant; choose an end point that takes titrant"
    )]
    NoFactor {
        /// The end point, pH.
        end_point_ph: f64,
    },
    /// A carbonation scenario for a product with too little free hydroxide.
    #[error(
        "the carbonation scenario is for caustic products: this one is at pH {ph:.2} with {oh_molal:.3e} mol/kg water of free OH-, below {CAUSTIC_MIN_OH_MOLAL} mol/kg water"
    )]
    NotCaustic {
        /// The product's pH.
        ph: f64,
        /// Its free hydroxide, mol/kg water.
        oh_molal: f64,
    },
    /// The library has no carbonic system for the carbonation scenario.
    #[error("the library has no '{CARBONIC_ID}' system, so carbonation cannot be modelled")]
    NoCarbonic,
    /// P and M values asked of a base titrant.
    #[error("P and M values are titrated with an acid; {titrant} is a base")]
    NeedsAcidTitrant {
        /// The titrant id.
        titrant: String,
    },
    /// Too few or too many curve points.
    #[error("{points} points is not allowed: a titration curve has 2 to {POINTS_MAX} points")]
    Points {
        /// The number of points given.
        points: usize,
    },
    /// The recipe itself cannot be solved.
    #[error(transparent)]
    Recipe(#[from] RecipeError),
}

/// Whether a titrant is a strong acid or a strong base.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TitrantKind {
    /// Releases H⁺: titrates alkalinity, lowers pH.
    Acid,
    /// Releases OH⁻: titrates acidity, raises pH.
    Base,
}

impl TitrantKind {
    /// The default end points, pH: 8.3 and 4.3 for an acid, 8.3 for a base.
    pub fn default_end_points(self) -> &'static [f64] {
        match self {
            Self::Acid => &[P_END_POINT_PH, M_END_POINT_PH],
            Self::Base => &[ACIDITY_END_POINT_PH],
        }
    }

    /// `acid` or `base`.
    pub fn label(self) -> &'static str {
        match self {
            Self::Acid => "acid",
            Self::Base => "base",
        }
    }
}

/// A strong acid or strong base of the library at a normality.
#[derive(Debug, Clone, PartialEq)]
pub struct Titrant {
    entry: usize,
    id: String,
    kind: TitrantKind,
    normality: f64,
    equivalents_per_mol: f64,
}

/// Whether an ingredient is a strong acid or base, and its equivalents per formula unit.
fn strength(library: &Library, entry: usize) -> Option<(TitrantKind, f64)> {
    let mut h = 0.0;
    let mut oh = 0.0;
    let mut held = 0.0;
    for r in &library.entries()[entry].releases {
        match *r {
            ResolvedRelease::Ion { ion, count } if ion == library.hydron() => h += count,
            ResolvedRelease::Ion { ion, count } if ion == library.hydroxide() => oh += count,
            ResolvedRelease::Ion { .. } => {}
            ResolvedRelease::System {
                system,
                count,
                form,
            } => {
                let steps = library.systems()[system].pka.len() as f64;
                held += count * (steps - f64::from(form)).max(0.0);
            }
        }
    }
    match (h > 0.0, oh > 0.0) {
        (true, false) => Some((TitrantKind::Acid, h + held)),
        (false, true) if held == 0.0 => Some((TitrantKind::Base, oh)),
        _ => None,
    }
}

/// The strong acids and bases of the library, as `id (formula)`, in library order.
pub fn strong_titrants(library: &Library) -> Vec<String> {
    titrant_entries(library)
        .map(|i| {
            let ing = &library.entries()[i].ingredient;
            format!("{} ({})", ing.id, ing.formula)
        })
        .collect()
}

/// The library ids of the strong acids and bases, in library order.
pub fn strong_titrant_ids(library: &Library) -> Vec<&str> {
    titrant_entries(library)
        .map(|i| library.entries()[i].ingredient.id.as_str())
        .collect()
}

fn titrant_entries(library: &Library) -> impl Iterator<Item = usize> + '_ {
    (0..library.entries().len()).filter(|&i| strength(library, i).is_some())
}

impl Titrant {
    /// A titrant by library id, by formula (`hcl`, `naoh`) or by id without its grade
    /// (`hydrochloric_acid` for `hydrochloric_acid_36`), at `normality` mol/L.
    ///
    /// The grade's assay does not matter: the normality sets the concentration.
    pub fn find(library: &Library, name: &str, normality: f64) -> Result<Self, QcError> {
        limits::NORMALITY.check(normality)?;
        let wanted = name.trim().to_ascii_lowercase();
        let entries = library.entries();
        let strong = |i: &usize| strength(library, *i).is_some();
        let entry = if let Some(i) = library.entry_index(&wanted) {
            i
        } else if let Some(i) = (0..entries.len())
            .filter(strong)
            .find(|&i| entries[i].ingredient.formula.to_ascii_lowercase() == wanted)
        {
            i
        } else if let Some(i) = (0..entries.len()).filter(strong).find(|&i| {
            entries[i]
                .ingredient
                .id
                .strip_prefix(&wanted)
                .and_then(|rest| rest.strip_prefix('_'))
                .is_some_and(|grade| !grade.is_empty() && grade.chars().all(|c| c.is_ascii_digit()))
        }) {
            i
        } else {
            return Err(QcError::UnknownTitrant {
                name: name.to_owned(),
                known: strong_titrants(library),
            });
        };
        let id = entries[entry].ingredient.id.clone();
        let Some((kind, equivalents_per_mol)) = strength(library, entry) else {
            return Err(QcError::NotStrong {
                id,
                known: strong_titrants(library),
            });
        };
        Ok(Self {
            entry,
            id,
            kind,
            normality,
            equivalents_per_mol,
        })
    }

    /// The library id of the ingredient titrated with.
    pub fn id(&self) -> &str {
        &self.id
    }

    /// Strong acid or strong base.
    pub fn kind(&self) -> TitrantKind {
        self.kind
    }

    /// Normality, mol of H⁺ or OH⁻ per L.
    pub fn normality(&self) -> f64 {
        self.normality
    }

    /// Equivalents (H⁺ or OH⁻) per formula unit of the named substance.
    pub fn equivalents_per_mol(&self) -> f64 {
        self.equivalents_per_mol
    }

    /// What one mL of titrant brings: 1 g of water and N mmol of H⁺ or OH⁻ with its counter-ion.
    pub fn per_ml(&self, library: &Library) -> Totals {
        let mut t = Totals::zero(library);
        t.water_kg = TITRANT_WATER_G_PER_ML * 1e-3;
        t.add_releases(
            library,
            self.entry,
            self.normality * 1e-3 / self.equivalents_per_mol,
        );
        t
    }
}

/// The titrant volume that brings the sample to an end point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EndPoint {
    /// The end point, pH.
    pub ph: f64,
    /// Titrant to reach it, mL.
    pub ml: f64,
    /// Milliequivalents of H⁺ or OH⁻ in that volume (mL × N).
    pub meq: f64,
    /// Whether the sample is at or past the end point before any titrant (`ml` is then 0).
    pub at_start: bool,
}

/// One point of a titration curve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TitrationPoint {
    /// Titrant added, mL.
    pub ml: f64,
    /// pH there.
    pub ph: f64,
}

/// A sample of product with a titrant to add, solved on demand.
#[derive(Debug, Clone)]
pub struct Titration<'a> {
    doser: Doser<'a>,
    titrant: Titrant,
    sample_g: f64,
    start: Solution,
    start_warnings: Vec<String>,
}

impl<'a> Titration<'a> {
    /// Prepares titrating `sample_g` g of a product with a titrant.
    pub fn new(
        library: &Library,
        constants: &'a Constants,
        product: &Batch,
        sample_g: f64,
        titrant: &Titrant,
    ) -> Result<Self, QcError> {
        limits::SAMPLE_G.check(sample_g)?;
        let sample = product.scaled_to(sample_g);
        // A product without water cannot be titrated as a solution.
        sample.composition(library)?;
        let doser = Doser::with_dose_unit(
            library,
            constants,
            &sample,
            titrant.id(),
            &titrant.per_ml(library),
        );
        let start = doser.solve(0.0, None);
        let composition = doser.composition(0.0);
        let sp = crate::solver::speciation(library, constants, &composition, &start);
        let start_warnings = report::warnings(constants, &composition, &start, &sp);
        Ok(Self {
            doser,
            titrant: titrant.clone(),
            sample_g,
            start,
            start_warnings,
        })
    }

    /// The sample's mass, g.
    pub fn sample_g(&self) -> f64 {
        self.sample_g
    }

    /// The titrant.
    pub fn titrant(&self) -> &Titrant {
        &self.titrant
    }

    /// The solved sample before any titrant.
    pub fn start(&self) -> &Solution {
        &self.start
    }

    /// Validity warnings of the sample before any titrant (model range, convergence).
    pub fn warnings(&self) -> Vec<String> {
        self.start_warnings.clone()
    }

    /// pH with `ml` mL of titrant in.
    pub fn ph_at(&self, ml: f64) -> f64 {
        self.doser
            .solve(
                ml,
                Some(Guess {
                    ph: self.start.ph,
                    ionic_strength: self.start.ionic_strength,
                }),
            )
            .ph
    }

    /// Whether a pH is at or past an end point on the way the titrant moves pH.
    fn past(&self, ph: f64, end_point_ph: f64) -> bool {
        match self.titrant.kind {
            TitrantKind::Acid => ph <= end_point_ph,
            TitrantKind::Base => ph >= end_point_ph,
        }
    }

    /// The titrant volume to an end point.
    pub fn end_point(&self, end_point_ph: f64) -> Result<EndPoint, QcError> {
        limits::END_POINT_PH.check(end_point_ph)?;
        if self.past(self.start.ph, end_point_ph) {
            return Ok(EndPoint {
                ph: end_point_ph,
                ml: 0.0,
                meq: 0.0,
                at_start: true,
            });
        }
        let ph_at_max = self.doser.solve(MAX_TITRANT_ML, None).ph;
        let not_reached = || QcError::EndPointNotReached {
            end_point_ph,
            titrant: self.titrant.id.clone(),
            normality: self.titrant.normality,
            max_ml: MAX_TITRANT_ML,
            ph_at_max,
        };
        if !self.past(ph_at_max, end_point_ph) {
            return Err(not_reached());
        }
        let found = self
            .doser
            .to_target_within(end_point_ph, MAX_TITRANT_ML)
            .map_err(|_| not_reached())?;
        Ok(EndPoint {
            ph: end_point_ph,
            ml: found.amount_g,
            meq: found.amount_g * self.titrant.normality,
            at_start: false,
        })
    }

    /// The titrant volumes to several end points, in the order given.
    pub fn end_points(&self, end_points_ph: &[f64]) -> Result<Vec<EndPoint>, QcError> {
        end_points_ph.iter().map(|&p| self.end_point(p)).collect()
    }

    /// pH against titrant volume, `points` volumes evenly from 0 to `to_ml`.
    pub fn curve(&self, to_ml: f64, points: usize) -> Result<Vec<TitrationPoint>, QcError> {
        check_points(points)?;
        Ok(self
            .doser
            .curve(to_ml.max(f64::MIN_POSITIVE), points)
            .points
            .iter()
            .map(|p| TitrationPoint {
                ml: p.dose_g,
                ph: p.ph,
            })
            .collect())
    }

    /// The titration factor at an end point for `in_use_sample_ml` mL of in-use solution: % of
    /// product per mL of titrant, F = 100·(sample g / end point mL)/(V mL × 1 g/mL).
    pub fn factor(&self, end_point: &EndPoint, in_use_sample_ml: f64) -> Result<f64, QcError> {
        limits::IN_USE_SAMPLE_ML.check(in_use_sample_ml)?;
        if end_point.at_start || end_point.ml <= 0.0 {
            return Err(QcError::NoFactor {
                end_point_ph: end_point.ph,
            });
        }
        Ok(100.0 * (self.sample_g / end_point.ml) / (in_use_sample_ml * IN_USE_DENSITY_G_PER_ML))
    }
}

fn check_points(points: usize) -> Result<(), QcError> {
    if (2..=POINTS_MAX).contains(&points) {
        Ok(())
    } else {
        Err(QcError::Points { points })
    }
}

/// The product after `percent` % of its free hydroxide has taken up CO₂ as carbonate.
pub fn carbonated(
    library: &Library,
    constants: &Constants,
    product: &Batch,
    percent: f64,
) -> Result<Batch, QcError> {
    limits::CARBONATED_PERCENT.check(percent)?;
    let carbonic = library
        .system_index(CARBONIC_ID)
        .ok_or(QcError::NoCarbonic)?;
    let fresh = crate::solver::solve(constants, &product.composition(library)?, None);
    if fresh.oh_molal.is_nan() || fresh.oh_molal < CAUSTIC_MIN_OH_MOLAL {
        return Err(QcError::NotCaustic {
            ph: fresh.ph,
            oh_molal: fresh.oh_molal,
        });
    }
    // 2 OH⁻ + CO₂ → CO₃²⁻ + H₂O: half a mol of CO₂ per mol of hydroxide carbonated.
    let co2_mol = percent / 100.0 * fresh.oh_molal * product.totals.water_kg / 2.0;
    let mut out = product.clone();
    out.totals.system_mol[carbonic] += co2_mol;
    out.totals.water_kg += co2_mol * WATER_MOLAR_MASS_G_PER_MOL * 1e-3;
    out.total_mass_g += co2_mol * CO2_MOLAR_MASS_G_PER_MOL;
    Ok(out)
}

/// P and M values of a sample: the titrant to pH 8.3 and to pH 4.3.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PmValues {
    /// To pH 8.3 (P alkalinity).
    pub p: EndPoint,
    /// To pH 4.3 (M, total alkalinity).
    pub m: EndPoint,
}

/// P and M values of `sample_g` g of a caustic product after `percent` % of its free hydroxide
/// has taken up CO₂ as carbonate, with an acid titrant.
pub fn carbonation_p_m(
    library: &Library,
    constants: &Constants,
    product: &Batch,
    sample_g: f64,
    titrant: &Titrant,
    percent: f64,
) -> Result<PmValues, QcError> {
    if titrant.kind() != TitrantKind::Acid {
        return Err(QcError::NeedsAcidTitrant {
            titrant: titrant.id().to_owned(),
        });
    }
    let aged = carbonated(library, constants, product, percent)?;
    let t = Titration::new(library, constants, &aged, sample_g, titrant)?;
    Ok(PmValues {
        p: t.end_point(P_END_POINT_PH)?,
        m: t.end_point(M_END_POINT_PH)?,
    })
}

/// What to predict of a titration.
#[derive(Debug, Clone, PartialEq)]
pub struct Request {
    /// Sample of product, g.
    pub sample_g: f64,
    /// End points, pH, in order; empty means the titrant's defaults.
    pub end_points_ph: Vec<f64>,
    /// Points of the curve.
    pub points: usize,
    /// Volume of in-use solution for a titration factor at the first end point, mL.
    pub in_use_sample_ml: Option<f64>,
    /// Share of the product's free hydroxide carbonated before sampling, %.
    pub carbonated_percent: Option<f64>,
}

/// A titration factor and what it was taken at.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Factor {
    /// % of product in the in-use solution per mL of titrant.
    pub percent_per_ml: f64,
    /// The in-use sample, mL.
    pub in_use_sample_ml: f64,
    /// The end point it was taken at, pH.
    pub end_point_ph: f64,
}

/// A predicted titration.
#[derive(Debug, Clone, PartialEq)]
pub struct Prediction {
    /// pH of the sample before any titrant.
    pub start_ph: f64,
    /// Titrant to each end point, in the order asked.
    pub end_points: Vec<EndPoint>,
    /// pH against titrant volume, from 0 to 1.25 × the last end point's volume.
    pub points: Vec<TitrationPoint>,
    /// The titration factor at the first end point, when an in-use sample was given.
    pub factor: Option<Factor>,
    /// Validity warnings of the sample before any titrant.
    pub warnings: Vec<String>,
}

/// Predicts a titration of a product: end points, curve and titration factor.
pub fn predict(
    library: &Library,
    constants: &Constants,
    product: &Batch,
    titrant: &Titrant,
    request: &Request,
) -> Result<Prediction, QcError> {
    check_points(request.points)?;
    if let Some(v) = request.in_use_sample_ml {
        limits::IN_USE_SAMPLE_ML.check(v)?;
    }
    let product = match request.carbonated_percent {
        Some(p) => carbonated(library, constants, product, p)?,
        None => product.clone(),
    };
    let t = Titration::new(library, constants, &product, request.sample_g, titrant)?;
    let asked = if request.end_points_ph.is_empty() {
        titrant.kind().default_end_points()
    } else {
        &request.end_points_ph
    };
    let end_points = t.end_points(asked)?;
    let last_ml = end_points.iter().map(|e| e.ml).fold(0.0, f64::max);
    let to_ml = if last_ml > 0.0 {
        last_ml * (1.0 + CURVE_MARGIN)
    } else {
        FALLBACK_CURVE_ML
    };
    let points = t.curve(to_ml, request.points)?;
    let factor = match (request.in_use_sample_ml, end_points.first()) {
        (Some(v), Some(e)) => Some(Factor {
            percent_per_ml: t.factor(e, v)?,
            in_use_sample_ml: v,
            end_point_ph: e.ph,
        }),
        _ => None,
    };
    Ok(Prediction {
        start_ph: t.start().ph,
        end_points,
        points,
        factor,
        warnings: t.warnings(),
    })
}

/// Titrant used by a method that names none, for an alkaline product (pH 7 or above).
pub const AUTO_ACID_TITRANT: &str = "hydrochloric_acid_36";
/// Titrant used by a method that names none, for an acidic product (below pH 7).
pub const AUTO_BASE_TITRANT: &str = "sodium_hydroxide";
/// Sample of product a new QC method titrates, g.
pub const DEFAULT_SAMPLE_G: f64 = 10.0;
/// Normality of a new QC method's titrant, mol/L.
pub const DEFAULT_NORMALITY: f64 = 0.1;

/// A QC titration method saved with a project: sample, titrant and end points.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
#[serde(default)]
pub struct Method {
    /// Sample of product, g.
    pub sample_g: f64,
    /// Titrant library id; none chooses HCl for a product at pH 7 or above, NaOH below.
    pub titrant: Option<String>,
    /// Normality of the titrant, mol/L.
    pub normality: f64,
    /// End points, pH, in order; empty means the titrant's defaults.
    pub end_points_ph: Vec<f64>,
    /// In-use sample for the titration factor, mL, if one is wanted.
    pub in_use_sample_ml: Option<f64>,
    /// Carbonated share of the product's free hydroxide, %, if the scenario is wanted.
    pub carbonated_percent: Option<f64>,
}

impl Default for Method {
    fn default() -> Self {
        Self {
            sample_g: DEFAULT_SAMPLE_G,
            titrant: None,
            normality: DEFAULT_NORMALITY,
            end_points_ph: Vec::new(),
            in_use_sample_ml: None,
            carbonated_percent: None,
        }
    }
}

impl Method {
    /// Checks every number of the method against its limits.
    pub fn check(&self) -> Result<(), LimitError> {
        limits::SAMPLE_G.check(self.sample_g)?;
        limits::NORMALITY.check(self.normality)?;
        for &e in &self.end_points_ph {
            limits::END_POINT_PH.check(e)?;
        }
        if let Some(v) = self.in_use_sample_ml {
            limits::IN_USE_SAMPLE_ML.check(v)?;
        }
        if let Some(p) = self.carbonated_percent {
            limits::CARBONATED_PERCENT.check(p)?;
        }
        Ok(())
    }

    /// The titrant's id: the method's own, or the automatic choice for a product at `product_ph`.
    pub fn titrant_id(&self, product_ph: f64) -> &str {
        match &self.titrant {
            Some(id) => id,
            None if product_ph >= 7.0 => AUTO_ACID_TITRANT,
            None => AUTO_BASE_TITRANT,
        }
    }

    /// The titrant for a product at `product_ph`.
    pub fn titrant(&self, library: &Library, product_ph: f64) -> Result<Titrant, QcError> {
        Titrant::find(library, self.titrant_id(product_ph), self.normality)
    }

    /// The request of this method with a curve of `points` points.
    pub fn request(&self, points: usize) -> Request {
        Request {
            sample_g: self.sample_g,
            end_points_ph: self.end_points_ph.clone(),
            points,
            in_use_sample_ml: self.in_use_sample_ml,
            carbonated_percent: self.carbonated_percent,
        }
    }

    /// Predicts this method's titration of a product solved at `product_ph`.
    pub fn predict(
        &self,
        library: &Library,
        constants: &Constants,
        product: &Batch,
        product_ph: f64,
        points: usize,
    ) -> Result<(Titrant, Prediction), QcError> {
        let titrant = self.titrant(library, product_ph)?;
        let prediction = predict(library, constants, product, &titrant, &self.request(points))?;
        Ok((titrant, prediction))
    }
}
