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
