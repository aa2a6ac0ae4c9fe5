//! The full speciation of a solved state: every ion with its activity coefficient, the
//! complexes, and the saturation index of every solid whose ions are present.

use super::balance::ChargeBalance;
use super::layout::{self, H, OH};
use super::{Composition, Constants, Solution};
use crate::library::Library;

/// One free ion or form as the activity model treats it.
#[derive(Debug, Clone, PartialEq)]
pub struct IonAmount {
    /// Library ion id, `SYSTEM/FORM`, a complex id, or `background` for charge given without an ion.
    pub id: String,
    /// Charge.
    pub charge: i32,
    /// Molality, mol/kg water.
    pub molality: f64,
    /// Activity coefficient.
    pub gamma: f64,
    /// Whether γ came from the charge-based estimate (no Pitzer parameters for it).
    pub fallback: bool,
}

/// One complex and its molality.
#[derive(Debug, Clone, PartialEq)]
pub struct ComplexAmount {
    /// Library complex id.
    pub id: String,
    /// The metal ion's id.
    pub metal: String,
    /// The ligand: `hydroxide` or `SYSTEM/FORM`.
    pub ligand: String,
    /// Charge of the complex.
    pub charge: i32,
    /// Molality, mol/kg water.
    pub molality: f64,
}

/// The saturation of one solid.
#[derive(Debug, Clone, PartialEq)]
pub struct Saturation {
    /// Mineral or chemical name.
    pub solid: String,
    /// log10(ion activity product / Ksp): above 0 the solution is supersaturated.
    pub saturation_index: f64,
}

/// Everything the activity model and the complexes give at a solved state.
#[derive(Debug, Clone, PartialEq)]
pub struct Speciation {
    /// Every free ion and form (and neutral form) with molality and γ.
    pub ions: Vec<IonAmount>,
    /// Complexes and ion pairs taking part.
    pub complexes: Vec<ComplexAmount>,
    /// Solids whose every component is present.
    pub saturation: Vec<Saturation>,
    /// Osmotic coefficient, under the Pitzer model.
    pub osmotic: Option<f64>,
}

impl Speciation {
    /// Ids of the charged species whose activity came from the fallback estimate.
    pub fn fallback_ions(&self) -> Vec<String> {
        self.ions
            .iter()
            .filter(|i| i.fallback)
            .map(|i| i.id.clone())
            .collect()
    }

    /// Free molality of an ion by id (0 when absent).
    pub fn free(&self, id: &str) -> f64 {
        self.ions
            .iter()
            .find(|i| i.id == id)
            .map_or(0.0, |i| i.molality)
    }

    /// Saturation index of a solid by id, when its components are present.
    pub fn saturation_index(&self, solid: &str) -> Option<f64> {
        self.saturation
            .iter()
            .find(|s| s.solid == solid)
            .map(|s| s.saturation_index)
    }
}

/// One metal at one pH: its free molality and, for each complex of it, the ligand's id and the
/// complex's molality.
#[derive(Debug, Clone, PartialEq)]
pub struct MetalAtPh {
    /// The pH.
    pub ph: f64,
    /// Free molality of the metal, mol/kg water.
    pub free: f64,
    /// Ligand id (`SYSTEM/FORM` or `hydroxide`) and molality of each complex of the metal.
    pub complexes: Vec<(String, f64)>,
}

/// How an ion (library index) is held at each pH given, with the coefficients of a solved state
/// kept and the metal balances closed from one pH to the next (each from the one before); the
/// free ion alone when no complex binds it.
pub fn metal_against_ph(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
    ion: usize,
    phs: impl IntoIterator<Item = f64>,
) -> Vec<MetalAtPh> {
    let mut model = ChargeBalance::at_solution(constants, composition, solution);
    let (layout, binding, _) = model.parts();
    let Some(slot) = layout.ions.iter().position(|&i| i == ion) else {
        return Vec::new();
    };
    let position = layout.ion(slot);
    let own: Vec<(usize, String)> = binding
        .complexes
        .iter()
        .enumerate()
        .filter(|(_, b)| constants.complexes[b.constant].metal == ion)
        .map(|(k, b)| {
            let ligand = library.species_id(constants.complexes[b.constant].ligand);
            (layout.complex_start + k, ligand)
        })
        .collect();
    phs.into_iter()
        .map(|ph| {
            let m = model.molalities(ph);
            MetalAtPh {
                ph,
                free: m[position],
                complexes: own.iter().map(|(p, l)| (l.clone(), m[*p])).collect(),
            }
        })
        .collect()
}

