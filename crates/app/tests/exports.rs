//! File ▸ Export: every chart as PNG, SVG and CSV and the batch sheet, written from what the
//! window shows.

mod common;

use common::{Folders, harness_in};
use egui_kittest::kittest::Queryable as _;
use saltwise::Command;
use saltwise::exports::{ChartKind, Export, Format};
use saltwise_chem::project::Project;

fn export(
    h: &mut egui_kittest::Harness<'_, saltwise::Workbench>,
    e: Export,
    path: &std::path::Path,
) {
    h.state_mut()
        .queue(Command::ExportToPath(e, path.to_path_buf()));
    h.run();
}

#[test]
fn the_file_menu_has_an_export_part_with_every_chart() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    h.get_by_label("File").click();
    h.run();
    h.get_by_label("Export").click();
    h.run();
    h.get_by_label("Batch sheet (HTML)…");
    h.get_by_label("Sheet batch size");
    // Some share their words with a heading of the window ("Dose curve").
    for chart in ChartKind::ALL {
        assert!(
            h.query_all_by_label(chart.words()).count() >= 1,
            "{chart:?}"
        );
    }
}

#[test]
fn every_chart_is_written_as_png_svg_and_csv() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    h.run();
    for chart in ChartKind::ALL {
        for format in Format::ALL {
            let e = Export::Chart(chart, format);
            let path = dir.path().join(e.file_name(h.state().project()));
            export(&mut h, e, &path);
            let bytes =
                std::fs::read(&path).unwrap_or_else(|err| panic!("{}: {err}", path.display()));
            match format {
                // The PNG signature (ISO/IEC 15948, section 5.2).
                Format::Png => assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n", "{chart:?}"),
                Format::Svg => {
                    let text = String::from_utf8(bytes).unwrap();
                    assert!(text.contains("<svg") && text.trim_end().ends_with("</svg>"));
                }
                Format::Csv => {
                    let text = String::from_utf8(bytes).unwrap();
                    assert!(text.lines().count() > 10, "{chart:?}: {text}");
                }
            }
        }
    }
    assert!(h.query_by_label_contains("Exported the").is_some());
}

#[test]
fn the_dose_curve_csv_holds_the_points_the_window_draws() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    h.run();
    let path = dir.path().join("dose.csv");
    export(&mut h, Export::Chart(ChartKind::Dose, Format::Csv), &path);
    let text = std::fs::read_to_string(&path).unwrap();
    let curve = match h.state().engine().curve() {
        Some(Ok(c)) => c.clone(),
        other => panic!("{other:?}"),
    };
    let mut lines = text.lines();
    assert_eq!(
        lines.next(),
        Some("dose_g,ph,buffer_capacity_mol_per_kg_water_per_ph")
    );
    for (line, p) in lines.zip(&curve.points) {
        let cells: Vec<f64> = line.split(',').map(|c| c.parse().unwrap()).collect();
        assert_eq!(cells, vec![p.dose_g, p.ph, p.buffer_capacity]);
    }
}

#[test]
fn the_batch_sheet_is_written_for_the_batch_size_set_in_the_menu() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    h.run();
    let path = dir.path().join("sheet.html");
    export(
        &mut h,
        Export::BatchSheet {
            batch_kg: Some(250.0),
        },
        &path,
    );
    let html = std::fs::read_to_string(&path).unwrap();
    let project = h.state().project().clone();
    assert!(html.contains(&saltwise_export::escape(&project.name)));
    let shown = saltwise_export::BatchSize::kilograms(250.0).show(250_000.0);
    assert!(html.contains(&shown), "{shown} missing");
    let ph = h.state().engine().solved().unwrap().solution.ph;
    assert!(html.contains(&format!("{ph:.2}")), "pH {ph:.2} missing");
    assert!(html.contains(saltwise_chem::hazard::DEFER));
}

#[test]
fn an_export_that_cannot_be_written_says_why_and_writes_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    h.run();
    let path = dir.path().join("no such folder").join("dose.png");
    export(&mut h, Export::Chart(ChartKind::Dose, Format::Png), &path);
    assert!(
        h.query_by_label_contains("Could not export the dose curve")
            .is_some()
    );
    assert!(!path.exists());
}
