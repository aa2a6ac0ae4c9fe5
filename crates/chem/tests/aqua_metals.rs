//! Zinc, aluminium and iron(III) as metal ions: their hydrolysis as hydroxo complexes holding
//! one to four OH⁻, their EDTA complexes, and what follows for pH, explanations and scale.

use saltwise_chem::explain::{Effect, explain_ingredient};
use saltwise_chem::precipitation::precipitate;
use saltwise_chem::report::evaluate;
use saltwise_chem::{ActivityModel, Conditions, Constants, Library, Recipe, Report};

fn lib() -> Library {
    Library::built_in().expect("the built-in library loads")
}

fn solve(lib: &Library, lines: &[(&str, f64)], activity: ActivityModel) -> Report {
    let c = Conditions {
        activity,
        ..Conditions::default()
    };
    let report = evaluate(lib, &Recipe::in_grams(lines), c).expect("the recipe solves");
    assert!(report.solution.charge_residual < 1e-10);
    assert!(report.solution.metal_residual < 1e-10);
    report
}

fn complex(report: &Report, id: &str) -> f64 {
    report
        .speciation
        .complexes
        .iter()
        .find(|c| c.id == id)
        .map(|c| c.molality)
        .unwrap_or_else(|| panic!("{id} takes part"))
}

/// The metal's molality as weighed in (per kg of water, crystal water included).
fn weighed(lib: &Library, report: &Report, metal: &str) -> f64 {
    let ion = lib.ion_index(metal).expect("a library ion");
    report
        .composition
        .ions
        .iter()
        .find(|(i, _)| *i == ion)
        .map_or(0.0, |&(_, m)| m)
}

/// log10 of [ML]/([M][L]) at the solved state (molal; in an ideal solution the constant at I = 0).
fn formation_log_k(report: &Report, complex_id: &str, metal: &str, ligand: &str) -> f64 {
    let free = |id: &str| report.speciation.free(id);
    (complex(report, complex_id) / (free(metal) * free(ligand))).log10()
}

/// Total dissolved metal: free ion and every complex it is in.
fn metal_total(report: &Report, metal: &str) -> f64 {
    report.speciation.free(metal)
        + report
            .speciation
            .complexes
            .iter()
            .filter(|c| c.metal == metal)
            .map(|c| c.molality)
            .sum::<f64>()
}

/// In an ideal solution at 25 °C, [M(OH)n]/[M] = *βn / [H⁺]ⁿ: the hydrolysis constants the
/// library converted to the OH⁻ form come back out of a solved state.
fn check_hydrolysis(report: &Report, metal: &str, steps: &[(&str, f64, f64)]) {
    let ph = report.solution.ph;
    let free = report.speciation.free(metal);
    for &(id, n, log_beta_star) in steps {
        let back = (complex(report, id) / free).log10() - n * ph;
        assert!(
            (back - log_beta_star).abs() < 0.005,
            "{id}: log *β {back:.3} against {log_beta_star} at pH {ph:.2}"
        );
    }
}

#[test]
fn zinc_hydrolysis_to_zincate_gives_back_the_published_constants() {
    let lib = lib();
    // 10 mmol ZnSO₄·7H₂O (287.5 g/mol) with 50 mmol NaOH in 1 kg water: pH near 12, where
    // every hydroxo complex is present in measurable amount.
    let r = solve(
        &lib,
        &[
            ("water", 1000.0),
            ("zinc_sulfate_heptahydrate", 2.875),
            ("sodium_hydroxide", 2.0),
        ],
        ActivityModel::Ideal,
    );
    // Baes & Mesmer, The Hydrolysis of Cations (1976), log *βn at 25 °C, I = 0 (from memory).
    check_hydrolysis(
        &r,
        "zinc",
        &[
            ("zinc_hydroxo", 1.0, -8.96),
            ("zinc_dihydroxo", 2.0, -16.9),
            ("zinc_trihydroxo", 3.0, -28.4),
            ("zincate", 4.0, -41.2),
        ],
    );
    // Every zinc atom is somewhere: free, hydroxo or paired with sulfate (none here); the
    // weighed amount is 2.875 g / 287.54 g/mol (IUPAC atomic weights) in 1.00126 kg of water
    // (1000 g and the crystals' 7 × 18.015 g/mol × 0.0100 mol).
    let total = weighed(&lib, &r, "zinc");
    assert!(
        (total - 2.875 / 287.54 / 1.00126).abs() < 1e-4 * total,
        "{total}"
    );
    assert!((metal_total(&r, "zinc") - total).abs() < 1e-9 * total);
}

