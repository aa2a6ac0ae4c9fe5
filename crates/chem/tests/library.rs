//! The built-in ingredient library: it loads, carries every required ingredient, its molar masses
//! agree with handbook values and every system names its source; and the loader refuses invalid
//! data with a message naming the field and what is allowed.

use saltwise_chem::library::{Ingredient, Ion, LibraryData, Release, System, form_names};
use saltwise_chem::{Library, LibraryError};

/// Ingredient ids the product promises in its built-in library.
const REQUIRED: &[&str] = &[
    "water",
    "sodium_hydroxide",
    "sodium_hydroxide_50",
    "potassium_hydroxide",
    "hydrochloric_acid_36",
    "sulfuric_acid",
    "nitric_acid",
    "acetic_acid",
    "sodium_acetate_trihydrate",
    "citric_acid",
    "citric_acid_monohydrate",
    "trisodium_citrate_dihydrate",
    "potassium_dihydrogen_citrate",
    "lactic_acid_88",
    "sodium_lactate_60",
    "glycolic_acid",
    "malic_acid",
    "tartaric_acid",
    "potassium_hydrogen_tartrate",
    "succinic_acid",
    "gluconic_acid_50",
    "sodium_gluconate",
    "formic_acid",
    "benzoic_acid",
    "sodium_benzoate",
    "sorbic_acid",
    "potassium_sorbate",
    "salicylic_acid",
    "phosphoric_acid_85",
    "sodium_dihydrogen_phosphate",
    "disodium_hydrogen_phosphate",
    "trisodium_phosphate_dodecahydrate",
    "potassium_dihydrogen_phosphate",
    "dipotassium_hydrogen_phosphate",
    "tetrapotassium_pyrophosphate",
    "sodium_carbonate",
    "sodium_bicarbonate",
    "sodium_metasilicate_pentahydrate",
    "boric_acid",
    "borax",
    "potassium_hydrogen_phthalate",
    "ammonia_25",
    "ammonium_chloride",
    "ammonium_acetate",
    "ammonium_sulfate",
    "monoethanolamine",
    "triethanolamine",
    "aminomethyl_propanol",
    "tris",
    "glycine",
    "arginine",
    "disodium_edta_dihydrate",
    "tetrasodium_edta",
    "sodium_hypochlorite_12",
    "sodium_chloride",
    "potassium_chloride",
    "sodium_sulfate",
    "aluminium_chloride_hexahydrate",
    "iron_iii_chloride_hexahydrate",
    "zinc_sulfate_heptahydrate",
];

#[test]
fn built_in_library_loads() {
    let lib = Library::built_in().unwrap();
    assert!(lib.entries().len() >= REQUIRED.len());
    assert!(!lib.systems().is_empty());
}

#[test]
fn every_required_ingredient_is_present() {
    let lib = Library::built_in().unwrap();
    let missing: Vec<&str> = REQUIRED
        .iter()
        .copied()
        .filter(|id| lib.entry(id).is_none())
        .collect();
    assert!(missing.is_empty(), "missing ingredients: {missing:?}");
}

