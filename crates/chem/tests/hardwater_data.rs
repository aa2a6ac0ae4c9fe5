//! Hard-water data of the built-in library: complexes and ion pairs of calcium, magnesium,
//! sodium and potassium, sparingly soluble solids, and the calcium and magnesium salts. Every
//! complex and solid resolves to library species with a balanced charge, spot values agree with
//! their sources, and the loader refuses a complex or solid that does not resolve.

use saltwise_chem::library::{Complex, Ion, LibraryData, Solid, Species, System};
use saltwise_chem::{Library, LibraryError};

fn lib() -> Library {
    Library::built_in().expect("the built-in library loads")
}

fn complex<'a>(lib: &'a Library, id: &str) -> &'a saltwise_chem::library::ResolvedComplex {
    lib.complexes()
        .iter()
        .find(|c| c.data.id == id)
        .unwrap_or_else(|| panic!("complex {id} is in the library"))
}

fn solid<'a>(lib: &'a Library, id: &str) -> &'a saltwise_chem::library::ResolvedSolid {
    lib.solids()
        .iter()
        .find(|s| s.data.id == id)
        .unwrap_or_else(|| panic!("solid {id} is in the library"))
}

fn close(got: f64, want: f64, tol: f64, what: &str) {
    assert!(
        (got - want).abs() <= tol,
        "{what}: {got}, expected {want} ± {tol}"
    );
}

fn id_is_snake_case(id: &str) -> bool {
    !id.is_empty()
        && id
            .chars()
            .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '_')
        && !id.starts_with('_')
        && !id.ends_with('_')
}

#[test]
fn the_library_loads_with_complexes_and_solids() {
    let lib = lib();
    assert!(
        lib.complexes().len() >= 30,
        "{} complexes",
        lib.complexes().len()
    );
    assert!(lib.solids().len() >= 10, "{} solids", lib.solids().len());
}

#[test]
fn every_complex_resolves_to_a_cation_and_a_ligand_of_the_library() {
    let lib = lib();
    for c in lib.complexes() {
        let d = &c.data;
        assert!(id_is_snake_case(&d.id), "{}: id style", d.id);
        let metal = lib.species(&d.metal).expect("the metal is a species");
        assert_eq!(metal, Species::Ion(c.metal), "{}", d.id);
        assert!(
            [
                "calcium",
                "magnesium",
                "sodium",
                "potassium",
                "zinc",
                "aluminium",
                "iron_iii"
            ]
            .contains(&d.metal.as_str()),
            "{}: metal {}",
            d.id,
            d.metal
        );
        let ligand = lib.species(&d.ligand).expect("the ligand is a species");
        assert_eq!(ligand, c.ligand, "{}", d.id);
        assert!(
            lib.species_charge(ligand) < 0,
            "{}: ligand is an anion",
            d.id
        );
        // Only hydroxo complexes hold more than one ligand.
        let n = i32::try_from(d.ligand_count).expect("a small count");
        assert!(n == 1 || d.ligand == "hydroxide", "{}", d.id);
        assert_eq!(
            c.charge,
            lib.species_charge(metal) + n * lib.species_charge(ligand),
            "{}",
            d.id
        );
        assert!(d.log_k.is_finite() && d.dh_kj_mol.is_finite(), "{}", d.id);
        assert!(
            d.ionic_strength == 0.0 || d.ionic_strength == 0.1 || d.ionic_strength == 1.0,
            "{}: ionic strength {}",
            d.id,
            d.ionic_strength
        );
        // Every constant names where it comes from, and whether it was recalled or read.
        assert!(d.source.len() > 40, "{}: source too short", d.id);
        assert!(
            d.source.contains("from memory") || d.source.contains("read"),
            "{}: the source says neither 'from memory' nor 'read'",
            d.id
        );
    }
}