#[test]
fn aluminium_and_iron_hydrolysis_give_back_the_published_constants() {
    let lib = lib();
    // 2 mmol AlCl₃·6H₂O (241.43 g/mol) with 7 mmol NaOH: pH near 6, in the hydroxo range.
    let al = solve(
        &lib,
        &[
            ("water", 1000.0),
            ("aluminium_chloride_hexahydrate", 0.4829),
            ("sodium_hydroxide", 0.28),
        ],
        ActivityModel::Ideal,
    );
    // Brown & Ekberg, Hydrolysis of Metal Ions (Wiley 2016), log *βn at 25 °C, I = 0, as
    // tabulated in Wikipedia's "Hydrolysis constant" article (read).
    check_hydrolysis(
        &al,
        "aluminium",
        &[
            ("aluminium_hydroxo", 1.0, -4.98),
            ("aluminium_dihydroxo", 2.0, -10.63),
            ("aluminium_trihydroxo", 3.0, -15.66),
            ("aluminate", 4.0, -22.91),
        ],
    );
    // 1 mmol FeCl₃·6H₂O (270.30 g/mol) alone: strongly acidic.
    let fe = solve(
        &lib,
        &[("water", 1000.0), ("iron_iii_chloride_hexahydrate", 0.2703)],
        ActivityModel::Ideal,
    );
    // Iron(III) hydrolysis and solubility at 25 °C, Environ. Sci. Technol. 41 (2007) 6117
    // (abstract read): log *βn at infinite dilution.
    check_hydrolysis(
        &fe,
        "iron_iii",
        &[
            ("iron_iii_hydroxo", 1.0, -2.19),
            ("iron_iii_dihydroxo", 2.0, -5.76),
            ("iron_iii_trihydroxo", 3.0, -14.30),
            ("iron_iii_tetrahydroxo", 4.0, -21.71),
        ],
    );
    // With *β1 = 10^−2.19 and 1 mmol/kg, a weak acid stronger than its own concentration; by
    // hand, first step alone: x² = K·(C − x), x = (−K + √(K² + 4KC))/2 = 8.80 × 10⁻⁴, pH 3.056,
    // and the second step (Fe(OH)₂⁺) lowers it a little further.
    assert!(
        fe.solution.ph > 2.95 && fe.solution.ph < 3.056,
        "pH {}",
        fe.solution.ph
    );
}

#[test]
fn zinc_sulfate_is_explained_as_acidic_and_calcium_chloride_as_neutral() {
    let lib = lib();
    let constants = Constants::new(&lib, Conditions::default());
    let effect = |id: &str| {
        let entry = lib
            .entries()
            .iter()
            .position(|e| e.ingredient.id == id)
            .unwrap_or_else(|| panic!("{id} is in the library"));
        explain_ingredient(&lib, &constants, entry)
    };
    let zinc = effect("zinc_sulfate_heptahydrate");
    let zn = zinc
        .ions
        .iter()
        .find(|i| i.label.starts_with("Zn"))
        .expect("the zinc ion is explained");
    assert_eq!(zn.effect, Effect::Acidifies);
    // pKa of the aqua ion 8.96 (Baes & Mesmer 1976, from memory).
    let pka = -zn.ka.expect("a Ka is given").log10();
    assert!((pka - 8.96).abs() < 0.01, "pKa {pka}");
    assert!(zn.reason.contains("aqua ion"), "{}", zn.reason);
    // Calcium's first hydrolysis (pKa 12.8) is not counted: CaCl₂ is a neutral salt.
    assert_eq!(effect("calcium_chloride").effect, Effect::Neutral);
    // Iron(III) chloride lowers pH strongly.
    let iron = effect("iron_iii_chloride_hexahydrate");
    assert_eq!(iron.effect, Effect::Acidifies);
}

#[test]
fn edta_keeps_iron_dissolved_where_it_would_otherwise_be_far_supersaturated() {
    let lib = lib();
    // 1 mmol FeCl₃·6H₂O, brought near pH 7 with NaOH, with and without 1.5 mmol Na₂H₂EDTA·2H₂O
    // (372.24 g/mol) — a rust-stain remover's situation.
    let without = solve(
        &lib,
        &[
            ("water", 1000.0),
            ("iron_iii_chloride_hexahydrate", 0.2703),
            ("sodium_hydroxide", 0.080),
        ],
        ActivityModel::Davies,
    );
    let with = solve(
        &lib,
        &[
            ("water", 1000.0),
            ("iron_iii_chloride_hexahydrate", 0.2703),
            ("disodium_edta_dihydrate", 0.5584),
            ("sodium_hydroxide", 0.097),
        ],
        ActivityModel::Davies,
    );
    for r in [&without, &with] {
        assert!(
            r.solution.ph > 5.5 && r.solution.ph < 8.5,
            "pH {}",
            r.solution.ph
        );
        let total = weighed(&lib, r, "iron_iii");
        assert!((metal_total(r, "iron_iii") - total).abs() < 1e-9 * total);
    }
    // Ferrihydrite's Ksp (CRC Handbook, from memory, in the library): without a chelant 1 mmol
    // of iron(III) near neutral pH is supersaturated by many orders; FeY⁻ (log K 25.1 at
    // I = 0.1, Martell & Smith as printed in Harris, from memory) holds nearly all of it.
    let si = |r: &Report| {
        r.speciation
            .saturation_index("ferrihydrite")
            .expect("ferrihydrite is reported")
    };
    assert!(si(&without) > 5.0, "SI without EDTA {}", si(&without));
    assert!(si(&with) < si(&without) - 5.0, "SI with EDTA {}", si(&with));
    let bound = complex(&with, "iron_iii_edta") / weighed(&lib, &with, "iron_iii");
    assert!(bound > 0.95, "FeY⁻ holds {bound}");
}

