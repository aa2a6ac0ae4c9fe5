//! Species named in the library (ions and forms of systems), and the complexes, solids and
//! Pitzer parameters that refer to them, resolved to indices and checked.

use super::model::{Complex, PitzerData, PitzerPair, Solid};
use super::{HYDROXIDE, Library};
use crate::error::LibraryError;

/// A dissolved species: a library ion, or one form of a system.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Species {
    /// An ion by index into [`Library::ions`].
    Ion(usize),
    /// A form of a system: `form` protons removed from the fully protonated form.
    Form {
        /// Index into [`Library::systems`].
        system: usize,
        /// Protons removed.
        form: usize,
    },
}

/// A complex with its metal and ligand resolved.
#[derive(Debug, Clone, PartialEq)]
pub struct ResolvedComplex {
    /// The complex as written.
    pub data: Complex,
    /// The metal ion's index.
    pub metal: usize,
    /// The ligand: hydroxide or a form of a system.
    pub ligand: Species,
    /// Charge of the complex.
    pub charge: i32,
}

/// A solid with its dissolved components resolved.
#[derive(Debug, Clone, PartialEq)]
pub struct ResolvedSolid {
    /// The solid as written.
    pub data: Solid,
    /// Each component species with its count per formula unit.
    pub components: Vec<(Species, f64)>,
}

/// Pitzer parameters resolved to species.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct PitzerTable {
    /// Cation, anion and their parameters.
    pub pairs: Vec<(Species, Species, PitzerPair)>,
    /// Two ions of the same sign and their θ.
    pub mixing: Vec<(Species, Species, f64)>,
    /// Two ions of the same sign, one of the other sign, and their ψ.
    pub triples: Vec<(Species, Species, Species, f64)>,
}

impl Library {
    /// The species an id names: an ion id, or `SYSTEM/FORM`.
    pub fn species(&self, id: &str) -> Option<Species> {
        if let Some((system, form)) = id.split_once('/') {
            let system = self.system_index(system)?;
            let form: usize = form.parse().ok()?;
            (form <= self.systems()[system].pka.len()).then_some(Species::Form { system, form })
        } else {
            self.ion_index(id).map(Species::Ion)
        }
    }

    /// The id of a species: the ion's id, or `SYSTEM/FORM`.
    pub fn species_id(&self, species: Species) -> String {
        match species {
            Species::Ion(i) => self.ions()[i].id.clone(),
            Species::Form { system, form } => format!("{}/{form}", self.systems()[system].id),
        }
    }

    /// The charge of a species.
    pub fn species_charge(&self, species: Species) -> i32 {
        match species {
            Species::Ion(i) => self.ions()[i].charge,
            Species::Form { system, form } => {
                self.systems()[system].charge_of_fully_protonated - form as i32
            }
        }
    }

    /// Complexes and ion pairs, in library order.
    pub fn complexes(&self) -> &[ResolvedComplex] {
        &self.complexes
    }

    /// Solids whose saturation is reported, in library order.
    pub fn solids(&self) -> &[ResolvedSolid] {
        &self.solids
    }

    /// The Pitzer parameters.
    pub fn pitzer(&self) -> &PitzerTable {
        &self.pitzer
    }

    /// Index of an ion by id.
    pub fn ion_index(&self, id: &str) -> Option<usize> {
        self.ion_by_id.get(id).copied()
    }

    /// Checks and adds complexes, solids and Pitzer parameters.
    pub(super) fn add_speciation(
        &mut self,
        complexes: Vec<Complex>,
        solids: Vec<Solid>,
        pitzer: PitzerData,
    ) -> Result<(), LibraryError> {
        for c in complexes {
            let resolved = self.resolve_complex(c)?;
            self.complexes.push(resolved);
        }
        for s in solids {
            let resolved = self.resolve_solid(s)?;
            self.solids.push(resolved);
        }
        for p in pitzer.pairs {
            let label = format!("{}–{}", p.cation, p.anion);
            let cation = self.named(&label, &p.cation)?;
            let anion = self.named(&label, &p.anion)?;
            if self.species_charge(cation) <= 0 || self.species_charge(anion) >= 0 {
                return Err(invalid_pitzer(&label, "a pair is a cation then an anion"));
            }
            if [p.beta0, p.beta1, p.beta2, p.c_phi]
                .iter()
                .any(|v| !v.is_finite() || v.abs() > 100.0)
            {
                return Err(invalid_pitzer(
                    &label,
                    "parameters must be finite and under 100",
                ));
            }
            sourced(&label, &p.source)?;
            self.pitzer.pairs.push((cation, anion, p));
        }
        for m in pitzer.mixing {
            let label = format!("θ {}–{}", m.ions.0, m.ions.1);
            let a = self.named(&label, &m.ions.0)?;
            let b = self.named(&label, &m.ions.1)?;
            self.same_sign(&label, a, b)?;
            finite(&label, m.theta)?;
            sourced(&label, &m.source)?;
            self.pitzer.mixing.push((a, b, m.theta));
        }
        for t in pitzer.triples {
            let label = format!("ψ {}–{}–{}", t.ions.0, t.ions.1, t.with);
            let a = self.named(&label, &t.ions.0)?;
            let b = self.named(&label, &t.ions.1)?;
            let c = self.named(&label, &t.with)?;
            self.same_sign(&label, a, b)?;
            if self.species_charge(a).signum() == self.species_charge(c).signum() {
                return Err(invalid_pitzer(
                    &label,
                    "the third ion must have the other sign",
                ));
            }
            finite(&label, t.psi)?;
            sourced(&label, &t.source)?;
            self.pitzer.triples.push((a, b, c, t.psi));
        }
        Ok(())
    }