#[test]
fn every_solid_resolves_and_balances() {
    let lib = lib();
    for s in lib.solids() {
        let d = &s.data;
        assert!(id_is_snake_case(&d.id), "{}: id style", d.id);
        assert_eq!(s.components.len(), d.components.len(), "{}", d.id);
        let mut charge = 0.0;
        for ((id, count), (species, n)) in d.components.iter().zip(&s.components) {
            assert_eq!(lib.species(id), Some(*species), "{}: {id}", d.id);
            assert_eq!(f64::from(*count), *n, "{}: {id}", d.id);
            charge += f64::from(lib.species_charge(*species)) * n;
        }
        assert_eq!(charge, 0.0, "{}: charges sum to {charge}", d.id);
        assert!(d.log_ksp < 0.0, "{}: a sparingly soluble solid", d.id);
        assert!(
            d.source.contains("from memory") || d.source.contains("read"),
            "{}: the source says neither 'from memory' nor 'read'",
            d.id
        );
    }
}

#[test]
fn the_ligands_named_are_the_forms_meant() {
    let lib = lib();
    // Y⁴⁻ and HY³⁻ of EDTA, citrate³⁻, P₂O₇⁴⁻, CO₃²⁻, HCO₃⁻, SO₄²⁻, HPO₄²⁻, PO₄³⁻.
    for (id, charge) in [
        ("edta/6", -4),
        ("edta/5", -3),
        ("citric/3", -3),
        ("pyrophosphoric/4", -4),
        ("carbonic/2", -2),
        ("carbonic/1", -1),
        ("hydrogen_sulfate/1", -2),
        ("phosphoric/2", -2),
        ("phosphoric/3", -3),
        ("phosphoric/1", -1),
        ("gluconic/1", -1),
        ("glda/4", -4),
        ("mgda/3", -3),
        ("hedp/4", -4),
        ("zinc", 2),
        ("iron_iii", 3),
        ("aluminium", 3),
    ] {
        let sp = lib
            .species(id)
            .unwrap_or_else(|| panic!("{id} is a species"));
        assert_eq!(lib.species_charge(sp), charge, "{id}");
    }
    // The complexes' charges follow: CaY²⁻, CaHY⁻, NaY³⁻, CaCO₃⁰, CaHCO₃⁺, CaOH⁺, NaSO₄⁻.
    for (id, charge) in [
        ("calcium_edta", -2),
        ("calcium_hydrogen_edta", -1),
        ("sodium_edta", -3),
        ("calcium_carbonate_pair", 0),
        ("calcium_hydrogen_carbonate_pair", 1),
        ("calcium_hydroxo", 1),
        ("magnesium_sulfate_pair", 0),
        ("sodium_sulfate_pair", -1),
        ("calcium_citrate", -1),
        ("magnesium_pyrophosphate", -2),
        // Zn(OH)₄²⁻, Al(OH)₄⁻, Fe(OH)₂⁺ hold several OH⁻; ZnY²⁻, FeY⁻.
        ("zincate", -2),
        ("aluminate", -1),
        ("iron_iii_dihydroxo", 1),
        ("zinc_edta", -2),
        ("iron_iii_edta", -1),
    ] {
        assert_eq!(complex(&lib, id).charge, charge, "{id}");
    }
}

