//! pH-meter readings parsed from the shapes a lab hands over, each refusal with its line, and
//! measured titrations kept in project files (old files still load).

use saltwise_chem::measured::{MeasuredError, MeasuredTitration, Separator, parse_readings};
use saltwise_chem::project::Project;

fn pairs(text: &str) -> Vec<(f64, f64)> {
    parse_readings(text)
        .expect("parses")
        .points
        .iter()
        .map(|p| (p.titrant, p.ph))
        .collect()
}

const EXPECTED: [(f64, f64); 3] = [(0.0, 12.1), (5.5, 11.85), (10.0, 7.25)];

#[test]
fn comma_with_header() {
    let r = parse_readings("mL,pH\n0,12.1\n5.5,11.85\n10,7.25\n").expect("parses");
    assert_eq!(r.separator, Separator::Comma);
    assert_eq!(r.header, Some(vec!["mL".to_string(), "pH".to_string()]));
    assert_eq!(r.lines, vec![2, 3, 4]);
    assert_eq!(pairs("mL,pH\n0,12.1\n5.5,11.85\n10,7.25\n"), EXPECTED);
}

#[test]
fn no_header_spaces_and_tabs() {
    assert_eq!(pairs("0 12.1\n5.5   11.85\n 10 7.25"), EXPECTED);
    let r = parse_readings("0\t12.1\n5.5\t11.85\n10\t7.25\n").expect("parses");
    assert_eq!(r.separator, Separator::Tab);
    assert_eq!(pairs("0\t12.1\n5.5\t11.85\n10\t7.25\n"), EXPECTED);
}

#[test]
fn decimal_comma_with_semicolon_or_tab() {
    let text = "Volume (mL);pH;Temp (°C)\n0;12,1;21,5\n5,5;11,85;21,6\n10;7,25;21,7\n";
    let r = parse_readings(text).expect("parses");
    assert_eq!(r.separator, Separator::Semicolon);
    assert!(r.decimal_comma);
    assert_eq!(pairs(text), EXPECTED);
    assert_eq!(r.points[2].temp_c, Some(21.7));
    assert_eq!(pairs("0\t12,1\n5,5\t11,85\n10\t7,25\n"), EXPECTED);
}

#[test]
fn header_names_columns_in_any_order_and_windows_files() {
    let text = "\u{feff}# bench 2, lot 24-117\r\npH,mL\r\n12.1,0\r\n\r\n11.85,5.5\r\n7.25,10\r\n";
    assert_eq!(pairs(text), EXPECTED);
    // Quoted cells and a trailing separator, as spreadsheets write them.
    assert_eq!(
        pairs("\"g\";\"pH\";\n\"0\";\"12,1\";\n5,5;11,85;\n10;7,25;\n"),
        EXPECTED
    );
}

#[test]
fn each_refusal_names_its_line_and_column() {
    assert_eq!(parse_readings(""), Err(MeasuredError::Empty));
    assert_eq!(
        parse_readings("mL,pH\n\n# nothing yet\n"),
        Err(MeasuredError::Empty)
    );
    let e = parse_readings("mL,pH\n0,12.1\n5.5,eleven\n").expect_err("refused");
    assert_eq!(
        e,
        MeasuredError::NotANumber {
            line: 3,
            column: 2,
            what: "pH",
            cell: "eleven".into()
        }
    );
    assert!(
        e.to_string()
            .starts_with("line 3, column 2 (pH): 'eleven' is not a number")
    );
    assert!(matches!(
        parse_readings("0,12.1\n5,15.2\n"),
        Err(MeasuredError::PhOutOfRange {
            line: 2,
            column: 2,
            ..
        })
    ));
    assert!(matches!(
        parse_readings("0,12.1\n-1,11\n"),
        Err(MeasuredError::TitrantOutOfRange {
            line: 2,
            column: 1,
            ..
        })
    ));
    assert!(matches!(
        parse_readings("0,12.1\n1,11,20,4\n"),
        Err(MeasuredError::WrongColumns {
            line: 2,
            found: 4,
            expected: 2,
            ..
        })
    ));
    assert!(matches!(
        parse_readings("0,12.1,20\n1,11\n"),
        Err(MeasuredError::WrongColumns {
            line: 2,
            found: 2,
            expected: 3,
            ..
        })
    ));
    assert!(matches!(
        parse_readings("0;12,1;120\n"),
        Err(MeasuredError::Temperature {
            line: 1,
            column: 3,
            ..
        })
    ));
    // With commas between cells a decimal comma cannot be told from a separator: "0,12,1" is
    // three cells (titrant 0, pH 12, 1 °C), which is why decimal commas need ; or tab.
    let three = parse_readings("0,12,1\n5,11,9\n").expect("three columns");
    assert_eq!(three.points[0].ph, 12.0);
    assert_eq!(three.points[0].temp_c, Some(1.0));
    assert!(matches!(
        parse_readings("pH,pH\n1,2\n"),
        Err(MeasuredError::Header { line: 1, .. })
    ));
}

#[test]
fn projects_keep_measured_titrations_and_old_files_still_load() {
    let mut p = Project::demo();
    let r = parse_readings("mL,pH\n0,5.0\n1,5.4\n2,6.1\n").expect("parses");
    p.measured.push(MeasuredTitration {
        name: "lot 24-117".into(),
        titrant: "sodium_hydroxide".into(),
        normality: 0.1,
        sample_g: 10.0,
        titrant_by_mass: false,
        points: r.points,
        source_file: "lot-24-117.csv".into(),
        imported: "2025-03-14".into(),
    });
    let text = p.to_ron().expect("ron");
    let back = Project::from_ron(&text, "p.ron").expect("loads");
    assert_eq!(back.measured, p.measured);
    // A project written before measured titrations existed has none.
    let old = Project::demo().to_ron().expect("ron");
    assert!(!old.contains("measured"));
    assert!(
        Project::from_ron(&old, "old.ron")
            .expect("loads")
            .measured
            .is_empty()
    );
    // A bad reading in a project file is refused with what is wrong.
    let mut bad = p.clone();
    bad.measured[0].points[1].ph = 20.0;
    let e = Project::from_ron(&bad.to_ron().expect("ron"), "bad.ron").expect_err("refused");
    assert!(e.to_string().contains("reading 2"), "{e}");
}