    fn resolve_complex(&self, c: Complex) -> Result<ResolvedComplex, LibraryError> {
        let bad = |m: &str| invalid("complex", &c.id, m);
        if self.complexes.iter().any(|k| k.data.id == c.id) {
            return Err(bad("the id is used twice"));
        }
        let metal = self
            .ion_index(&c.metal)
            .filter(|&i| !self.is_proton_ion(i) && self.ions()[i].charge > 0)
            .ok_or_else(|| bad(&format!("metal '{}' is not a known cation", c.metal)))?;
        let ligand = match self.species(&c.ligand) {
            Some(Species::Ion(i)) if self.ions()[i].id == HYDROXIDE => Species::Ion(i),
            Some(f @ Species::Form { .. }) if self.species_charge(f) <= 0 => f,
            _ => {
                return Err(bad(&format!(
                    "ligand '{}' must be 'hydroxide' or an uncharged or negative form SYSTEM/FORM",
                    c.ligand
                )));
            }
        };
        let hydroxo = matches!(ligand, Species::Ion(_));
        if c.ligand_count == 0 || c.ligand_count > 4 || (c.ligand_count > 1 && !hydroxo) {
            return Err(bad(&format!(
                "ligand_count {} is not allowed: 1 for any ligand, up to 4 for 'hydroxide'",
                c.ligand_count
            )));
        }
        if !(-5.0..=60.0).contains(&c.log_k) {
            return Err(bad(&format!("log_k {} is outside −5…60", c.log_k)));
        }
        if !(0.0..=5.0).contains(&c.ionic_strength) {
            return Err(bad("ionic_strength must be between 0 and 5 mol/kg water"));
        }
        if !c.dh_kj_mol.is_finite() || c.dh_kj_mol.abs() > 1000.0 {
            return Err(bad("dh_kj_mol must be finite and under 1000 in size"));
        }
        if c.source.trim().is_empty() {
            return Err(bad("every complex needs the source of its constant"));
        }
        let charge = self.ions()[metal].charge
            + self.species_charge(ligand) * i32::try_from(c.ligand_count).unwrap_or(1);
        Ok(ResolvedComplex {
            data: c,
            metal,
            ligand,
            charge,
        })
    }

    fn resolve_solid(&self, s: Solid) -> Result<ResolvedSolid, LibraryError> {
        let bad = |m: &str| invalid("solid", &s.id, m);
        if self.solids.iter().any(|k| k.data.id == s.id) {
            return Err(bad("the id is used twice"));
        }
        let mut components = Vec::new();
        let mut charge = 0;
        for (id, count) in &s.components {
            let sp = self
                .species(id)
                .ok_or_else(|| bad(&format!("component '{id}' is not an ion or SYSTEM/FORM")))?;
            if *count == 0 {
                return Err(bad("a component count must be 1 or more"));
            }
            charge += self.species_charge(sp) * *count as i32;
            components.push((sp, f64::from(*count)));
        }
        if components.is_empty() || charge != 0 {
            return Err(bad("its components must be given and sum to charge 0"));
        }
        if !(-120.0..=10.0).contains(&s.log_ksp) || !s.dh_kj_mol.is_finite() {
            return Err(bad("log_ksp must be between −120 and 10 and ΔH° finite"));
        }
        if s.source.trim().is_empty() {
            return Err(bad("every solid needs the source of its constant"));
        }
        if !s.formula.is_empty() && crate::formula::Formula::parse(&s.formula).is_err() {
            return Err(bad(&format!(
                "its formula '{}' cannot be read (write it like CaCO3 or CaSO4·2H2O)",
                s.formula
            )));
        }
        Ok(ResolvedSolid {
            data: s,
            components,
        })
    }

    fn named(&self, label: &str, id: &str) -> Result<Species, LibraryError> {
        self.species(id)
            .ok_or_else(|| invalid_pitzer(label, &format!("'{id}' is not an ion or SYSTEM/FORM")))
    }

    fn same_sign(&self, label: &str, a: Species, b: Species) -> Result<(), LibraryError> {
        let (za, zb) = (self.species_charge(a), self.species_charge(b));
        if za == 0 || za.signum() != zb.signum() || a == b {
            return Err(invalid_pitzer(
                label,
                "needs two different ions of the same sign",
            ));
        }
        Ok(())
    }
}

fn finite(label: &str, v: f64) -> Result<(), LibraryError> {
    if v.is_finite() && v.abs() <= 100.0 {
        Ok(())
    } else {
        Err(invalid_pitzer(
            label,
            "the value must be finite and under 100",
        ))
    }
}

fn sourced(label: &str, source: &str) -> Result<(), LibraryError> {
    if source.trim().is_empty() {
        Err(invalid_pitzer(label, "every parameter needs its source"))
    } else {
        Ok(())
    }
}

fn invalid_pitzer(label: &str, message: &str) -> LibraryError {
    invalid("Pitzer parameter", label, message)
}

fn invalid(kind: &'static str, id: &str, message: &str) -> LibraryError {
    LibraryError::Invalid {
        kind,
        id: id.to_owned(),
        message: message.to_owned(),
    }
}