#[test]
fn spot_values_agree_with_their_sources() {
    let lib = lib();
    // Martell & Smith, as printed in Harris, Quantitative Chemical Analysis (from memory):
    // CaY²⁻ 10.65 and MgY²⁻ 8.79 at I = 0.1.
    let ca_y = &complex(&lib, "calcium_edta").data;
    assert_eq!((ca_y.log_k, ca_y.ionic_strength), (10.65, 0.1));
    let mg_y = &complex(&lib, "magnesium_edta").data;
    assert_eq!((mg_y.log_k, mg_y.ionic_strength), (8.79, 0.1));
    // Plummer & Busenberg 1982 (from memory): calcite −8.48, aragonite −8.336, CaCO₃⁰ 3.224,
    // CaHCO₃⁺ 1.106; ΔH° in kcal/mol × 4.184.
    let calcite = &solid(&lib, "calcite").data;
    assert_eq!(calcite.log_ksp, -8.48);
    close(calcite.dh_kj_mol, -2.297 * 4.184, 0.01, "calcite ΔH°");
    let aragonite = &solid(&lib, "aragonite").data;
    assert_eq!(aragonite.log_ksp, -8.336);
    close(aragonite.dh_kj_mol, -2.589 * 4.184, 0.01, "aragonite ΔH°");
    let caco3 = &complex(&lib, "calcium_carbonate_pair").data;
    assert_eq!((caco3.log_k, caco3.ionic_strength), (3.224, 0.0));
    close(caco3.dh_kj_mol, 3.545 * 4.184, 0.01, "CaCO₃⁰ ΔH°");
    let cahco3 = &complex(&lib, "calcium_hydrogen_carbonate_pair").data;
    assert_eq!(cahco3.log_k, 1.106);
    close(cahco3.dh_kj_mol, 2.69 * 4.184, 0.01, "CaHCO₃⁺ ΔH°");
    // Nordstrom et al. 1990 (from memory): CaSO₄⁰ 2.30, MgSO₄⁰ 2.37, NaSO₄⁻ 0.70, KSO₄⁻ 0.85,
    // NaCO₃⁻ 1.27.
    for (id, log_k) in [
        ("calcium_sulfate_pair", 2.30),
        ("magnesium_sulfate_pair", 2.37),
        ("sodium_sulfate_pair", 0.70),
        ("potassium_sulfate_pair", 0.85),
        ("sodium_carbonate_pair", 1.27),
    ] {
        assert_eq!(complex(&lib, id).data.log_k, log_k, "{id}");
    }
}

#[test]
fn converted_constants_follow_from_their_published_form() {
    let lib = lib();
    let edta = &lib.systems()[lib.system_index("edta").unwrap()];
    let pka_hy = edta.pka[5];
    // Ca²⁺ + HY³⁻ from CaY²⁻ + H⁺ (log K 3.1) and the library's own pKa of HY³⁻, all at I = 0.1.
    close(
        complex(&lib, "calcium_hydrogen_edta").data.log_k,
        10.65 + 3.1 - pka_hy,
        0.005,
        "CaHY⁻",
    );
    close(
        complex(&lib, "magnesium_hydrogen_edta").data.log_k,
        8.79 + 3.85 - pka_hy,
        0.005,
        "MgHY⁻",
    );
    assert_eq!(edta.ionic_strength_of_step(5), 0.1);
    // Hydrolysis constants M + H2O ⇌ MOH + H⁺ plus pKw 13.995 (IAPWS, as the solver uses).
    let pkw = 13.995;
    close(
        complex(&lib, "calcium_hydroxo").data.log_k,
        -12.78 + pkw,
        0.006,
        "CaOH⁺",
    );
    close(
        complex(&lib, "magnesium_hydroxo").data.log_k,
        -11.44 + pkw,
        0.006,
        "MgOH⁺",
    );
    // Dissolution in acid (solid + n H⁺) brought to Ksp with n × pKw.
    close(
        solid(&lib, "brucite").data.log_ksp,
        16.84 - 2.0 * pkw,
        0.006,
        "brucite",
    );
    close(
        solid(&lib, "portlandite").data.log_ksp,
        22.80 - 2.0 * pkw,
        0.006,
        "portlandite",
    );
    close(
        solid(&lib, "gibbsite").data.log_ksp,
        8.11 - 3.0 * pkw,
        0.001,
        "gibbsite",
    );
    // Constants published as K rather than log K.
    close(
        complex(&lib, "calcium_citrate").data.log_k,
        7.0e4_f64.log10(),
        0.005,
        "CaCit⁻",
    );
    close(
        complex(&lib, "calcium_gluconate").data.log_k,
        88.0_f64.log10(),
        0.005,
        "CaGluc⁺",
    );
    close(
        solid(&lib, "brushite").data.log_ksp,
        2.49e-7_f64.log10(),
        0.005,
        "brushite",
    );
    close(
        solid(&lib, "nesquehonite").data.log_ksp,
        2.38e-6_f64.log10(),
        0.005,
        "nesquehonite",
    );
    close(
        solid(&lib, "ferrihydrite").data.log_ksp,
        2.79e-39_f64.log10(),
        0.005,
        "Fe(OH)₃",
    );
}

