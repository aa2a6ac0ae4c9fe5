//! A recipe by mass: lines of ingredients with amounts, q.s. water, and the molal totals they give.

use std::fmt;

use serde::{Deserialize, Serialize};

use crate::error::RecipeError;
use crate::library::{Library, ResolvedRelease, WATER, WATER_G_PER_MOL};
use crate::solver::Composition;

/// The unit of an amount.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum Unit {
    /// Grams of the ingredient as supplied.
    #[serde(rename = "g")]
    Gram,
    /// Kilograms of the ingredient as supplied.
    #[serde(rename = "kg")]
    Kilogram,
    /// Milligrams of the ingredient as supplied.
    #[serde(rename = "mg")]
    Milligram,
    /// Moles of the named substance (the water its assay implies comes with it).
    #[serde(rename = "mol")]
    Mole,
    /// Percent by mass of the whole batch (% w/w).
    #[serde(rename = "percent")]
    Percent,
}

impl Unit {
    /// The unit's symbol.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Gram => "g",
            Self::Kilogram => "kg",
            Self::Milligram => "mg",
            Self::Mole => "mol",
            Self::Percent => "%",
        }
    }

    /// Every unit, in menu order.
    pub const ALL: [Self; 5] = [
        Self::Gram,
        Self::Kilogram,
        Self::Milligram,
        Self::Mole,
        Self::Percent,
    ];
}

/// An amount with its unit.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Amount {
    /// The number.
    pub value: f64,
    /// The unit.
    pub unit: Unit,
}

impl Amount {
    /// Grams.
    pub fn grams(value: f64) -> Self {
        Self {
            value,
            unit: Unit::Gram,
        }
    }

    /// Parses `20g`, `1.5 kg`, `250mg`, `0.1mol` or `2%`.
    pub fn parse(text: &str) -> Result<Self, String> {
        let t = text.trim();
        const UNITS: [(&str, Unit); 5] = [
            ("mol", Unit::Mole),
            ("kg", Unit::Kilogram),
            ("mg", Unit::Milligram),
            ("g", Unit::Gram),
            ("%", Unit::Percent),
        ];
        let Some((num, unit)) = UNITS
            .iter()
            .find_map(|(sym, u)| t.strip_suffix(sym).map(|n| (n.trim(), *u)))
        else {
            let tail: String = t
                .chars()
                .rev()
                .take_while(|c| c.is_alphabetic())
                .collect::<Vec<_>>()
                .into_iter()
                .rev()
                .collect();
            return Err(if tail.is_empty() {
                format!("'{t}' has no unit; write g, kg, mg, mol or % (e.g. 20g)")
            } else {
                format!("'{tail}' is not a unit; use g, kg, mg, mol or %")
            });
        };
        let value: f64 = num
            .parse()
            .map_err(|_| format!("'{num}' is not a number"))?;
        Ok(Self { value, unit })
    }
}

impl fmt::Display for Amount {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}{}", self.value, self.unit.symbol())
    }
}

/// One line of a recipe.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RecipeLine {
    /// Ingredient id.
    pub ingredient: String,
    /// Amount.
    pub amount: Amount,
    /// Whether the line counts (off for a what-if without deleting it).
    #[serde(default = "yes")]
    pub enabled: bool,
}

fn yes() -> bool {
    true
}

impl RecipeLine {
    /// A line of an ingredient in grams.
    pub fn grams(ingredient: &str, mass_g: f64) -> Self {
        Self {
            ingredient: ingredient.to_owned(),
            amount: Amount::grams(mass_g),
            enabled: true,
        }
    }
}

/// A recipe: ingredient lines and an optional q.s. water target for the batch.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct Recipe {
    /// The lines, in the order the formulator wrote them.
    pub lines: Vec<RecipeLine>,
    /// Batch size in g when water is added q.s. to it.
    #[serde(default)]
    pub qs_to_g: Option<f64>,
}

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
            + substance_mol * e.water_mol_per_mol * WATER_G_PER_MOL;
        self.water_kg += water_g * 1e-3;
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

/// One recipe line resolved to masses and moles.
#[derive(Debug, Clone, PartialEq)]
pub struct LineMass {
    /// Library index of the ingredient.
    pub entry: usize,
    /// Mass as supplied, g (0 when the line is off).
    pub mass_g: f64,
    /// Mol of the named substance.
    pub substance_mol: f64,
    /// Water the line brings, g.
    pub water_g: f64,
    /// Whether the line counts.
    pub enabled: bool,
}

