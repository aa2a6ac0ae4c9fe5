//! Worked examples with closed-form or independent answers.

use saltwise_chem::ActivityModel::{Davies, Ideal};
use saltwise_chem::explain::{Effect, explain_ingredient};
use saltwise_chem::{Conditions, Constants};
use saltwise_reference_tests::{assert_close, library, ph, solve};

#[test]
fn ideal_charge_balance_examples() {
    // Ideal, 25 °C, pKw 13.995, Goldberg 2002 constants; values from the charge balance
    // (reproduced by scipy.optimize.brentq in tests/python/check_independent_roots.py).
    assert_close(
        "0.100 acetic acid",
        ph(&[("acetic_acid", 0.1)], 25.0, Ideal),
        2.881,
        0.005,
    );
    assert_close(
        "0.100 sodium acetate",
        ph(&[("sodium_acetate_trihydrate", 0.1)], 25.0, Ideal),
        8.876,
        0.005,
    );
    assert_close(
        "0.050 ammonium chloride",
        ph(&[("ammonium_chloride", 0.05)], 25.0, Ideal),
        5.273,
        0.005,
    );
    assert_close(
        "0.050 sodium acetate",
        ph(&[("sodium_acetate_trihydrate", 0.05)], 25.0, Ideal),
        8.725,
        0.005,
    );
}

#[test]
fn tris_buffer_textbook_example() {
    // D. C. Harris, Quantitative Chemical Analysis, buffer chapter (from memory): 12.43 g tris
    // (121.135 g/mol) + 4.67 g tris·HCl (157.596 g/mol) in 1.00 L → pH 8.61; + 12.0 mL 1.00 M HCl
    // → 8.41. Book constants: pKa 8.072, ideal, mol/L taken as mol/kg.
    let tris = 12.43 / 121.135;
    let tris_hcl = 4.67 / 157.596;
    assert_close(
        "tris buffer",
        ph(
            &[("tris", tris), ("tris_hydrochloride", tris_hcl)],
            25.0,
            Ideal,
        ),
        8.61,
        0.01,
    );
    let with_acid = ph(
        &[
            ("tris", tris),
            ("tris_hydrochloride", tris_hcl),
            ("hydrochloric_acid_36", 0.012),
        ],
        25.0,
        Ideal,
    );
    assert_close("tris buffer + HCl", with_acid, 8.41, 0.01);
}

#[test]
fn hypochlorous_acid_follows_morris_with_temperature() {
    // Morris, J. Phys. Chem. 70 (1966) 3798 (from memory): pKa = 3000.00/T − 10.0686 + 0.0253 T.
    let lib = library();
    let Some(sys) = lib.system_index("hypochlorous") else {
        panic!("no hypochlorous system")
    };
    for t_c in [5.0, 15.0, 25.0, 35.0, 45.0] {
        let t = t_c + 273.15;
        let morris = 3000.0 / t - 10.0686 + 0.0253 * t;
        let c = Constants::new(
            &lib,
            Conditions {
                temp_c: t_c,
                activity: Ideal,
            },
        );
        assert_close(
            &format!("pKa(HOCl) at {t_c} °C"),
            -c.ka(sys)[0].log10(),
            morris,
            0.01,
        );
    }
}

#[test]
fn rules_of_thumb_for_salts() {
    // Common practice, no source; checked within ±0.05 .
    let pkw = 13.995; // IAPWS R11-07 at 25 °C, computed with Python `thermo`
    assert_close(
        "NaCl is neutral",
        ph(&[("sodium_chloride", 0.1)], 25.0, Davies),
        pkw / 2.0,
        0.005,
    );
    assert_close(
        "KCl is neutral",
        ph(&[("potassium_chloride", 0.05)], 25.0, Ideal),
        pkw / 2.0,
        0.005,
    );
    assert_close(
        "NaHCO3 ≈ (pKa1 + pKa2)/2",
        ph(&[("sodium_bicarbonate", 0.1)], 25.0, Ideal),
        (6.351 + 10.329) / 2.0,
        0.05,
    );
    assert_close(
        "ammonium acetate ≈ (4.756 + 9.245)/2",
        ph(&[("ammonium_acetate", 0.1)], 25.0, Ideal),
        (4.756 + 9.245) / 2.0,
        0.05,
    );
    assert!(
        ph(&[("ammonium_chloride", 0.1)], 25.0, Davies) < 6.0,
        "weak-base cation acidifies"
    );
    assert!(
        ph(&[("sodium_acetate_trihydrate", 0.1)], 25.0, Davies) > 8.0,
        "weak-acid anion basifies"
    );
}