#[test]
fn molar_masses_match_handbook_values() {
    let lib = Library::built_in().unwrap();
    // (ingredient id, handbook molar mass in g/mol); the source of each group is in the comment above it.
    let cases: &[(&str, f64)] = &[
        // CRC Handbook of Chemistry and Physics, from memory:
        ("sodium_chloride", 58.44),
        ("sodium_hydroxide", 40.00),
        ("sodium_carbonate", 105.99),
        ("sodium_bicarbonate", 84.01),
        ("potassium_dihydrogen_phosphate", 136.09),
        ("disodium_hydrogen_phosphate", 141.96),
        ("citric_acid_monohydrate", 210.14),
        ("trisodium_citrate_dihydrate", 294.10),
        ("potassium_hydrogen_phthalate", 204.22),
        ("borax", 381.37),
        ("triethanolamine", 149.19),
        // Harris, Quantitative Chemical Analysis, buffer chapter, from memory:
        ("tris", 121.135),
        ("tris_hydrochloride", 157.596),
        // CRC Handbook of Chemistry and Physics, physical constants of inorganic compounds, from memory:
        ("potassium_chloride", 74.551),
        ("potassium_hydroxide", 56.106),
        ("hydrochloric_acid_36", 36.461),
        ("sulfuric_acid", 98.079),
        ("nitric_acid", 63.013),
        ("phosphoric_acid_85", 97.995),
        ("boric_acid", 61.833),
        ("ammonium_chloride", 53.491),
        ("ammonium_sulfate", 132.14),
        ("sodium_sulfate", 142.04),
        ("dipotassium_hydrogen_phosphate", 174.176),
        ("sodium_dihydrogen_phosphate", 119.977),
        ("ammonia_25", 17.031),
        ("aluminium_chloride_hexahydrate", 241.43),
        // CRC Handbook of Chemistry and Physics, physical constants of organic compounds, from memory:
        ("acetic_acid", 60.052),
        ("citric_acid", 192.124),
        ("lactic_acid_88", 90.078),
        ("formic_acid", 46.025),
        ("benzoic_acid", 122.123),
        ("sodium_benzoate", 144.105),
        ("glycine", 75.067),
        ("sodium_acetate_trihydrate", 136.08),
    ];
    for &(id, expected) in cases {
        let entry = lib.entry(id).unwrap();
        let got = entry.molar_mass_g_per_mol;
        assert!(
            (got - expected).abs() <= 0.01,
            "{id}: molar mass {got:.4} g/mol, handbook {expected} g/mol"
        );
    }
}

#[test]
fn hydrate_and_hydrolysis_water() {
    let lib = Library::built_in().unwrap();
    // (ingredient id, mol of water added to the solvent per mol)
    let cases: &[(&str, f64)] = &[
        ("water", 1.0),
        ("sodium_chloride", 0.0),
        ("citric_acid_monohydrate", 1.0),
        ("trisodium_citrate_dihydrate", 2.0),
        ("sodium_acetate_trihydrate", 3.0),
        ("trisodium_phosphate_dodecahydrate", 12.0),
        ("aluminium_chloride_hexahydrate", 6.0),
        ("zinc_sulfate_heptahydrate", 7.0),
        // Na2B4O7·10H2O → 2 B(OH)3 + 2 B(OH)4- + 2 Na+ + 3 H2O: 7 of its 10 waters are used.
        ("borax", 3.0),
        // Na2SiO3·5H2O is Na2H2SiO4·4H2O.
        ("sodium_metasilicate_pentahydrate", 4.0),
    ];
    for &(id, expected) in cases {
        let got = lib.entry(id).unwrap().water_mol_per_mol;
        assert!(
            (got - expected).abs() < 1e-12,
            "{id}: {got} mol water per mol"
        );
    }
}

/// A small valid library: the reserved ions, sodium and chloride, acetic acid and sodium acetate.
fn small() -> LibraryData {
    let ion = |id: &str, symbol: &str, charge: i32| Ion {
        id: id.into(),
        symbol: symbol.into(),
        charge,
        conjugate_of: "test".into(),
    };
    LibraryData {
        systems: vec![acetic()],
        ions: vec![
            ion("hydron", "H+", 1),
            ion("hydroxide", "OH-", -1),
            ion("sodium", "Na+", 1),
            ion("chloride", "Cl-", -1),
        ],
        ingredients: vec![sodium_acetate()],
        ..LibraryData::default()
    }
}

/// Acetic acid with its Goldberg 2002 constants (from memory); any valid values would do.
fn acetic() -> System {
    System {
        id: "acetic".into(),
        name: "acetic acid".into(),
        charge_of_fully_protonated: 0,
        forms: vec!["acetic acid".into(), "acetate".into()],
        pka: vec![4.756],
        dh_kj_mol: vec![-0.41],
        dcp_j_mol_k: vec![],
        pka_ionic_strength: 0.0,
        pka_ionic_strengths: Vec::new(),
        source: "Goldberg, Kishore & Lennen 2002 (from memory)".into(),
    }
}

fn sodium_acetate() -> Ingredient {
    Ingredient {
        id: "sodium_acetate".into(),
        name: "sodium acetate".into(),
        formula: "NaC2H3O2".into(),
        assay: 1.0,
        releases: vec![
            Release::Ion {
                id: "sodium".into(),
                count: 1,
            },
            Release::System {
                id: "acetic".into(),
                count: 1,
                form: 1,
            },
        ],
        water_per_formula: None,
        hazards: vec![],
        note: "test".into(),
    }
}

