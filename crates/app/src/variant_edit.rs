//! Edits of the project's variants and of their ingredient prices, each one undo step, with what
//! was done (or why not) said in the status line.

use saltwise_chem::limits::PRICE_PER_KG;
use saltwise_chem::{RecipeLine, Unit};

use crate::app::Workbench;

/// A discrete change to the variants: one undo step each.
#[derive(Debug, Clone, PartialEq)]
pub enum VariantEdit {
    /// Add a copy of the current variant and make it current.
    CopyCurrent,
    /// Make variant `index` the one shown and edited.
    MakeCurrent(usize),
    /// Give variant `index` a new name.
    Rename {
        /// Variant index.
        index: usize,
        /// The new name.
        name: String,
    },
    /// Remove variant `index` (a project keeps at least one).
    Remove(usize),
    /// Set or clear the current variant's price per kg of one ingredient.
    SetPrice {
        /// Ingredient id.
        ingredient: String,
        /// Price per kg as bought, or `None` for no price.
        price_per_kg: Option<f64>,
    },
    /// Put a designed buffer pair into the current recipe: each ingredient's first line takes
    /// its grams (a new line where there is none) and its other lines go.
    UseDesign {
        /// (ingredient id, grams) of the acid form and of the salt form.
        pair: [(String, f64); 2],
    },
}

impl Workbench {
    /// Makes one variant edit as one undo step.
    pub(crate) fn variant_edit(&mut self, edit: VariantEdit) {
        match edit {
            VariantEdit::CopyCurrent => {
                let mut name = String::new();
                self.doc.edit(|p| {
                    p.copy_current();
                    name = p.variant().name.clone();
                });
                self.messages.status(
                    &format!("New variant “{name}”: a copy of the one before, now current."),
                    false,
                );
            }
            VariantEdit::MakeCurrent(i) => {
                let mut ok = false;
                self.doc.edit(|p| ok = p.set_current(i));
                if ok {
                    // Row numbers now belong to another recipe.
                    self.panels.refused.clear();
                }
            }
            VariantEdit::Rename { index, name } => {
                let name = name.trim().to_owned();
                let mut result = Ok(());
                self.doc.edit(|p| result = p.rename_variant(index, &name));
                match result {
                    Ok(()) => self
                        .messages
                        .status(&format!("Variant renamed “{name}”."), false),
                    Err(why) => self
                        .messages
                        .status(&format!("The variant was not renamed: {why}."), true),
                }
            }
            VariantEdit::Remove(i) => {
                let mut result = Ok(String::new());
                self.doc.edit(|p| {
                    let name = p.variants().get(i).map(|v| v.name.clone());
                    result = p.remove_variant(i).map(|()| name.unwrap_or_default());
                });
                match result {
                    Ok(name) => {
                        self.panels.refused.clear();
                        self.messages.status(
                            &format!("Removed variant “{name}” (Undo brings it back)."),
                            false,
                        );
                    }
                    Err(why) => self
                        .messages
                        .status(&format!("The variant was not removed: {why}."), true),
                }
            }
            VariantEdit::SetPrice {
                ingredient,
                price_per_kg,
            } => {
                if let Some(price) = price_per_kg
                    && let Err(e) = PRICE_PER_KG.check(price)
                {
                    self.messages
                        .status(&crate::messages::sentence(&e.to_string()), true);
                    return;
                }
                self.doc.edit(|p| {
                    let prices = &mut p.variant_mut().prices;
                    match price_per_kg {
                        Some(price) => {
                            prices.insert(ingredient, price);
                        }
                        None => {
                            prices.remove(&ingredient);
                        }
                    }
                });
            }
            VariantEdit::UseDesign { pair } => {
                self.doc.edit(|p| {
                    for (id, grams) in &pair {
                        let lines = &mut p.recipe_mut().lines;
                        match lines.iter().position(|l| l.ingredient == *id) {
                            Some(first) => {
                                lines[first].amount = saltwise_chem::Amount {
                                    value: *grams,
                                    unit: Unit::Gram,
                                };
                                lines[first].enabled = true;
                                let mut k = 0;
                                lines.retain(|l| {
                                    k += 1;
                                    k - 1 == first || l.ingredient != *id
                                });
                            }
                            None => lines.push(RecipeLine::grams(id, *grams)),
                        }
                    }
                });
                self.panels
                    .refused
                    .retain(|name, _| !name.starts_with("Amount of line"));
                self.messages.status(
                    "The designed amounts are in the recipe (Undo takes them out).",
                    false,
                );
            }
        }
    }
}
