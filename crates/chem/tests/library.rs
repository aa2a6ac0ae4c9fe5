//! The built-in ingredient library: it loads, carries every required ingredient, its molar masses
//! agree with handbook values, every ingredient is neutral and every system names its source.

use saltwise_chem::Library;
use saltwise_chem::library::{ResolvedRelease, form_names};

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
        // CRC Handbook of Chemistry and Physics, from memory (check-values.md §5):
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
        // Harris, Quantitative Chemical Analysis, buffer chapter, from memory (check-values.md §4):
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

#[test]
fn every_ingredient_is_neutral() {
    let lib = Library::built_in().unwrap();
    for entry in lib.entries() {
        let charge: f64 = entry
            .releases
            .iter()
            .map(|r| match *r {
                ResolvedRelease::Ion { ion, count } => f64::from(lib.ions()[ion].charge) * count,
                ResolvedRelease::System {
                    system,
                    count,
                    form,
                } => {
                    let s = &lib.systems()[system];
                    (f64::from(s.charge_of_fully_protonated) - f64::from(form)) * count
                }
            })
            .sum();
        assert!(
            charge.abs() < 1e-12,
            "{} releases charge {charge}",
            entry.ingredient.id
        );
    }
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
    // Goldberg, Kishore & Lennen, J. Phys. Chem. Ref. Data 31 (2002) 231, from memory
    // (check-values.md §3).
    assert_eq!(pka("acetic"), [4.756]);
    assert_eq!(pka("citric"), [3.128, 4.761, 6.396]);
    assert_eq!(pka("phosphoric"), [2.148, 7.198, 12.35]);
    assert_eq!(pka("carbonic"), [6.351, 10.329]);
    assert_eq!(pka("boric"), [9.237]);
    assert_eq!(pka("ammonium"), [9.245]);
    assert_eq!(pka("tris"), [8.072]);
    assert_eq!(pka("phthalic"), [2.950, 5.408]);
    // CRC Handbook, from memory (check-values.md §3).
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
}