#[test]
fn zinc_hydroxide_precipitates_near_ph_9_and_redissolves_as_zincate_in_strong_alkali() {
    let lib = lib();
    let c = Conditions {
        activity: ActivityModel::Davies,
        ..Conditions::default()
    };
    // 10 mmol ZnSO₄·7H₂O with 20 mmol NaOH (the stoichiometric amount for Zn(OH)₂).
    let near = solve(
        &lib,
        &[
            ("water", 1000.0),
            ("zinc_sulfate_heptahydrate", 2.875),
            ("sodium_hydroxide", 0.8),
        ],
        ActivityModel::Davies,
    );
    let si_near = near
        .speciation
        .saturation_index("zinc_hydroxide")
        .expect("zinc hydroxide is reported");
    assert!(si_near > 0.0, "SI {si_near}");
    let constants = Constants::new(&lib, c);
    let p = precipitate(&lib, &constants, &near.composition, &near.solution);
    assert!(p.converged);
    assert!(p.formed.iter().any(|f| f.solid == "zinc_hydroxide"));
    assert!(p.solution.charge_residual < 1e-10);
    // With 1 mol NaOH per kg, zinc is held as zincate (Baes & Mesmer's *β3 and *β4 put
    // Zn(OH)₄²⁻ above Zn(OH)₃⁻ at [OH⁻] near 1): amphoteric zinc dissolves again.
    let strong = solve(
        &lib,
        &[
            ("water", 1000.0),
            ("zinc_sulfate_heptahydrate", 2.875),
            ("sodium_hydroxide", 40.0),
        ],
        ActivityModel::Davies,
    );
    assert!(complex(&strong, "zincate") > 0.5 * weighed(&lib, &strong, "zinc"));
    let si_strong = strong
        .speciation
        .saturation_index("zinc_hydroxide")
        .expect("zinc hydroxide is reported");
    assert!(si_strong < si_near, "SI {si_strong} against {si_near}");
}

#[test]
fn aluminium_citrate_forms_with_its_measured_constant_brought_to_zero_ionic_strength() {
    let lib = lib();
    // 1 mmol AlCl₃·6H₂O with 5 mmol trisodium citrate dihydrate (294.10 g/mol), ideal solution.
    let r = solve(
        &lib,
        &[
            ("water", 1000.0),
            ("aluminium_chloride_hexahydrate", 0.2414),
            ("trisodium_citrate_dihydrate", 1.4705),
        ],
        ActivityModel::Ideal,
    );
    let log_k = formation_log_k(&r, "aluminium_citrate", "aluminium", "citric/3");
    // log K 8.35 at I = 0.1 (the study's abstract, in the library), to I = 0 by Davies at
    // 25 °C, computed here by hand: A = 0.5091 (Robinson & Stokes, from memory),
    // f(0.1) = √0.1/(1 + √0.1) − 0.03 = 0.21025, Δz² = 9 + 9 − 0: 8.35 + 0.5091 × 0.21025 × 18
    // = 10.277.
    assert!((log_k - 10.277).abs() < 0.01, "log K° {log_k}");
    // Citrate in fivefold excess holds most of the aluminium at the pH it sets (near 7.3, where
    // the hydroxo complexes take the rest).
    let bound = complex(&r, "aluminium_citrate") + complex(&r, "aluminium_hydrogen_citrate");
    assert!(
        bound > 0.75 * weighed(&lib, &r, "aluminium"),
        "bound {bound} at pH {}",
        r.solution.ph
    );
}

#[test]
fn iron_sulfate_pairs_with_its_tabulated_constant_brought_to_zero_ionic_strength() {
    let lib = lib();
    // 1 mmol FeCl₃·6H₂O with 5 mmol Na₂SO₄ (142.04 g/mol), ideal solution (acidic, so sulfate
    // is nearly all SO₄²⁻ and iron mostly free or FeSO₄⁺).
    let r = solve(
        &lib,
        &[
            ("water", 1000.0),
            ("iron_iii_chloride_hexahydrate", 0.2703),
            ("sodium_sulfate", 0.7102),
        ],
        ActivityModel::Ideal,
    );
    let log_k = formation_log_k(
        &r,
        "iron_iii_sulfate_pair",
        "iron_iii",
        "hydrogen_sulfate/1",
    );
    // log β 2.3 at 25 °C and I = 0.1 (Table 3 of the review PMC10943352, read), to I = 0 by
    // Davies by hand: Δz² = 9 + 4 − 1 = 12, 2.3 + 0.5091 × 0.21025 × 12 = 3.584 (A and f(0.1)
    // as in the citrate check above).
    assert!((log_k - 3.584).abs() < 0.01, "log K° {log_k}");
}
