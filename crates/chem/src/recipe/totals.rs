//! Moles of every system and ion a batch holds, and the molal composition they give the solver.

use crate::formula::WATER_MOLAR_MASS_G_PER_MOL;
use crate::library::{Library, ResolvedRelease};
use crate::solver::Composition;

/// Moles of everything a batch holds, indexed like the library.
#[derive(Debug, Clone, PartialEq)]
pub struct Totals {
    /// Water, kg.
    pub water_kg: f64,
    /// Total mol of each system.
    pub system_mol: Vec<f64>,
    /// Total mol of each ion (hydron and hydroxide included).
    pub ion_mol: Vec<f64>,
    /// Protons in excess of the reference levels, mol.
    pub proton_excess_mol: f64,
}

impl Totals {
    /// Nothing at all.
    pub fn zero(library: &Library) -> Self {
        Self {
            water_kg: 0.0,
            system_mol: vec![0.0; library.systems().len()],
            ion_mol: vec![0.0; library.ions().len()],
            proton_excess_mol: 0.0,
        }
    }

    /// What one gram of an ingredient as supplied brings.
    pub fn per_gram(library: &Library, entry: usize) -> Self {
        let mut t = Self::zero(library);
        t.add(library, entry, 1.0);
        t
    }

    /// Adds a mass (g) of an ingredient as supplied.
    pub fn add(&mut self, library: &Library, entry: usize, mass_g: f64) {
        let e = &library.entries()[entry];
        let substance_mol = mass_g * e.ingredient.assay / e.molar_mass_g_per_mol;
        let water_g = mass_g * (1.0 - e.ingredient.assay)
            + substance_mol * e.water_mol_per_mol * WATER_MOLAR_MASS_G_PER_MOL;
        self.water_kg += water_g * 1e-3;
        self.add_releases(library, entry, substance_mol);
    }

    /// Adds what `substance_mol` mol of an ingredient's named substance releases, without any water.
    pub fn add_releases(&mut self, library: &Library, entry: usize, substance_mol: f64) {
        let e = &library.entries()[entry];
        for r in &e.releases {
            match *r {
                ResolvedRelease::Ion { ion, count } => {
                    self.ion_mol[ion] += count * substance_mol;
                    if ion == library.hydron() {
                        self.proton_excess_mol += count * substance_mol;
                    } else if ion == library.hydroxide() {
                        self.proton_excess_mol -= count * substance_mol;
                    }
                }
                ResolvedRelease::System {
                    system,
                    count,
                    form,
                } => {
                    self.system_mol[system] += count * substance_mol;
                    self.proton_excess_mol -= f64::from(form) * count * substance_mol;
                }
            }
        }
    }

    /// Everything multiplied by `factor` (a part of the batch, in proportion).
    pub fn scaled(&self, factor: f64) -> Self {
        Self {
            water_kg: self.water_kg * factor,
            system_mol: self.system_mol.iter().map(|m| m * factor).collect(),
            ion_mol: self.ion_mol.iter().map(|m| m * factor).collect(),
            proton_excess_mol: self.proton_excess_mol * factor,
        }
    }

    /// Σ z·n, Σ z²·n and Σ |z|·n over the spectator ions, in mol (hydron and hydroxide excluded).
    pub fn spectator_sums(&self, library: &Library) -> [f64; 3] {
        let mut s = [0.0; 3];
        for (i, &mol) in self.ion_mol.iter().enumerate() {
            if mol > 0.0 && !library.is_proton_ion(i) {
                let z = f64::from(library.ions()[i].charge);
                s[0] += z * mol;
                s[1] += z * z * mol;
                s[2] += z.abs() * mol;
            }
        }
        s
    }

    /// Molal totals for the solver; `None` when there is no water.
    pub fn composition(&self, library: &Library) -> Option<Composition> {
        if self.water_kg.partial_cmp(&0.0) != Some(std::cmp::Ordering::Greater) {
            return None;
        }
        let w = self.water_kg;
        let mut c = Composition {
            systems: self
                .system_mol
                .iter()
                .enumerate()
                .filter(|(_, m)| **m > 0.0)
                .map(|(i, m)| (i, m / w))
                .collect(),
            ions: self
                .ion_mol
                .iter()
                .enumerate()
                .filter(|(i, m)| **m > 0.0 && !library.is_proton_ion(*i))
                .map(|(i, m)| (i, m / w))
                .collect(),
            proton_excess: self.proton_excess_mol / w,
            ..Composition::default()
        };
        let [charge, z2, abs_charge] = self.spectator_sums(library);
        c.spectator_charge = charge / w;
        c.spectator_z2 = z2 / w;
        c.spectator_abs_charge = abs_charge / w;
        Some(c)
    }
}
