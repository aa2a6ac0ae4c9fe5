//! The systems and commercial grades a cleaning or cosmetic formulator expects: present, with
//! molar masses, assay conversions and compositions that agree with their published or stated
//! bases, hazard tags as supplied, and a few pH checks that follow from the charge balance.

use saltwise_chem::formula::{Formula, WATER_MOLAR_MASS_G_PER_MOL};
use saltwise_chem::{
    ActivityModel, Amount, Conditions, Hazard, Library, Recipe, RecipeLine, Unit, evaluate,
};

/// Ingredient ids added for concentrates and hard water.
const GRADES: &[&str] = &[
    "sulfamic_acid",
    "methanesulfonic_acid_70",
    "oxalic_acid_dihydrate",
    "diethanolamine",
    "triethanolamine_85",
    "hydrogen_peroxide_35",
    "sodium_percarbonate",
    "potassium_carbonate",
    "sodium_sesquicarbonate",
    "sodium_silicate_solution",
    "tetrasodium_edta_39",
    "ammonia_28_30",
    "glda_na4_47",
    "mgda_na3_40",
    "hedp_60",
    "sodium_hypochlorite_av_cl_12_5",
];

fn lib() -> Library {
    Library::built_in().expect("built-in library")
}

fn molar_mass(formula: &str) -> f64 {
    Formula::parse(formula)
        .expect("a valid formula")
        .molar_mass_g_per_mol()
}

fn entry<'a>(lib: &'a Library, id: &str) -> &'a saltwise_chem::library::Entry {
    lib.entry(id)
        .unwrap_or_else(|| panic!("no ingredient {id}"))
}

/// pH of one ingredient at a molality (mol of formula units per kg of water, all water counted).
fn ph_of(lib: &Library, id: &str, molality: f64, activity: ActivityModel) -> f64 {
    let e = entry(lib, id);
    let mass_g = molality * e.molar_mass_g_per_mol / e.ingredient.assay;
    let brought_g = mass_g * (1.0 - e.ingredient.assay)
        + molality * e.water_mol_per_mol * WATER_MOLAR_MASS_G_PER_MOL;
    let recipe = Recipe {
        lines: vec![
            RecipeLine::grams("water", 1000.0 - brought_g),
            RecipeLine {
                ingredient: id.into(),
                amount: Amount {
                    value: molality,
                    unit: Unit::Mole,
                },
                enabled: true,
            },
        ],
        qs_to_g: None,
        water_hardness: None,
    };
    let r = evaluate(
        lib,
        &recipe,
        Conditions {
            temp_c: 25.0,
            activity,
        },
    )
    .expect("solves");
    assert!(r.solution.converged(), "{id}: {:?}", r.solution.status);
    r.solution.ph
}

#[test]
fn every_grade_is_present_with_a_note() {
    let lib = lib();
    for id in GRADES {
        let e = entry(&lib, id);
        assert!(!e.ingredient.note.trim().is_empty(), "{id}: no note");
    }
}

#[test]
fn molar_masses_match_handbook_values() {
    let lib = lib();
    // CRC Handbook of Chemistry and Physics, physical constants of inorganic and organic
    // compounds (from memory), g/mol, tolerance 0.01:
    let cases: &[(&str, f64)] = &[
        ("potassium_carbonate", 138.21),
        ("oxalic_acid_dihydrate", 126.07),
        ("hydrogen_peroxide_35", 34.01),
        ("diethanolamine", 105.14),
        ("sulfamic_acid", 97.09),
        ("methanesulfonic_acid_70", 96.11),
        ("ammonia_28_30", 17.03),
        // Sums of the same handbook values: 2 Na2CO3 (105.99) + 3 H2O2 (34.01); Na2CO3 + NaHCO3
        // (84.01) + 2 H2O (18.02); 4 triethanolamine (149.19) + diethanolamine (105.14).
        ("sodium_percarbonate", 2.0 * 105.99 + 3.0 * 34.01),
        ("sodium_sesquicarbonate", 105.99 + 84.01 + 2.0 * 18.02),
        ("triethanolamine_85", 4.0 * 149.19 + 105.14),
        // Trisodium MGDA, 271.1 g/mol (Nouryon product page for MGDA-Na3, read today).
        ("mgda_na3_40", 271.1),
    ];
    for (i, &(id, expected)) in cases.iter().enumerate() {
        let got = entry(&lib, id).molar_mass_g_per_mol;
        // 0.01 g/mol for single compounds; sums of rounded values (the last four) to 0.05.
        let tol = if i < 7 { 0.01 } else { 0.05 };
        assert!(
            (got - expected).abs() <= tol,
            "{id}: {got:.3} g/mol, handbook {expected}"
        );
    }
}