#[test]
fn the_salt_rule_explains_each_salt() {
    // The salt rule (spec §job 1): strong/strong neutral; weak-base cation acidic; weak-acid anion
    // basic; both weak: the larger of Ka and Kb wins (common practice, no source).
    let lib = library();
    let c = Constants::new(&lib, Conditions::default());
    let effect = |id: &str| {
        let Some(i) = lib.entry_index(id) else {
            panic!("{id}")
        };
        explain_ingredient(&lib, &c, i).effect
    };
    assert_eq!(effect("sodium_chloride"), Effect::Neutral);
    assert_eq!(effect("potassium_chloride"), Effect::Neutral);
    assert_eq!(effect("ammonium_chloride"), Effect::Acidifies);
    assert_eq!(effect("sodium_acetate_trihydrate"), Effect::Basifies);
    assert_eq!(effect("sodium_carbonate"), Effect::Basifies);
    // Both ions react: ammonium Ka 5.7e-10 vs sulfate Kb 1e-12 → acidic; bicarbonate Kb > Ka → basic.
    assert_eq!(effect("ammonium_sulfate"), Effect::Acidifies);
    assert_eq!(effect("sodium_bicarbonate"), Effect::Basifies);
    assert_eq!(effect("potassium_dihydrogen_phosphate"), Effect::Acidifies);
    assert_eq!(effect("ammonium_acetate"), Effect::Neutral);
    // Predicted pH agrees with each verdict.
    assert!(ph(&[("ammonium_sulfate", 0.05)], 25.0, Davies) < 6.5);
    assert!(ph(&[("potassium_dihydrogen_phosphate", 0.05)], 25.0, Davies) < 6.5);
    assert!(ph(&[("sodium_bicarbonate", 0.05)], 25.0, Davies) > 7.5);
}

#[test]
fn edta_near_its_measurement_ionic_strength() {
    // Martell & Smith constants at I = 0.1 (as printed in Harris, from memory): at I ≈ 0.1 the
    // computed p[H] must match a solve with those concentration constants used directly, ±0.05.
    // The first step (pKa 0.0) is from I = 1 in the library; brought to I = 0.1 it moves by about
    // 0.01, which at this p[H] (about 4.4) changes nothing, so 0.0 stands for it here.
    let r = solve(
        &[("disodium_edta_dihydrate", 0.01), ("sodium_chloride", 0.07)],
        25.0,
        Davies,
    );
    let i = r.solution.ionic_strength;
    assert!((0.08..0.12).contains(&i), "I = {i}");
    // Independent ideal solve with the I = 0.1 constants, by bisection on p[H].
    let pka = [0.0, 1.5, 2.00, 2.69, 6.13, 10.37];
    let pkw_c = 13.995 - 2.0 * 0.5108 * (0.1f64.sqrt() / (1.0 + 0.1f64.sqrt()) - 0.03); // conditional Kw, Davies
    let total = 0.01;
    let charge = |p: f64| {
        let h = 10f64.powf(-p);
        let mut t = [1.0; 7];
        for k in 0..6 {
            t[k + 1] = t[k] * 10f64.powf(-pka[k]) / h;
        }
        let s: f64 = t.iter().sum();
        let mean_z: f64 = t
            .iter()
            .enumerate()
            .map(|(j, x)| (2.0 - j as f64) * x / s)
            .sum();
        2.0 * total + h - 10f64.powf(-pkw_c) / h + total * mean_z
    };
    let (mut lo, mut hi) = (0.0, 14.0);
    for _ in 0..100 {
        let mid = 0.5 * (lo + hi);
        if charge(mid) > 0.0 {
            lo = mid
        } else {
            hi = mid
        }
    }
    assert_close("EDTA p[H] at I ≈ 0.1", r.solution.p_h_conc, lo, 0.05);
}
