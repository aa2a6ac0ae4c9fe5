//! Speed of the tolerance band: 1000 seeded samples of a 12-line recipe, every line ±1 %, two
//! assay ranges, with the sensitivity ranking. Target (issue 8, release): under 0.5 s.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use saltwise_chem::tolerance::{Tolerances, band};
use saltwise_chem::{Conditions, Constants, Library, Recipe};

/// Twelve ingredients, three polyprotic systems and four more (as in the solve benchmark).
fn twelve_ingredients() -> Recipe {
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

fn benches(c: &mut Criterion) {
    let lib = Library::built_in().expect("built-in library");
    let constants = Constants::new(&lib, Conditions::default());
    let recipe = twelve_ingredients();
    let tol = Tolerances {
        all_percent: 1.0,
        per_ingredient: Vec::new(),
        assay: vec![
            ("lactic_acid_88".into(), 0.87, 0.89),
            ("citric_acid_monohydrate".into(), 0.99, 1.0),
        ],
    };
    c.bench_function("tolerance band 1000 samples, 12 lines, Davies", |b| {
        b.iter(|| band(&lib, &constants, black_box(&recipe), &tol, 1000, 7).expect("band"));
    });
}

criterion_group!(group, benches);
criterion_main!(group);