#[test]
fn hypochlorite_by_available_chlorine_converts_to_sodium_hypochlorite() {
    // Available chlorine is reported as Cl2: one NaOCl oxidises as one Cl2, so
    // w(NaOCl) = w(available Cl2) × M(NaOCl)/M(Cl2) = w × 74.44/70.90 (standard definition of
    // available chlorine, e.g. CRC Handbook, from memory).
    let lib = lib();
    let ratio = molar_mass("NaClO") / molar_mass("Cl2");
    assert!((ratio - 74.44 / 70.90).abs() < 1e-4, "ratio {ratio}");
    let graded = entry(&lib, "sodium_hypochlorite_av_cl_12_5");
    assert_eq!(graded.ingredient.formula, "NaClO");
    assert!(
        (graded.ingredient.assay - 0.125 * ratio).abs() < 5e-6,
        "assay {}",
        graded.ingredient.assay
    );
    // The older grade is on the NaOCl basis: 12 % NaOCl is 11.43 % available chlorine.
    let by_mass = entry(&lib, "sodium_hypochlorite_12");
    assert_eq!(by_mass.ingredient.assay, 0.12);
    assert!((0.12 / ratio - 0.1143).abs() < 5e-5);
    // Both are hypochlorite as supplied, so they carry the same tags.
    assert_eq!(graded.ingredient.hazards, by_mass.ingredient.hazards);
    // 100 g of the available-chlorine grade holds as much hypochlorite as 100 × 0.13123/0.12 g
    // of the 12 % grade: same moles of the same releases.
    assert_eq!(graded.releases, by_mass.releases);
}

#[test]
fn tea_85_is_85_percent_triethanolamine_with_diethanolamine() {
    // "TEA 85" of commerce: about 85 % triethanolamine and 15 % diethanolamine by mass (producers'
    // grade descriptions, from memory).
    let lib = lib();
    let unit = entry(&lib, "triethanolamine_85");
    let tea = entry(&lib, "triethanolamine").molar_mass_g_per_mol;
    let fraction = 4.0 * tea / unit.molar_mass_g_per_mol;
    assert!(
        (fraction - 0.85).abs() < 0.005,
        "TEA mass fraction {fraction}"
    );
    assert_eq!(unit.water_mol_per_mol, 0.0);
    assert!(unit.ingredient.hazards.contains(&Hazard::TertiaryAmine));
    assert!(unit.ingredient.hazards.contains(&Hazard::Amine));
}

#[test]
fn liquid_silicate_has_its_stated_ratio_and_solids() {
    // The common neutral grade of water glass: SiO2:Na2O 3.2 by weight, 37.6 % solids, 8.9 %
    // Na2O and 28.7 % SiO2 (producers' data sheets, from memory).
    let lib = lib();
    let e = entry(&lib, "sodium_silicate_solution");
    let na2o = molar_mass("Na2O");
    let sio2 = molar_mass("SiO2");
    let oxide = molar_mass("Na6Si10O23");
    assert!((3.0 * na2o + 10.0 * sio2 - oxide).abs() < 1e-9);
    let ratio = 10.0 * sio2 / (3.0 * na2o);
    assert!((ratio - 3.2).abs() < 0.05, "weight ratio {ratio}");
    let solids = e.ingredient.assay * oxide / e.molar_mass_g_per_mol;
    assert!((solids - 0.376).abs() < 5e-4, "solids {solids}");
    assert!((solids * 3.0 * na2o / oxide - 0.089).abs() < 5e-4);
    assert!((solids * 10.0 * sio2 / oxide - 0.287).abs() < 5e-4);
    // The 17 waters of the unit become silicic acid and silicate: none joins the solvent.
    assert_eq!(e.water_mol_per_mol, 0.0);
}

#[test]
fn percarbonate_holds_its_available_oxygen() {
    // Pure 2Na2CO3·3H2O2 holds 15.3 % available oxygen (one O per H2O2; handbook value, from
    // memory).
    let lib = lib();
    let m = entry(&lib, "sodium_percarbonate").molar_mass_g_per_mol;
    let oxygen = 3.0 * molar_mass("O") / m;
    assert!((oxygen - 0.153).abs() < 5e-4, "available oxygen {oxygen}");
    // Its hydrogen peroxide is not water of crystallisation.
    assert_eq!(entry(&lib, "sodium_percarbonate").water_mol_per_mol, 0.0);
    assert_eq!(entry(&lib, "sodium_sesquicarbonate").water_mol_per_mol, 2.0);
}