#[test]
fn hardness_salts_are_present_with_handbook_molar_masses() {
    let lib = lib();
    // CRC Handbook / IUPAC standard atomic weights (from memory).
    for (id, molar_mass) in [
        ("calcium_chloride_dihydrate", 147.01),
        ("magnesium_sulfate_heptahydrate", 246.47),
        ("calcium_chloride", 110.98),
        ("magnesium_chloride_hexahydrate", 203.30),
        ("calcium_carbonate", 100.09),
        ("calcium_hydroxide", 74.09),
        ("calcium_nitrate_tetrahydrate", 236.15),
        ("calcium_gluconate_monohydrate", 448.39),
        ("calcium_disodium_edta_dihydrate", 410.30),
    ] {
        let entry = lib
            .entry(id)
            .unwrap_or_else(|| panic!("{id} is in the library"));
        close(entry.molar_mass_g_per_mol, molar_mass, 0.02, id);
        assert!(!entry.ingredient.note.trim().is_empty(), "{id}: note");
    }
    // The hydrate waters join the solvent.
    let water = |id: &str| lib.entry(id).unwrap().water_mol_per_mol;
    assert_eq!(water("calcium_chloride_dihydrate"), 2.0);
    assert_eq!(water("magnesium_sulfate_heptahydrate"), 7.0);
    // What they release: Ca²⁺ + 2 Cl⁻, Mg²⁺ + SO₄²⁻.
    let cacl2 = &lib.entry("calcium_chloride_dihydrate").unwrap().ingredient;
    assert_eq!(cacl2.formula, "CaCl2·2H2O");
    let mgso4 = &lib
        .entry("magnesium_sulfate_heptahydrate")
        .unwrap()
        .ingredient;
    assert_eq!(mgso4.formula, "MgSO4·7H2O");
}

/// A small library: the reserved ions, calcium, and carbonic acid.
fn small() -> LibraryData {
    let ion = |id: &str, symbol: &str, charge: i32| Ion {
        id: id.into(),
        symbol: symbol.into(),
        charge,
        conjugate_of: "test".into(),
    };
    LibraryData {
        systems: vec![System {
            id: "carbonic".into(),
            name: "carbonic acid".into(),
            charge_of_fully_protonated: 0,
            forms: vec![],
            pka: vec![6.351, 10.329],
            dh_kj_mol: vec![9.15, 14.70],
            dcp_j_mol_k: vec![],
            pka_ionic_strength: 0.0,
            pka_ionic_strengths: Vec::new(),
            source: "Goldberg, Kishore & Lennen 2002 (from memory)".into(),
        }],
        ions: vec![
            ion("hydron", "H+", 1),
            ion("hydroxide", "OH-", -1),
            ion("calcium", "Ca2+", 2),
        ],
        ..LibraryData::default()
    }
}

fn refusal(data: LibraryData) -> LibraryError {
    match Library::from_data(data) {
        Ok(_) => panic!("the loader accepted invalid data"),
        Err(e) => e,
    }
}

fn pair(ligand: &str) -> Complex {
    Complex {
        id: "calcium_test_pair".into(),
        metal: "calcium".into(),
        ligand: ligand.into(),
        ligand_count: 1,
        log_k: 3.224,
        ionic_strength: 0.0,
        dh_kj_mol: 0.0,
        source: "test".into(),
    }
}

fn carbonate_solid(components: Vec<(String, u32)>) -> Solid {
    Solid {
        id: "test_calcite".into(),
        name: "test calcite".into(),
        formula: "CaCO3".into(),
        components,
        log_ksp: -8.48,
        dh_kj_mol: 0.0,
        source: "test".into(),
    }
}