/// The speciation of a solved composition.
pub fn speciation(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
) -> Speciation {
    let mut model = ChargeBalance::at_solution(constants, composition, solution);
    let m = model.molalities(solution.ph);
    let gamma = model.gammas().to_vec();
    let (layout, binding, pitzer) = model.parts();
    let mut names = vec![String::new(); layout.len()];
    names[H] = library.ions()[constants.hydron].id.clone();
    names[OH] = library.ions()[constants.hydroxide].id.clone();
    for (slot, &ion) in layout.ions.iter().enumerate() {
        names[layout.ion(slot)] = library.ions()[ion].id.clone();
    }
    for (slot, &(system, _)) in composition.systems.iter().enumerate() {
        let forms = layout.form_start[slot]..layout.form_start[slot + 1];
        for (j, name) in names[forms].iter_mut().enumerate() {
            *name = format!("{}/{j}", library.systems()[system].id);
        }
    }
    let mut complexes = Vec::new();
    for (k, b) in binding.complexes.iter().enumerate() {
        let c = &constants.complexes[b.constant];
        let p = layout.complex_start + k;
        let id = library.complexes()[c.index].data.id.clone();
        names[p] = id.clone();
        complexes.push(ComplexAmount {
            id,
            metal: library.ions()[c.metal].id.clone(),
            ligand: library.species_id(c.ligand),
            charge: c.charge,
            molality: m[p],
        });
    }
    names[layout.unattributed] = "background".into();
    let mut ions = Vec::new();
    for (p, name) in names.iter().enumerate() {
        if p >= layout.complex_start && p < layout.unattributed {
            continue;
        }
        if p == layout.unattributed && m[p] <= 1e-12 * (1.0 + composition.spectator_abs_charge) {
            continue;
        }
        ions.push(IonAmount {
            id: name.clone(),
            charge: layout.charges[p],
            molality: m[p],
            gamma: gamma[p],
            fallback: pitzer.is_some_and(|model| layout::is_fallback(model, p)),
        });
    }
    let saturation = indices(library, constants, composition, layout, &m, &gamma);
    let osmotic = pitzer.map(|model| model.evaluate(layout::a_phi(constants), &m).osmotic);
    Speciation {
        ions,
        complexes,
        saturation,
        osmotic,
    }
}

/// The saturation index of every solid whose components are all present, at a solved state.
pub fn saturation(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
) -> Vec<Saturation> {
    let mut model = ChargeBalance::at_solution(constants, composition, solution);
    let m = model.molalities(solution.ph);
    let (layout, _, _) = model.parts();
    indices(library, constants, composition, layout, &m, model.gammas())
}

fn indices(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
    layout: &layout::Layout,
    m: &[f64],
    gamma: &[f64],
) -> Vec<Saturation> {
    let mut saturation = Vec::new();
    'solids: for s in &constants.solids {
        let mut log_iap = 0.0;
        for &(sp, count) in &library.solids()[s.index].components {
            let Some(p) = layout.position(constants, composition, sp) else {
                continue 'solids;
            };
            if m[p] <= 0.0 {
                continue 'solids;
            }
            log_iap += count * (m[p] * gamma[p]).log10();
        }
        saturation.push(Saturation {
            solid: library.solids()[s.index].data.id.clone(),
            saturation_index: log_iap - s.log_ksp,
        });
    }
    saturation
}