#[test]
fn strong_and_nearly_strong_acids_follow_the_charge_balance() {
    let lib = lib();
    // Methanesulfonic acid is fully dissociated: 1 mmol/kg, ideal, pH 3.000 (charge balance;
    // water's own ions change it by under 1e-8).
    let msa = ph_of(&lib, "methanesulfonic_acid_70", 1e-3, ActivityModel::Ideal);
    assert!((msa - 3.0).abs() < 1e-6, "MSA pH {msa}");
    // Sulfamic acid, pKa 1.05 (library, CRC from memory), 0.01 mol/kg, ideal: the quadratic
    // x²/(C − x) = Ka in closed form.
    let ka = 10f64.powf(-1.05);
    let c = 0.01;
    let x = (-ka + (ka * ka + 4.0 * ka * c).sqrt()) / 2.0;
    let sulfamic = ph_of(&lib, "sulfamic_acid", c, ActivityModel::Ideal);
    assert!(
        (sulfamic + x.log10()).abs() < 1e-4,
        "sulfamic pH {sulfamic}"
    );
}

#[test]
fn sesquicarbonate_buffers_at_the_second_carbonate_step() {
    // Equimolar carbonate and hydrogen carbonate: pH ≈ pKa2 = 10.329 (Goldberg 2002, from memory)
    // ideal and without ion pairs, less the small hydrolysis shift (Henderson–Hasselbalch;
    // common practice, no source).
    let mut data = Library::built_in_data().expect("built-in data");
    data.complexes.clear();
    let unpaired = Library::from_data(data).expect("library without complexes");
    let ph = ph_of(
        &unpaired,
        "sodium_sesquicarbonate",
        0.05,
        ActivityModel::Ideal,
    );
    assert!((ph - 10.329).abs() < 0.05, "sesquicarbonate pH {ph}");
    // The NaCO₃⁻ pair (log K 1.27, Nordstrom et al. 1990, from memory) takes carbonate out of
    // the free pool. With Davies at I ≈ 0.2 its conditional constant is 18.6·γ₁⁴ ≈ 6 and with
    // 0.15 mol/kg Na⁺ the free CO₃²⁻ falls by a factor of about 1.9: some 0.2–0.3 lower than
    // without the pair (the HCO₃⁻ pair is weak). Ideal solutions leave alkali ion pairs out.
    let davies = |lib: &Library| ph_of(lib, "sodium_sesquicarbonate", 0.05, ActivityModel::Davies);
    let (unpaired_davies, paired) = (davies(&unpaired), davies(&lib()));
    let shift = unpaired_davies - paired;
    assert!((0.15..0.4).contains(&shift), "{unpaired_davies} → {paired}");
    let ideal = ph_of(&lib(), "sodium_sesquicarbonate", 0.05, ActivityModel::Ideal);
    assert!(
        (ideal - ph).abs() < 1e-9,
        "ideal leaves the alkali pairs out"
    );
}

#[test]
fn chelant_constants_record_their_ionic_strength() {
    let lib = lib();
    // Each set of constants was measured near I = 0.1 mol/kg (sources in the library).
    for id in ["glda", "mgda", "hedp"] {
        let s = &lib.systems()[lib.system_index(id).expect("system")];
        assert!(
            (0..s.pka.len()).all(|k| s.ionic_strength_of_step(k) == 0.1),
            "{id}"
        );
    }
    // The chelants' grades release the fully deprotonated anion with its sodium.
    for (id, na) in [
        ("glda_na4_47", 4),
        ("mgda_na3_40", 3),
        ("tetrasodium_edta_39", 4),
    ] {
        let e = entry(&lib, id);
        assert!(
            e.ingredient.releases.iter().any(|r| matches!(
                r,
                saltwise_chem::library::Release::Ion { id, count } if id == "sodium" && *count == na
            )),
            "{id}"
        );
    }
}

#[test]
fn hazards_as_supplied() {
    let lib = lib();
    let has = |id: &str, h: Hazard| entry(&lib, id).ingredient.hazards.contains(&h);
    assert!(has("methanesulfonic_acid_70", Hazard::StrongAcid));
    assert!(has("hydrogen_peroxide_35", Hazard::Oxidiser));
    assert!(has("sodium_percarbonate", Hazard::Oxidiser));
    assert!(has("ammonia_28_30", Hazard::Ammonia));
    assert!(has("diethanolamine", Hazard::Amine));
    assert!(has("sodium_hypochlorite_av_cl_12_5", Hazard::Hypochlorite));
}
