//! IUPAC standard buffers: R. P. Buck et al., "Measurement of pH. Definition, standards, and
//! procedures", Pure Appl. Chem. 74 (2002) 2169–2200 (values from memory). Davies activities; tolerance 0.02 at 25 °C, 0.025 elsewhere.

use saltwise_chem::ActivityModel::Davies;
use saltwise_reference_tests::{assert_close, ph};

const KHP: &[(&str, f64)] = &[("potassium_hydrogen_phthalate", 0.05)];
const PHOSPHATE: &[(&str, f64)] = &[
    ("potassium_dihydrogen_phosphate", 0.025),
    ("disodium_hydrogen_phosphate", 0.025),
];
const BORAX: &[(&str, f64)] = &[("borax", 0.01)];
/// Potassium hydrogen tartrate saturated at 25 °C: 0.0341 mol/kg (Bates, Determination of pH,
/// 2nd ed., Wiley 1973, from memory); the standard keeps that composition when warmed.
const TARTRATE: &[(&str, f64)] = &[("potassium_hydrogen_tartrate", 0.0341)];

#[test]
fn potassium_hydrogen_phthalate_at_25_c() {
    assert_close("KHP 0.05 mol/kg, 25 °C", ph(KHP, 25.0, Davies), 4.005, 0.02); // Buck 2002
}

#[test]
fn equimolal_phosphate_at_25_c() {
    assert_close(
        "phosphate 0.025/0.025, 25 °C",
        ph(PHOSPHATE, 25.0, Davies),
        6.865,
        0.02,
    ); // Buck 2002
}

#[test]
fn borax_at_25_c() {
    assert_close(
        "borax 0.01 mol/kg, 25 °C",
        ph(BORAX, 25.0, Davies),
        9.180,
        0.02,
    ); // Buck 2002
}

#[test]
fn standard_buffers_away_from_25_c() {
    // Buck 2002 (from memory): pH(S) at 15, 20 and 30 °C.
    for (name, items, table) in [
        ("KHP", KHP, [(15.0, 3.998), (20.0, 4.000), (30.0, 4.011)]),
        (
            "phosphate",
            PHOSPHATE,
            [(15.0, 6.900), (20.0, 6.881), (30.0, 6.853)],
        ),
        (
            "borax",
            BORAX,
            [(15.0, 9.276), (20.0, 9.225), (30.0, 9.139)],
        ),
    ] {
        for (t, expected) in table {
            assert_close(
                &format!("{name} at {t} °C"),
                ph(items, t, Davies),
                expected,
                0.025,
            );
        }
    }
}

#[test]
fn without_activities_the_buffers_miss() {
    // The check tests the activity model: ideal solutions miss phosphate's pH(S) 6.865 (Buck et
    // al. 2002, from memory) by well over 0.06 (the activity correction is ≈ 0.1 at I ≈ 0.1).
    let ideal = ph(PHOSPHATE, 25.0, saltwise_chem::ActivityModel::Ideal);
    assert!((ideal - 6.865).abs() > 0.06, "ideal phosphate {ideal}");
}

#[test]
fn potassium_hydrogen_phthalate_at_50_c() {
    // Buck 2002 (from memory): pH(S) 4.061 at 50 °C. Needs the ΔCp° of phthalic acid (Hamer,
    // Pinching & Acree 1945/1946, from memory); without it the model reads about 4.036. Tolerance
    // 0.03: the constant-ΔCp° van 't Hoff form and Davies at 50 °C.
    assert_close("KHP 0.05 mol/kg, 50 °C", ph(KHP, 50.0, Davies), 4.061, 0.03);
}

#[test]
fn saturated_potassium_hydrogen_tartrate_at_25_and_50_c() {
    // Buck 2002 (from memory): pH(S) 3.557 at 25 °C and 3.549 at 50 °C. The 50 °C value needs the
    // ΔCp° of tartaric acid (Bates & Canham 1951, from memory); without it the model reads about
    // 3.521. The constants are valid to 50 °C, the top of those measurements.
    assert_close("tartrate, 25 °C", ph(TARTRATE, 25.0, Davies), 3.557, 0.02);
    assert_close("tartrate, 50 °C", ph(TARTRATE, 50.0, Davies), 3.549, 0.03);
}