/// The loader's refusal of `data`, as text; panics when it is accepted.
fn refusal(data: LibraryData) -> String {
    match Library::from_data(data) {
        Ok(_) => panic!("the loader accepted invalid data"),
        Err(e) => e.to_string(),
    }
}

/// Asserts that a message contains every part.
fn says(message: &str, parts: &[&str]) {
    for part in parts {
        assert!(message.contains(part), "{message:?} lacks {part:?}");
    }
}

#[test]
fn the_small_library_loads() {
    let lib = Library::from_data(small()).unwrap();
    assert_eq!(lib.entries().len(), 1);
    assert_eq!(lib.systems().len(), 1);
}

#[test]
fn a_charged_ingredient_is_refused() {
    let mut d = small();
    // Na+ twice with one acetate: charge +1.
    d.ingredients[0].releases[0] = Release::Ion {
        id: "sodium".into(),
        count: 2,
    };
    says(
        &refusal(d),
        &[
            "ingredient 'sodium_acetate'",
            "charge +1",
            "must be neutral",
        ],
    );
}

#[test]
fn unknown_ions_and_systems_are_refused() {
    let mut d = small();
    d.ingredients[0].releases[0] = Release::Ion {
        id: "sodum".into(),
        count: 1,
    };
    says(&refusal(d), &["sodium_acetate", "unknown ion 'sodum'"]);
    let mut d = small();
    d.ingredients[0].releases[1] = Release::System {
        id: "acetc".into(),
        count: 1,
        form: 1,
    };
    says(&refusal(d), &["sodium_acetate", "unknown system 'acetc'"]);
}

#[test]
fn a_form_out_of_range_is_refused() {
    let mut d = small();
    d.ingredients[0].releases[1] = Release::System {
        id: "acetic".into(),
        count: 1,
        form: 2,
    };
    says(
        &refusal(d),
        &["form 2 of 'acetic' does not exist", "forms 0 to 1"],
    );
}

#[test]
fn duplicate_ids_are_refused() {
    let mut d = small();
    d.ingredients.push(sodium_acetate());
    says(&refusal(d), &["ingredient 'sodium_acetate'", "used twice"]);
    let mut d = small();
    d.systems.push(acetic());
    says(&refusal(d), &["system 'acetic'", "already used"]);
    // Systems and ions share one name space.
    let mut d = small();
    d.ions[2].id = "acetic".into();
    says(&refusal(d), &["ion 'acetic'", "already used"]);
}

#[test]
fn bad_id_characters_are_refused() {
    for id in ["Sodium_Acetate", "sodium acetate", "sodium-acetate", ""] {
        let mut d = small();
        d.ingredients[0].id = id.into();
        says(&refusal(d), &["lower-case letters, digits and '_'"]);
    }
}

#[test]
fn pka_values_out_of_range_are_refused() {
    for pka in [25.0, -6.0, f64::NAN] {
        let mut d = small();
        d.systems[0].pka = vec![pka];
        says(&refusal(d), &["system 'acetic'", "pKa1 =", "outside −5…20"]);
    }
    let mut d = small();
    d.systems[0].pka = vec![];
    d.systems[0].dh_kj_mol = vec![];
    d.systems[0].forms = vec![];
    says(&refusal(d), &["0 pKa values", "1 to 10 are allowed"]);
}

#[test]
fn a_wrong_number_of_enthalpies_or_forms_is_refused() {
    let mut d = small();
    d.systems[0].dh_kj_mol = vec![-0.41, 1.0];
    says(
        &refusal(d),
        &[
            "system 'acetic'",
            "1 pKa values but 2 ΔH° values",
            "one ΔH° per step",
        ],
    );
    let mut d = small();
    d.systems[0].dcp_j_mol_k = vec![-142.0, 0.0];
    says(&refusal(d), &["more ΔCp° values than steps"]);
    let mut d = small();
    d.systems[0].forms = vec!["acetic acid".into()];
    says(&refusal(d), &["names 1 forms", "with 1 steps has 2"]);
    let mut d = small();
    d.systems[0].dh_kj_mol = vec![2000.0];
    says(&refusal(d), &["finite and under 1000"]);
    let mut d = small();
    d.systems[0].pka_ionic_strength = 6.0;
    says(
        &refusal(d),
        &["pka_ionic_strength", "between 0 and 5 mol/kg"],
    );
}

