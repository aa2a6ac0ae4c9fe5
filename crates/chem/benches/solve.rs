//! Speed of what keeps the workbench live: one solve, a dose curve, a species chart.
//! Targets (issue 2, 2-core machine, release): solve < 5 µs, 512-point curve < 0.5 ms,
//! 400-point species chart < 0.2 ms. Results go in docs/performance.md.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use saltwise_chem::curve::Doser;
use saltwise_chem::solver::{self, fractions_against_ph};
use saltwise_chem::{Conditions, Constants, Library, Recipe};

/// Twelve ingredients, three polyprotic systems (citric, phosphoric, carbonic) and four more.
fn twelve_ingredients() -> Recipe {
    let items = [
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
    ];
    Recipe::in_grams(&items)
}

fn benches(c: &mut Criterion) {
    let lib = Library::built_in().expect("built-in library");
    let constants = Constants::new(&lib, Conditions::default());
    let batch = twelve_ingredients().batch(&lib).expect("valid recipe");
    let composition = batch.composition(&lib).expect("water");
    c.bench_function("solve 12 ingredients, 3 polyprotic, Davies", |b| {
        b.iter(|| solver::solve(&constants, black_box(&composition), None));
    });
    let doser = Doser::new(&lib, &constants, &batch, "sodium_hydroxide_50").expect("adjuster");
    c.bench_function("dose curve 512 points", |b| {
        b.iter(|| doser.curve(black_box(20.0), 512))
    });
    let citric = lib.system_index("citric").expect("citric");
    c.bench_function("species chart 400 points", |b| {
        b.iter(|| {
            fractions_against_ph(
                &constants,
                citric,
                black_box(0.1),
                (0..400).map(|i| f64::from(i) * 14.0 / 399.0),
            )
        });
    });
    c.bench_function("constants at a new temperature", |b| {
        b.iter(|| {
            Constants::new(
                &lib,
                Conditions {
                    temp_c: black_box(37.0),
                    ..Conditions::default()
                },
            )
        });
    });
}

criterion_group!(solve, benches);
criterion_main!(solve);
