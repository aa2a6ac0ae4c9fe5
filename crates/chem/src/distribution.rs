//! Where a metal is against pH: free, bound to each ligand, and (when settling is on) settled
//! out as solid, each as a share of the metal's total.
//!
//! Each pH of the chart is held fixed, as by acid or base added to hold it, with the recipe's
//! totals and activity coefficients (like the forms on the species chart); the metal balances
//! are closed at every pH, and with settling on the solids above saturation there are taken out
//! first ([`precipitation::precipitate_at_ph`]).

use crate::library::{Library, Species};
use crate::precipitation;
use crate::solver::{self, Composition, Constants, Solution};

/// The name of the free-metal part.
pub const FREE: &str = "free";
/// The name of the part bound as hydroxo complexes.
pub const HYDROXO: &str = "hydroxide";
/// The name of the part settled out as solids.
pub const SETTLED: &str = "settled";

/// The distribution of one metal against pH.
#[derive(Debug, Clone, PartialEq)]
pub struct MetalDistribution {
    /// The metal's ion id.
    pub metal: String,
    /// The parts: [`FREE`], each ligand system id, [`HYDROXO`], and [`SETTLED`] when settling.
    pub parts: Vec<String>,
    /// Per pH: the share of the metal's total in each part (summing to 1).
    pub points: Vec<(f64, Vec<f64>)>,
}

/// The metals some complex of the recipe binds, by ion id, in composition order.
pub fn bound_metals(library: &Library, composition: &Composition) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    for &(ion, m) in &composition.ions {
        if m <= 0.0 {
            continue;
        }
        let binds = library.complexes().iter().any(|c| {
            c.metal == ion
                && match c.ligand {
                    Species::Ion(i) => i == library.hydroxide(),
                    Species::Form { system, .. } => composition
                        .systems
                        .iter()
                        .any(|&(s, t)| s == system && t > 0.0),
                }
        });
        if binds {
            out.push(library.ions()[ion].id.clone());
        }
    }
    out
}

/// The part a complex's ligand falls in: its system id, or [`HYDROXO`].
fn part_of(ligand: &str) -> &str {
    match ligand.split_once('/') {
        Some((system, _)) => system,
        None => HYDROXO,
    }
}

/// The distribution of `metal` (an ion id) over the pH values given; none when the recipe does
/// not hold it.
pub fn metal_distribution(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
    metal: &str,
    phs: impl IntoIterator<Item = f64>,
    settle: bool,
) -> Option<MetalDistribution> {
    let ion = library.ion_index(metal)?;
    let total = composition
        .ions
        .iter()
        .find(|&&(i, _)| i == ion)
        .map(|&(_, m)| m)
        .filter(|&m| m > 0.0)?;
    let mut parts = vec![FREE.to_owned()];
    let mut rows: Vec<(f64, Vec<(String, f64)>)> = Vec::new();
    let mut add = |held: solver::MetalAtPh, settled: Option<f64>| {
        let mut row = vec![(FREE.to_owned(), held.free / total)];
        for (ligand, molality) in &held.complexes {
            let part = part_of(ligand);
            match row.iter_mut().find(|(p, _)| p == part) {
                Some(entry) => entry.1 += molality / total,
                None => row.push((part.to_owned(), molality / total)),
            }
        }
        if let Some(settled) = settled {
            row.push((SETTLED.to_owned(), settled / total));
        }
        for (p, _) in &row {
            if !parts.contains(p) {
                parts.push(p.clone());
            }
        }
        rows.push((held.ph, row));
    };
    let phs: Vec<f64> = phs.into_iter().collect();
    if !settle {
        // One balance for the whole sweep, each pH closing the metals from the one before.
        let held = solver::metal_against_ph(library, constants, composition, solution, ion, phs);
        for h in held {
            add(h, None);
        }
        return Some(finish(metal, parts, rows));
    }
    for ph in phs {
        let p = precipitation::precipitate_at_ph(library, constants, composition, solution, ph);
        let settled: f64 = p
            .formed
            .iter()
            .filter_map(|f| {
                let s = library.solids().iter().find(|s| s.data.id == f.solid)?;
                let count: f64 = s
                    .components
                    .iter()
                    .filter(|(sp, _)| *sp == Species::Ion(ion))
                    .map(|(_, n)| n)
                    .sum();
                Some(count * f.mol_per_kg_water)
            })
            .sum();
        let held =
            solver::metal_against_ph(library, constants, &p.composition, &p.solution, ion, [ph]);
        // All of the metal may have settled out.
        let held = held.into_iter().next().unwrap_or(solver::MetalAtPh {
            ph,
            free: 0.0,
            complexes: Vec::new(),
        });
        add(held, Some(settled));
    }
    Some(finish(metal, parts, rows))
}

/// The distribution from its rows: every part at every pH (0 where a row lacks it).
fn finish(
    metal: &str,
    mut parts: Vec<String>,
    rows: Vec<(f64, Vec<(String, f64)>)>,
) -> MetalDistribution {
    // Hydroxide and the settled part last, so the ligands come in the order first seen.
    for last in [HYDROXO, SETTLED] {
        if let Some(i) = parts.iter().position(|p| p == last) {
            let p = parts.remove(i);
            parts.push(p);
        }
    }
    let points = rows
        .into_iter()
        .map(|(ph, row)| {
            let shares = parts
                .iter()
                .map(|p| row.iter().find(|(q, _)| q == p).map_or(0.0, |(_, x)| *x))
                .collect();
            (ph, shares)
        })
        .collect();
    MetalDistribution {
        metal: metal.to_owned(),
        parts,
        points,
    }
}