#[test]
fn a_system_without_a_source_is_refused() {
    let mut d = small();
    d.systems[0].source = "  ".into();
    says(&refusal(d), &["system 'acetic'", "needs the source"]);
}

#[test]
fn an_assay_outside_zero_to_one_is_refused() {
    for assay in [0.0, 1.5, -0.2, f64::NAN] {
        let mut d = small();
        d.ingredients[0].assay = assay;
        says(
            &refusal(d),
            &["sodium_acetate", "outside (0, 1]", "mass fraction"],
        );
    }
}

#[test]
fn a_release_count_of_zero_is_refused() {
    let mut d = small();
    d.ingredients[0].releases[0] = Release::Ion {
        id: "sodium".into(),
        count: 0,
    };
    says(&refusal(d), &["sodium_acetate", "count must be 1 or more"]);
}

#[test]
fn bad_formulas_and_water_are_refused() {
    let mut d = small();
    d.ingredients[0].formula = "NaC2H3O2Xq".into();
    says(&refusal(d), &["sodium_acetate", "formula 'NaC2H3O2Xq'"]);
    let mut d = small();
    d.ingredients[0].water_per_formula = Some(-1.0);
    says(&refusal(d), &["water_per_formula must be 0 or more"]);
}

#[test]
fn ion_charges_and_reserved_ions_are_checked() {
    for charge in [0, 7, -7] {
        let mut d = small();
        d.ions[3].charge = charge;
        says(
            &refusal(d),
            &[
                "ion 'chloride'",
                &format!("charge {charge} is not allowed"),
                "−6 and +6",
            ],
        );
    }
    let mut d = small();
    d.ions.remove(0);
    says(&refusal(d), &["must define 'hydron' with charge +1"]);
    let mut d = small();
    d.ions[1].charge = -2;
    says(&refusal(d), &["must define 'hydroxide' with charge -1"]);
}

#[test]
fn extending_refuses_what_loading_refuses() {
    let mut lib = Library::from_data(small()).unwrap();
    let again = LibraryData {
        systems: vec![acetic()],
        ..LibraryData::default()
    };
    let e = lib.extend(again).unwrap_err().to_string();
    says(&e, &["system 'acetic'", "already used"]);
    let mut charged = sodium_acetate();
    charged.id = "custom_acetate".into();
    charged.releases.pop();
    let e = lib
        .extend(LibraryData {
            ingredients: vec![charged],
            ..LibraryData::default()
        })
        .unwrap_err()
        .to_string();
    says(&e, &["custom_acetate", "charge +1"]);
    let mut fine = sodium_acetate();
    fine.id = "custom_acetate".into();
    lib.extend(LibraryData {
        ingredients: vec![fine],
        ..LibraryData::default()
    })
    .unwrap();
    assert!(lib.entry("custom_acetate").is_some());
}

#[test]
fn syntax_errors_name_the_origin_line_and_column() {
    let e = Library::from_ron("(systems: [\n  (id: ]\n)", "my.ron").unwrap_err();
    assert!(matches!(e, LibraryError::Syntax { line: 2, .. }), "{e:?}");
    says(&e.to_string(), &["my.ron line 2, column"]);
}

#[test]
fn every_system_has_a_source_and_named_forms() {
    let lib = Library::built_in().unwrap();
    for s in lib.systems() {
        assert!(!s.source.trim().is_empty(), "{}: no source", s.id);
        assert!(
            s.source.contains("from memory") || s.source.contains("Morris"),
            "{}: the source should say the constants were recalled",
            s.id
        );
        assert_eq!(s.forms.len(), s.pka.len() + 1, "{}: forms not named", s.id);
        assert!(s.forms.iter().all(|f| !f.trim().is_empty()), "{}", s.id);
        assert_eq!(form_names(s), s.forms);
        assert_eq!(s.dh_kj_mol.len(), s.pka.len(), "{}", s.id);
    }
    for ion in lib.ions() {
        assert!(
            !ion.conjugate_of.trim().is_empty(),
            "{}: no conjugate",
            ion.id
        );
    }
}

