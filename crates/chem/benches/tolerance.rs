//! Speed of the tolerance band: 1000 seeded samples of a 12-line recipe, every line ±1 %, two
//! assay ranges, with the sensitivity ranking. Target (issue 8, release): under 0.5 s.

use std::hint::black_box;

mod recipes;

use criterion::{Criterion, criterion_group, criterion_main};
use recipes::twelve_ingredients;
use saltwise_chem::tolerance::{Tolerances, band};
use saltwise_chem::{Conditions, Constants, Library};

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
