//! Reserve acidity and alkalinity, and the extreme-pH screening indicator built on them.
//!
//! Young, How, Walker & Worth, Toxicology in Vitro 2 (1988) 19–26 (from memory): acid reserve =
//! g NaOH per 100 g product to reach pH 4; alkaline reserve = g of NaOH-equivalent acid per
//! 100 g to reach pH 10; the indicator flags pH − acid reserve/12 ≤ −0.5 or
//! pH + alkaline reserve/12 ≥ 14.5. A screening indicator only, never a classification.

use serde::Serialize;

use crate::curve::Doser;
use crate::error::DoseError;
use crate::hazard::Caution;
use crate::library::Library;
use crate::recipe::Batch;
use crate::solver::Constants;

/// pH the acid reserve titrates to.
pub const ACID_END_PH: f64 = 4.0;
/// pH the alkaline reserve titrates to.
pub const ALKALINE_END_PH: f64 = 10.0;
/// Molar mass of NaOH used for NaOH equivalents, g/mol (from the standard atomic weights).
const NAOH_G_PER_MOL: f64 = 39.997;

/// Which side of neutral a reserve is measured on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Side {
    /// Acid reserve: NaOH to pH 4.
    Acid,
    /// Alkaline reserve: acid to pH 10.
    Alkaline,
}

/// A reserve and the screening indicator computed from it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Reserve {
    /// Acid or alkaline.
    pub side: Side,
    /// The product's pH.
    pub ph: f64,
    /// g NaOH (or NaOH-equivalent acid) per 100 g product.
    pub g_naoh_per_100g: f64,
    /// pH − reserve/12 (acid) or pH + reserve/12 (alkaline).
    pub indicator: f64,
    /// Whether the indicator passes the screening threshold (−0.5 or 14.5).
    pub flagged: bool,
}

/// The reserve of a batch at pH `ph`: acid below pH 4, alkaline above pH 10, none between.
pub fn reserve(
    library: &Library,
    constants: &Constants,
    batch: &Batch,
    ph: f64,
) -> Result<Option<Reserve>, DoseError> {
    let per_100g = |g: f64| 100.0 * g / batch.total_mass_g.max(f64::MIN_POSITIVE);
    if ph < ACID_END_PH {
        let d =
            Doser::new(library, constants, batch, "sodium_hydroxide")?.to_target(ACID_END_PH)?;
        let r = per_100g(d.amount_g);
        let indicator = ph - r / 12.0;
        Ok(Some(Reserve {
            side: Side::Acid,
            ph,
            g_naoh_per_100g: r,
            indicator,
            flagged: indicator <= threshold(Side::Acid),
        }))
    } else if ph > ALKALINE_END_PH {
        let acid = "hydrochloric_acid_36";
        let d = Doser::new(library, constants, batch, acid)?.to_target(ALKALINE_END_PH)?;
        let e = library
            .entry(acid)
            .ok_or_else(|| DoseError::NotAnAdjuster {
                adjuster: acid.into(),
            })?;
        let mol = d.amount_g * e.ingredient.assay / e.molar_mass_g_per_mol;
        let r = per_100g(mol * NAOH_G_PER_MOL);
        let indicator = ph + r / 12.0;
        Ok(Some(Reserve {
            side: Side::Alkaline,
            ph,
            g_naoh_per_100g: r,
            indicator,
            flagged: indicator >= threshold(Side::Alkaline),
        }))
    } else {
        Ok(None)
    }
}

/// The indicator's threshold: −0.5 for the acid side, 14.5 for the alkaline side.
pub fn threshold(side: Side) -> f64 {
    match side {
        Side::Acid => -0.5,
        Side::Alkaline => 14.5,
    }
}

/// The caution that goes with a reserve, in plain words.
pub fn caution_text(r: &Reserve) -> String {
    let how = match r.side {
        Side::Acid => format!(
            "sodium hydroxide into an acid product, to pH {ACID_END_PH}: {:.2} g NaOH per 100 g",
            r.g_naoh_per_100g
        ),
        Side::Alkaline => format!(
            "acid into an alkaline product, to pH {ALKALINE_END_PH}: {:.2} g NaOH-equivalent per 100 g",
            r.g_naoh_per_100g
        ),
    };
    format!(
        "Titrated with {how}; screening value {:.1}; threshold {} ({}). This is a screening \
         indicator (Young et al. 1988), not a classification: classification follows the \
         applicable regulations and test data.",
        r.indicator,
        threshold(r.side),
        if r.flagged {
            "at or past the threshold that points to corrosive"
        } else {
            "short of the threshold that points to corrosive"
        }
    )
}

/// The reserve as a caution for a cautions list.
pub fn caution(r: &Reserve) -> Caution {
    let title = match r.side {
        Side::Acid => "Acid reserve",
        Side::Alkaline => "Alkaline reserve",
    };
    Caution {
        title: title.into(),
        text: caution_text(r),
    }
}