/// A recipe resolved into a batch: masses, water and molal totals.
#[derive(Debug, Clone, PartialEq)]
pub struct Batch {
    /// One per recipe line, in order.
    pub lines: Vec<LineMass>,
    /// Water added q.s., g.
    pub qs_water_g: f64,
    /// Mass of the whole batch, g.
    pub total_mass_g: f64,
    /// Everything the batch holds.
    pub totals: Totals,
}

impl Batch {
    /// Molal totals for the solver.
    pub fn composition(&self, library: &Library) -> Result<Composition, RecipeError> {
        self.totals.composition(library).ok_or(RecipeError::NoWater)
    }

    /// Molality (mol/kg water) of the named substance of line `i`.
    pub fn line_molality(&self, i: usize) -> f64 {
        self.lines.get(i).map_or(0.0, |l| {
            if self.totals.water_kg > 0.0 {
                l.substance_mol / self.totals.water_kg
            } else {
                0.0
            }
        })
    }
}

impl Recipe {
    /// Resolves the recipe into masses and molal totals.
    pub fn batch(&self, library: &Library) -> Result<Batch, RecipeError> {
        let mut fixed_g = 0.0;
        let mut percent = 0.0;
        let mut resolved = Vec::with_capacity(self.lines.len());
        for line in &self.lines {
            let Some(entry) = library.entry_index(&line.ingredient) else {
                return Err(RecipeError::UnknownIngredient {
                    id: line.ingredient.clone(),
                    suggestions: library.suggest(&line.ingredient),
                });
            };
            let v = line.amount.value;
            if !v.is_finite() {
                return Err(RecipeError::BadAmount {
                    id: line.ingredient.clone(),
                    value: v,
                    problem: "not a finite number",
                });
            }
            if v < 0.0 {
                return Err(RecipeError::BadAmount {
                    id: line.ingredient.clone(),
                    value: v,
                    problem: "negative",
                });
            }
            let e = &library.entries()[entry];
            let grams = e.grams(line.amount);
            if line.enabled {
                match grams {
                    Some(g) => fixed_g += g,
                    None => percent += v,
                }
            }
            resolved.push((entry, grams, line));
        }
        if let Some(qs) = self.qs_to_g
            && (!qs.is_finite() || qs <= 0.0)
        {
            return Err(RecipeError::BadAmount {
                id: "q.s. batch size".into(),
                value: qs,
                problem: if qs.is_finite() {
                    "not above 0"
                } else {
                    "not a finite number"
                },
            });
        }
        let total_g = match self.qs_to_g {
            Some(qs) => qs,
            None if percent > 0.0 && fixed_g == 0.0 => 100.0,
            None if percent >= 100.0 => {
                return Err(RecipeError::BadUnit {
                    id: "recipe".into(),
                    message: format!(
                        "the % w/w lines add up to {percent} %, leaving nothing for the lines in g"
                    ),
                });
            }
            None => fixed_g / (1.0 - percent / 100.0),
        };
        let mut totals = Totals::zero(library);
        let mut lines = Vec::with_capacity(resolved.len());
        let mut used_g = 0.0;
        for (entry, grams, line) in resolved {
            let mass_g = if line.enabled {
                grams.unwrap_or(line.amount.value / 100.0 * total_g)
            } else {
                0.0
            };
            let water_before = totals.water_kg;
            totals.add(library, entry, mass_g);
            used_g += mass_g;
            let e = &library.entries()[entry];
            lines.push(LineMass {
                entry,
                mass_g,
                substance_mol: mass_g * e.ingredient.assay / e.molar_mass_g_per_mol,
                water_g: (totals.water_kg - water_before) * 1e3,
                enabled: line.enabled,
            });
        }
        let qs_water_g = match self.qs_to_g {
            Some(qs) => {
                let rest = qs - used_g;
                if rest < -1e-9 * qs {
                    return Err(RecipeError::OverfullBatch {
                        qs_g: qs,
                        solids_g: used_g,
                    });
                }
                rest.max(0.0)
            }
            None => 0.0,
        };
        if qs_water_g > 0.0 {
            if let Some(w) = library.entry_index(WATER) {
                totals.add(library, w, qs_water_g);
            } else {
                totals.water_kg += qs_water_g * 1e-3;
            }
        }
        if totals.water_kg.partial_cmp(&0.0) != Some(std::cmp::Ordering::Greater) {
            return Err(RecipeError::NoWater);
        }
        Ok(Batch {
            lines,
            qs_water_g,
            total_mass_g: used_g + qs_water_g,
            totals,
        })
    }
}