#[test]
fn a_valid_complex_and_solid_load() {
    let mut d = small();
    d.complexes = vec![pair("carbonic/2"), {
        let mut c = pair("hydroxide");
        c.id = "calcium_test_hydroxo".into();
        c
    }];
    d.solids = vec![carbonate_solid(vec![
        ("calcium".into(), 1),
        ("carbonic/2".into(), 1),
    ])];
    let lib = Library::from_data(d).expect("valid data loads");
    assert_eq!(lib.complexes().len(), 2);
    assert_eq!(lib.complexes()[0].charge, 0);
    assert_eq!(lib.complexes()[1].charge, 1);
    assert_eq!(lib.solids().len(), 1);
}

#[test]
fn only_hydroxo_complexes_may_hold_several_ligands() {
    // Several carbonates on one metal is not a complex the solver can hold.
    let mut d = small();
    let mut c = pair("carbonic/2");
    c.ligand_count = 2;
    d.complexes = vec![c];
    let text = refusal(d).to_string();
    assert!(
        text.contains("complex 'calcium_test_pair'") && text.contains("ligand_count 2"),
        "{text}"
    );
    // Zero, or more than four OH⁻, neither.
    for n in [0, 5] {
        let mut d = small();
        let mut c = pair("hydroxide");
        c.ligand_count = n;
        d.complexes = vec![c];
        let text = refusal(d).to_string();
        assert!(text.contains(&format!("ligand_count {n}")), "{text}");
    }
    // Two OH⁻ on calcium loads, with the charge that follows.
    let mut d = small();
    let mut c = pair("hydroxide");
    c.ligand_count = 2;
    d.complexes = vec![c];
    let lib = Library::from_data(d).expect("a dihydroxo complex loads");
    assert_eq!(lib.complexes()[0].charge, 0);
}

#[test]
fn a_complex_with_an_unknown_ligand_is_refused_by_its_id() {
    for ligand in ["sulfite/2", "carbonic/7", "carbonic", "chloride_x"] {
        let mut d = small();
        d.complexes = vec![pair(ligand)];
        let e = refusal(d);
        let text = e.to_string();
        assert!(
            matches!(&e, LibraryError::Invalid { kind: "complex", id, .. } if id == "calcium_test_pair"),
            "{e:?}"
        );
        assert!(text.contains("complex 'calcium_test_pair'"), "{text}");
        assert!(text.contains(&format!("ligand '{ligand}'")), "{text}");
    }
    // A cation is no ligand, nor is the metal a ligand-free id.
    let mut d = small();
    d.complexes = vec![pair("calcium")];
    assert!(refusal(d).to_string().contains("calcium_test_pair"));
    let mut d = small();
    let mut c = pair("carbonic/2");
    c.metal = "strontium".into();
    d.complexes = vec![c];
    let text = refusal(d).to_string();
    assert!(
        text.contains("complex 'calcium_test_pair'") && text.contains("strontium"),
        "{text}"
    );
}

#[test]
fn a_solid_whose_charges_do_not_balance_is_refused_by_its_id() {
    let mut d = small();
    // Ca²⁺ with two CO₃²⁻: charge −2.
    d.solids = vec![carbonate_solid(vec![
        ("calcium".into(), 1),
        ("carbonic/2".into(), 2),
    ])];
    let e = refusal(d);
    assert!(
        matches!(&e, LibraryError::Invalid { kind: "solid", id, .. } if id == "test_calcite"),
        "{e:?}"
    );
    let text = e.to_string();
    assert!(text.contains("solid 'test_calcite'"), "{text}");
    assert!(text.contains("charge 0"), "{text}");
    // An unknown component is named too.
    let mut d = small();
    d.solids = vec![carbonate_solid(vec![
        ("calcium".into(), 1),
        ("oxalic/2".into(), 1),
    ])];
    let text = refusal(d).to_string();
    assert!(
        text.contains("solid 'test_calcite'") && text.contains("oxalic/2"),
        "{text}"
    );
}
