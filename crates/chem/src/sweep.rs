//! Sweeps of a recipe: pH against dilution with pure water, and pH against temperature.
//!
//! Dilution d is the mass of the diluted liquid over the mass of the product: the recipe with
//! (d − 1) × its mass of water added. Points are spaced evenly on a log scale of d (d ≥ 1);
//! temperatures evenly in °C inside the limits table's range. Each point is a plain solve of that
//! composition, so it agrees with solving the diluted (or re-heated) recipe itself.

use thiserror::Error;

use crate::error::{LimitError, RecipeError};
use crate::library::Library;
use crate::limits;
use crate::recipe::Batch;
use crate::solver::{self, Composition, Conditions, Constants};

/// Largest dilution a sweep may reach.
pub const DILUTION_MAX: f64 = 1e6;

/// Most points of a sweep.
pub const POINTS_MAX: usize = 100_000;

/// Why a sweep cannot be run.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum SweepError {
    /// A dilution below 1, above the maximum or not a number.
    #[error(
        "dilution {value} is not allowed: dilutions are the mass of the diluted liquid over the mass of the product, from 1 to {DILUTION_MAX}"
    )]
    Dilution {
        /// The dilution given.
        value: f64,
    },
    /// A temperature outside the limits table.
    #[error(transparent)]
    Temperature(#[from] LimitError),
    /// Fewer than 2 points or more than the maximum.
    #[error("{points} points is not allowed: a sweep has 2 to {POINTS_MAX} points")]
    Points {
        /// The number of points given.
        points: usize,
    },
    /// A range whose end is not above its start.
    #[error("the range {from}..{to} is empty: the end must be above the start")]
    EmptyRange {
        /// Start of the range.
        from: f64,
        /// End of the range.
        to: f64,
    },
    /// The recipe itself cannot be solved.
    #[error(transparent)]
    Recipe(#[from] RecipeError),
}

/// One point of a sweep.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SweepPoint {
    /// The swept value: dilution (mass ratio) or temperature (°C).
    pub x: f64,
    /// pH there.
    pub ph: f64,
}

fn check_points(points: usize) -> Result<(), SweepError> {
    if (2..=POINTS_MAX).contains(&points) {
        Ok(())
    } else {
        Err(SweepError::Points { points })
    }
}

fn check_dilution(d: f64) -> Result<f64, SweepError> {
    if d.is_finite() && (1.0..=DILUTION_MAX).contains(&d) {
        Ok(d)
    } else {
        Err(SweepError::Dilution { value: d })
    }
}

fn check_range(from: f64, to: f64) -> Result<(), SweepError> {
    if to > from {
        Ok(())
    } else {
        Err(SweepError::EmptyRange { from, to })
    }
}

/// `points` dilutions from `from` to `to`, evenly spaced on a log scale, after checking them.
pub fn dilution_points(from: f64, to: f64, points: usize) -> Result<Vec<f64>, SweepError> {
    check_dilution(from)?;
    check_dilution(to)?;
    check_range(from, to)?;
    check_points(points)?;
    let (l0, l1) = (from.ln(), to.ln());
    Ok((0..points)
        .map(|i| match i {
            0 => from,
            _ if i == points - 1 => to,
            _ => (l0 + (l1 - l0) * i as f64 / (points - 1) as f64).exp(),
        })
        .collect())
}

/// `points` temperatures (°C) from `from_c` to `to_c`, evenly spaced, after checking them.
pub fn temperature_points(from_c: f64, to_c: f64, points: usize) -> Result<Vec<f64>, SweepError> {
    limits::TEMPERATURE_C.check(from_c)?;
    limits::TEMPERATURE_C.check(to_c)?;
    check_range(from_c, to_c)?;
    check_points(points)?;
    Ok((0..points)
        .map(|i| match i {
            _ if i == points - 1 => to_c,
            _ => from_c + (to_c - from_c) * i as f64 / (points - 1) as f64,
        })
        .collect())
}

/// Molal composition of a batch diluted `dilution` times by mass with pure water.
pub fn diluted_composition(
    library: &Library,
    batch: &Batch,
    dilution: f64,
) -> Result<Composition, SweepError> {
    check_dilution(dilution)?;
    let mut totals = batch.totals.clone();
    totals.water_kg += (dilution - 1.0) * batch.total_mass_g * 1e-3;
    Ok(totals.composition(library).ok_or(RecipeError::NoWater)?)
}

/// pH of a batch against dilution with water, `points` dilutions log-spaced from `from` to `to`.
pub fn dilution_sweep(
    library: &Library,
    constants: &Constants,
    batch: &Batch,
    from: f64,
    to: f64,
    points: usize,
) -> Result<Vec<SweepPoint>, SweepError> {
    // Every point takes the activity model the first (least diluted) point chose.
    let mut activity = constants.conditions.activity;
    dilution_points(from, to, points)?
        .into_iter()
        .map(|d| {
            let c = diluted_composition(library, batch, d)?;
            let s = solver::solve_as(constants, &c, None, activity);
            activity = s.activity;
            Ok(SweepPoint { x: d, ph: s.ph })
        })
        .collect()
}

/// pH of a batch against temperature (°C), `points` evenly from `from_c` to `to_c`.
pub fn temperature_sweep(
    library: &Library,
    conditions: Conditions,
    batch: &Batch,
    from_c: f64,
    to_c: f64,
    points: usize,
) -> Result<Vec<SweepPoint>, SweepError> {
    let composition = batch.composition(library)?;
    // Every point takes the activity model the first point chose.
    let mut activity = conditions.activity;
    Ok(temperature_points(from_c, to_c, points)?
        .into_iter()
        .map(|temp_c| {
            let constants = Constants::new(
                library,
                Conditions {
                    temp_c,
                    ..conditions
                },
            );
            let s = solver::solve_as(&constants, &composition, None, activity);
            activity = s.activity;
            SweepPoint {
                x: temp_c,
                ph: s.ph,
            }
        })
        .collect())
}