#[test]
fn every_ingredient_has_a_name_and_note() {
    let lib = Library::built_in().unwrap();
    for entry in lib.entries() {
        let i = &entry.ingredient;
        assert!(!i.name.trim().is_empty(), "{}: no name", i.id);
        assert!(!i.note.trim().is_empty(), "{}: no note", i.id);
    }
}

#[test]
fn constants_of_the_check_table() {
    let lib = Library::built_in().unwrap();
    let pka = |id: &str| -> Vec<f64> {
        let s = &lib.systems()[lib.system_index(id).unwrap()];
        s.pka.clone()
    };
    // Goldberg, Kishore & Lennen, J. Phys. Chem. Ref. Data 31 (2002) 231, from memory.
    assert_eq!(pka("acetic"), [4.756]);
    assert_eq!(pka("citric"), [3.128, 4.761, 6.396]);
    assert_eq!(pka("phosphoric"), [2.148, 7.198, 12.35]);
    assert_eq!(pka("carbonic"), [6.351, 10.329]);
    assert_eq!(pka("boric"), [9.237]);
    assert_eq!(pka("ammonium"), [9.245]);
    assert_eq!(pka("tris"), [8.072]);
    assert_eq!(pka("phthalic"), [2.950, 5.408]);
    // CRC Handbook, from memory.
    assert_eq!(pka("formic"), [3.75]);
    assert_eq!(pka("lactic"), [3.86]);
    assert_eq!(pka("benzoic"), [4.20]);
    // Morris, J. Phys. Chem. 70 (1966) 3798, from memory: pKa = 3000.00/T − 10.0686 + 0.0253·T.
    let hocl = &lib.systems()[lib.system_index("hypochlorous").unwrap()];
    let t = 298.15;
    let r_ln10 = 8.314_462_618e-3 * std::f64::consts::LN_10;
    assert!((hocl.pka[0] - (3000.0 / t - 10.0686 + 0.0253 * t)).abs() < 5e-4);
    assert!((hocl.dh_kj_mol[0] - r_ln10 * (3000.0 - 0.0253 * t * t)).abs() < 0.01);
    assert!((hocl.dcp_j_mol_k[0] - (-2.0e3 * r_ln10 * 0.0253 * t)).abs() < 0.1);
    // EDTA constants are stored at the ionic strength they were measured at.
    let edta = &lib.systems()[lib.system_index("edta").unwrap()];
    assert_eq!(edta.pka.len(), 6);
    assert!((edta.pka_ionic_strength - 0.1).abs() < 1e-12);
    // Martell & Smith as printed in Harris (from memory): the first step at I = 1, the rest at 0.1.
    assert_eq!(edta.ionic_strength_of_step(0), 1.0);
    assert!((1..6).all(|k| edta.ionic_strength_of_step(k) == 0.1));
}

#[test]
fn per_step_ionic_strengths_are_optional_and_checked() {
    // A library file written before per-step ionic strengths existed still loads, every step at
    // the system's one ionic strength.
    let old = r#"(
        ions: [(id: "hydron", symbol: "H+", charge: 1), (id: "hydroxide", symbol: "OH-", charge: -1)],
        systems: [(id: "di", name: "a diprotic acid", charge_of_fully_protonated: 0,
                   pka: [3.0, 6.0], dh_kj_mol: [0.0, 0.0], pka_ionic_strength: 0.1,
                   source: "invented")],
    )"#;
    let lib = Library::from_ron(old, "old.ron").unwrap();
    let s = &lib.systems()[0];
    assert!(s.pka_ionic_strengths.is_empty());
    assert_eq!(s.ionic_strength_of_step(0), 0.1);
    assert_eq!(s.ionic_strength_of_step(1), 0.1);
    // One ionic strength per step overrides the system's.
    let new = old.replace(
        "pka_ionic_strength: 0.1,",
        "pka_ionic_strength: 0.1, pka_ionic_strengths: [1.0, 0.1],",
    );
    let lib = Library::from_ron(&new, "new.ron").unwrap();
    let s = &lib.systems()[0];
    assert_eq!(s.ionic_strength_of_step(0), 1.0);
    assert_eq!(s.ionic_strength_of_step(1), 0.1);
    // A list that is not one per step, or out of range, is refused.
    let mut d = small();
    d.systems[0].pka_ionic_strengths = vec![0.1, 0.1];
    says(
        &refusal(d),
        &[
            "system 'acetic'",
            "1 pKa values but 2 pka_ionic_strengths",
            "one per step",
        ],
    );
    for bad in [-0.1, 6.0, f64::NAN] {
        let mut d = small();
        d.systems[0].pka_ionic_strengths = vec![bad];
        says(
            &refusal(d),
            &["pka_ionic_strengths", "between 0 and 5 mol/kg"],
        );
    }
}

