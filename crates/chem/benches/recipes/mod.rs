//! The recipe the chemistry benchmarks share: twelve ingredients, three polyprotic systems
//! (citric, phosphoric, carbonic) and four more.

use saltwise_chem::Recipe;

/// Twelve ingredients, three polyprotic systems (citric, phosphoric, carbonic) and four more.
pub fn twelve_ingredients() -> Recipe {
    Recipe::in_grams(&[
        ("water", 850.0),
        ("citric_acid_monohydrate", 8.0),
        ("trisodium_citrate_dihydrate", 6.0),
        ("potassium_dihydrogen_phosphate", 3.0),
        ("disodium_hydrogen_phosphate", 2.0),
        ("sodium_bicarbonate", 1.5),
        ("sodium_benzoate", 2.0),
        ("lactic_acid_88", 1.0),
        ("sodium_chloride", 5.0),
        ("potassium_chloride", 1.0),
        ("glycine", 0.5),
        ("sodium_sulfate", 1.0),
    ])
}

/// Twelve ingredients with calcium, magnesium and two chelants (EDTA, citrate): an invented
/// hard-water dish liquid base.
#[allow(dead_code, reason = "each benchmark file uses some of the recipes")]
pub fn twelve_with_hardness() -> Recipe {
    Recipe::in_grams(&[
        ("water", 900.0),
        ("calcium_chloride_dihydrate", 0.6),
        ("magnesium_sulfate_heptahydrate", 0.5),
        ("tetrasodium_edta_39", 8.0),
        ("trisodium_citrate_dihydrate", 10.0),
        ("citric_acid_monohydrate", 2.0),
        ("sodium_carbonate", 3.0),
        ("sodium_bicarbonate", 1.0),
        ("sodium_chloride", 5.0),
        ("potassium_chloride", 1.0),
        ("disodium_hydrogen_phosphate", 1.0),
        ("sodium_benzoate", 2.0),
    ])
}
