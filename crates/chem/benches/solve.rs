//! Speed of what keeps the workbench live: one solve, a dose curve, a species chart.
//! Targets (issue 2, 2-core machine, release): solve < 5 µs, 512-point curve < 0.5 ms,
//! 400-point species chart < 0.2 ms; with Ca, Mg and two chelants (issue 9): solve < 10 µs,
//! 512-point curve < 2 ms. Results go in docs/performance.md.

use std::hint::black_box;

mod recipes;

use criterion::{Criterion, criterion_group, criterion_main};
use recipes::{twelve_ingredients, twelve_with_hardness};
use saltwise_chem::curve::Doser;
use saltwise_chem::solver::{self, fractions_against_ph};
use saltwise_chem::{Conditions, Constants, Library};

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
    let davies = Constants::new(
        &lib,
        Conditions {
            activity: saltwise_chem::ActivityModel::Davies,
            ..Conditions::default()
        },
    );
    let hard = twelve_with_hardness().batch(&lib).expect("valid recipe");
    let hard_composition = hard.composition(&lib).expect("water");
    c.bench_function(
        "solve 12 ingredients with Ca, Mg, EDTA and citrate, Davies",
        |b| {
            b.iter(|| solver::solve(&davies, black_box(&hard_composition), None));
        },
    );
    let hard_doser = Doser::new(&lib, &davies, &hard, "sodium_hydroxide_50").expect("adjuster");
    c.bench_function("dose curve 512 points with Ca, Mg, EDTA and citrate", |b| {
        b.iter(|| hard_doser.curve(black_box(20.0), 512))
    });
    let pitzer = Constants::new(
        &lib,
        Conditions {
            activity: saltwise_chem::ActivityModel::Pitzer,
            ..Conditions::default()
        },
    );
    c.bench_function(
        "solve 12 ingredients with Ca, Mg, EDTA and citrate, Pitzer",
        |b| {
            b.iter(|| solver::solve(&pitzer, black_box(&hard_composition), None));
        },
    );
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