#[test]
fn each_step_is_brought_to_zero_ionic_strength_from_its_own() {
    use saltwise_chem::{ActivityModel, Conditions, Constants};
    // A diprotic system with its steps measured at I = 1 and I = 0.1 must give, step by step,
    // the thermodynamic constants of the same system measured wholly at I = 1 or wholly at 0.1.
    let system = |id: &str, scalar: f64, per_step: Vec<f64>| System {
        id: id.into(),
        name: id.into(),
        charge_of_fully_protonated: 0,
        forms: vec![],
        pka: vec![3.0, 6.0],
        dh_kj_mol: vec![0.0, 0.0],
        dcp_j_mol_k: vec![],
        pka_ionic_strength: scalar,
        pka_ionic_strengths: per_step,
        source: "invented".into(),
    };
    let mut d = small();
    d.systems = vec![
        system("mixed", 0.0, vec![1.0, 0.1]),
        system("all_1", 1.0, vec![]),
        system("all_01", 0.1, vec![]),
    ];
    d.ingredients.clear();
    let lib = Library::from_data(d).unwrap();
    let k = Constants::new(
        &lib,
        Conditions {
            temp_c: 25.0,
            activity: ActivityModel::Davies,
        },
    );
    let ka = |id: &str| k.ka(lib.system_index(id).unwrap()).to_vec();
    assert!((ka("mixed")[0] / ka("all_1")[0] - 1.0).abs() < 1e-12);
    assert!((ka("mixed")[1] / ka("all_01")[1] - 1.0).abs() < 1e-12);
    // And the two ionic strengths really differ in effect (so the check above means something).
    assert!((ka("all_1")[0] / ka("all_01")[0] - 1.0).abs() > 1e-3);
}

#[test]
fn corrected_constants_and_their_enthalpies() {
    let lib = Library::built_in().unwrap();
    let sys = |id: &str| lib.systems()[lib.system_index(id).unwrap()].clone();
    // Fitch et al., Protein Science 24 (2015) 752 (from memory): guanidinium pKa 13.8.
    assert_eq!(sys("arginine").pka[2], 13.8);
    // Amine step's ΔH° as glycine's: Goldberg, Kishore & Lennen 2002 (from memory), 44.2 kJ/mol.
    assert_eq!(sys("arginine").dh_kj_mol[1], sys("glycine").dh_kj_mol[1]);
    // Martell & Smith, Critical Stability Constants (from memory): malic acid 3.46, 5.10 at I = 0.
    assert_eq!(sys("malic").pka, [3.46, 5.10]);
    // Published ΔH° (sources in the library): none of these is left at 0 any more.
    assert!(sys("silicic").dh_kj_mol.iter().all(|&h| h > 0.0));
    // Zn²⁺ and Fe³⁺ hydrolysis (now hydroxo complexes): their published hydrolysis ΔH° less
    // that of water's ionisation, 55.8 kJ/mol (sources in the library).
    let dh = |id: &str| {
        lib.complexes()
            .iter()
            .find(|c| c.data.id == id)
            .map(|c| c.data.dh_kj_mol)
            .unwrap_or_else(|| panic!("{id} is a complex"))
    };
    assert!((dh("zinc_hydroxo") - (56.1 - 55.8)).abs() < 1e-9);
    assert!((dh("iron_iii_hydroxo") - (43.5 - 55.8)).abs() < 1e-9);
    assert!((dh("iron_iii_dihydroxo") - (71.5 - 2.0 * 55.8)).abs() < 1e-9);
    assert!(sys("salicylic").dh_kj_mol[0] > 0.0);
    // Tartaric and phthalic acids carry ΔCp° for every step (NBS fits, from memory).
    assert_eq!(sys("tartaric").dcp_j_mol_k.len(), 2);
    assert_eq!(sys("phthalic").dcp_j_mol_k.len(), 2);
}
