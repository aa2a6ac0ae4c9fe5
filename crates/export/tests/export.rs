//! The exports against chem's own numbers: the batch sheet's HTML shows them and escapes user
//! text, every chart is well-formed SVG and a PNG of the size asked, every CSV reads back.

use quick_xml::events::Event;
use saltwise_chem::curve::Doser;
use saltwise_chem::hazard::{self, DEFER};
use saltwise_chem::project::Project;
use saltwise_chem::qc::{self, Request, Titrant};
use saltwise_chem::report::evaluate_with;
use saltwise_chem::{Conditions, Constants, Library};
use saltwise_export::sheet::{DoseInstruction, plain, sig};
use saltwise_export::{
    BatchSize, Chart, DoseChart, ExportError, SheetRequest, Size, SpeciesChart, TitrationChart,
    batch_sheet, batch_sheet_html, csv, escape, png, svg,
};

fn library() -> Library {
    Library::built_in().expect("built-in library")
}

fn constants(library: &Library, project: &Project) -> Constants {
    Constants::new(
        library,
        Conditions {
            temp_c: project.settings.temp_c,
            activity: project.settings.activity,
        },
    )
}

fn sheet_html(project: &Project, batch: BatchSize) -> String {
    let library = library();
    let sheet = batch_sheet(&SheetRequest {
        project,
        library: &library,
        variant: project.current(),
        batch: Some(batch),
        date: "2031-04-05".into(),
        qc: None,
    })
    .expect("sheet");
    batch_sheet_html(&sheet).expect("html")
}

#[test]
fn the_sheet_shows_the_numbers_chem_gives() {
    let project = Project::demo();
    let library = library();
    let constants = constants(&library, &project);
    let html = sheet_html(&project, BatchSize::kilograms(25.0));
    let report = evaluate_with(&library, &constants, project.recipe()).expect("solves");
    // The predicted pH as weighed.
    assert!(html.contains(&format!("{:.2}", report.solution.ph)));
    // Each line scaled from 1 kg to 25 kg, shown in kg.
    let scaled = report.batch.scaled_to(25_000.0);
    for l in &scaled.lines {
        let shown = sig(l.mass_g / 1000.0, 4);
        assert!(html.contains(&shown), "{shown} kg not on the sheet");
    }
    // The dose to target on the 25 kg batch.
    let target = project.settings.target_ph.expect("the demo sets a target");
    let dose = Doser::new(&library, &constants, &scaled, &project.settings.adjuster)
        .and_then(|d| d.to_target(target))
        .expect("dose");
    assert!(html.contains(&sig(dose.amount_g / 1000.0, 4)));
    // The QC end points of 10 g of the product as weighed with 0.1 N HCl (the demo is at pH ~4.6,
    // above 4.3, so an acid titrant is the usual choice).
    let titrant = Titrant::find(&library, "hcl", 0.1).expect("hcl");
    let request = Request {
        sample_g: 10.0,
        end_points_ph: Vec::new(),
        points: 21,
        in_use_sample_ml: None,
        carbonated_percent: None,
    };
    let p = qc::predict(&library, &constants, &report.batch, &titrant, &request).expect("qc");
    for e in p.end_points.iter().filter(|e| !e.at_start) {
        assert!(html.contains(&format!("{:.2}", e.ml)), "{} mL", e.ml);
    }
    // Every caution in full, and the deferral.
    let cautions = hazard::assemble(
        &library,
        &constants,
        &report.batch,
        Some(&report.solution),
        Some(&project.settings.adjuster),
    );
    for c in cautions.iter() {
        assert!(html.contains(&escape(&c.title)), "{}", c.title);
        assert!(html.contains(&escape(&c.text)), "{}", c.text);
    }
    assert!(html.contains(&escape(DEFER)));
    // Self-contained: no scripts, no external resources; a print stylesheet.
    assert!(!html.contains("<script"));
    for external in ["src=\"http", "href=\"http", "@import", "url("] {
        assert!(!html.contains(external), "{external}");
    }
    assert!(html.contains("@media print"));
    assert!(
        html.matches("<svg").count() >= 3,
        "dose, species and QC charts inline"
    );
}

#[test]
fn the_sheet_always_defers_even_without_cautions() {
    // Water and a little salt: nothing to caution about, still the deferral.
    let mut project = Project::with_recipe(saltwise_chem::Recipe::in_grams(&[
        ("water", 990.0),
        ("sodium_chloride", 10.0),
    ]));
    project.name = "Plain brine (invented)".into();
    let html = sheet_html(&project, BatchSize::grams(2000.0));
    assert!(html.contains(&escape(DEFER)));
    assert!(html.contains("no dose"), "no target, no dose instruction");
}

#[test]
fn hostile_names_are_escaped() {
    let mut project = Project::demo();
    project.name = "<script>alert('x')</script> & co".into();
    // Variant names may refuse some characters; the project name and the date carry the attack
    // when they do.
    let _ = project.rename_variant(0, "<img src=x onerror=alert(1)>");
    let library = library();
    let sheet = batch_sheet(&SheetRequest {
        project: &project,
        library: &library,
        variant: 0,
        batch: None,
        date: "<b>today</b>".into(),
        qc: None,
    })
    .expect("sheet");
    let html = batch_sheet_html(&sheet).expect("html");
    assert!(!html.contains("<script"));
    assert!(!html.contains("<img"));
    assert!(!html.contains("<b>today"));
    assert!(html.contains("&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; co"));
    assert!(html.contains("&lt;b&gt;today&lt;/b&gt;"));
}

#[test]
fn a_variant_the_project_lacks_and_a_bad_batch_are_refused() {
    let project = Project::demo();
    let library = library();
    let mut req = SheetRequest {
        project: &project,
        library: &library,
        variant: 7,
        batch: None,
        date: String::new(),
        qc: None,
    };
    assert!(matches!(
        batch_sheet(&req),
        Err(ExportError::NoVariant { index: 7, count: 1 })
    ));
    req.variant = 0;
    req.batch = Some(BatchSize::grams(0.0));
    assert!(matches!(batch_sheet(&req), Err(ExportError::BatchSize(_))));
}

/// The demo's charts: dose curve, species, QC titration.
fn charts() -> (DoseChart, SpeciesChart, TitrationChart) {
    let project = Project::demo();
    let library = library();
    let constants = constants(&library, &project);
    let report = evaluate_with(&library, &constants, project.recipe()).expect("solves");
    let dose = DoseChart::compute(
        &library,
        &constants,
        &report.batch,
        &project.settings.adjuster,
        project.settings.dose_max_g,
        None,
    )
    .expect("dose chart");
    let species = SpeciesChart::compute(&library, &constants, &report, None).expect("species");
    let titrant = Titrant::find(&library, "naoh", 0.1).expect("naoh");
    let request = Request {
        sample_g: 10.0,
        end_points_ph: Vec::new(),
        points: 41,
        in_use_sample_ml: None,
        carbonated_percent: None,
    };
    let p = qc::predict(&library, &constants, &report.batch, &titrant, &request).expect("qc");
    (
        dose,
        species,
        TitrationChart::from_prediction("0.1 N NaOH", 10.0, &p),
    )
}

/// Parses an SVG document to the end; returns the number of drawn shapes (path, polyline,
/// line, rect, circle, polygon) and the text of its `<text>` elements.
fn parse_svg(svg: &str) -> (usize, String) {
    let mut reader = quick_xml::Reader::from_str(svg);
    let (mut shapes, mut texts, mut in_text) = (0, String::new(), false);
    let mut roots = 0;
    loop {
        match reader.read_event().expect("well-formed SVG") {
            Event::Start(e) | Event::Empty(e) => {
                let name = e.name();
                let n = name.as_ref();
                if n == b"svg" {
                    roots += 1;
                }
                if matches!(
                    n,
                    b"path" | b"polyline" | b"line" | b"rect" | b"circle" | b"polygon"
                ) {
                    shapes += 1;
                }
                in_text = n == b"text";
            }
            Event::Text(t) if in_text => {
                texts.push_str(&t.decode().expect("text"));
                texts.push('\n');
            }
            Event::End(_) => in_text = false,
            Event::Eof => break,
            _ => {}
        }
    }
    assert_eq!(roots, 1);
    (shapes, texts)
}

#[test]
fn every_chart_is_well_formed_svg_with_its_curves_and_labels() {
    let (dose, species, titration) = charts();
    let cases = [
        (Chart::Dose(&dose), "pH"),
        (Chart::BufferCapacity(&dose), "Buffer capacity"),
        (Chart::Species(&species), "Fraction"),
        (Chart::Titration(&titration), "Titrant, mL"),
    ];
    for (chart, label) in cases {
        let text = svg(chart, Size::DEFAULT).expect("svg");
        let (shapes, texts) = parse_svg(&text);
        // Axes, grid and at least one curve.
        assert!(shapes > 10, "{}: {shapes} shapes", chart.stem());
        assert!(texts.contains(label), "{}: {texts}", chart.stem());
    }
    // Every form of the species chart is named in its legend.
    let (_, texts) = parse_svg(&svg(Chart::Species(&species), Size::DEFAULT).expect("svg"));
    for f in &species.forms {
        assert!(texts.contains(f.as_str()), "{f}");
    }
}

#[test]
fn every_chart_is_a_png_of_the_size_asked() {
    let (dose, species, titration) = charts();
    let size = Size {
        width: 640,
        height: 400,
    };
    for chart in [
        Chart::Dose(&dose),
        Chart::BufferCapacity(&dose),
        Chart::Species(&species),
        Chart::Titration(&titration),
    ] {
        let bytes = png(chart, size).expect("png");
        let decoder = ::png::Decoder::new(std::io::Cursor::new(bytes));
        let mut reader = decoder.read_info().expect("PNG header");
        assert_eq!(reader.info().width, 640);
        assert_eq!(reader.info().height, 400);
        let mut pixels = vec![0; reader.output_buffer_size().expect("buffer size")];
        reader.next_frame(&mut pixels).expect("PNG data");
        // Drawn, not blank: a good share of the pixels is not white.
        let drawn = pixels
            .chunks(3)
            .filter(|p| p.iter().any(|&c| c < 200))
            .count();
        assert!(drawn > 2000, "{}: {drawn} drawn pixels", chart.stem());
    }
}

#[test]
fn picture_sizes_outside_the_limits_are_refused() {
    let (dose, _, _) = charts();
    for (width, height) in [(0, 400), (640, 9000)] {
        let size = Size { width, height };
        assert!(matches!(
            svg(Chart::Dose(&dose), size),
            Err(ExportError::Size { .. })
        ));
        assert!(matches!(
            png(Chart::Dose(&dose), size),
            Err(ExportError::Size { .. })
        ));
    }
    let empty = DoseChart {
        points: Vec::new(),
        ..dose
    };
    assert!(matches!(
        svg(Chart::Dose(&empty), Size::DEFAULT),
        Err(ExportError::EmptyChart { .. })
    ));
}

fn read_csv(text: &str) -> (Vec<String>, Vec<Vec<f64>>) {
    let mut r = ::csv::Reader::from_reader(text.as_bytes());
    let header = r
        .headers()
        .expect("header")
        .iter()
        .map(str::to_owned)
        .collect();
    let rows = r
        .records()
        .map(|rec| {
            rec.expect("row")
                .iter()
                .map(|c| c.parse::<f64>().expect("number"))
                .collect()
        })
        .collect();
    (header, rows)
}

#[test]
fn every_curve_reads_back_from_its_csv() {
    let (dose, species, titration) = charts();
    let (h, rows) = read_csv(&csv(Chart::Dose(&dose)).expect("csv"));
    assert_eq!(h, saltwise_export::table::DOSE_HEADER);
    assert_eq!(rows.len(), dose.points.len());
    for (row, p) in rows.iter().zip(&dose.points) {
        // Rust's shortest round-trip formatting: exact.
        assert_eq!(row, &vec![p.dose_g, p.ph, p.buffer_capacity]);
    }
    let (h, rows) = read_csv(&csv(Chart::BufferCapacity(&dose)).expect("csv"));
    assert_eq!(h, saltwise_export::table::BUFFER_HEADER);
    assert_eq!(rows.len(), dose.points.len());
    let (h, rows) = read_csv(&csv(Chart::Species(&species)).expect("csv"));
    assert_eq!(h.len(), species.forms.len() + 1);
    assert_eq!(h[0], "ph");
    assert_eq!(h[1], format!("fraction {}", species.forms[0]));
    assert_eq!(rows.len(), species.ph.len());
    for (i, row) in rows.iter().enumerate() {
        assert_eq!(row[0], species.ph[i]);
        for (j, f) in species.fractions.iter().enumerate() {
            assert_eq!(row[j + 1], f[i]);
        }
    }
    let (h, rows) = read_csv(&csv(Chart::Titration(&titration)).expect("csv"));
    assert_eq!(h, saltwise_export::table::TITRATION_HEADER);
    assert_eq!(
        rows,
        titration
            .points
            .iter()
            .map(|p| vec![p.ml, p.ph])
            .collect::<Vec<_>>()
    );
}

#[test]
fn numbers_are_shown_to_significant_figures() {
    // Worked by hand: 4 significant figures, plain notation.
    assert_eq!(sig(187.5, 4), "187.5");
    assert_eq!(sig(0.3125, 4), "0.3125");
    assert_eq!(sig(5000.0, 4), "5000");
    assert_eq!(sig(7.5, 4), "7.500");
    assert_eq!(plain(7.5, 4), "7.5");
    assert_eq!(plain(5000.0, 6), "5000");
    assert_eq!(plain(0.1, 3), "0.1");
}

#[test]
fn the_dose_instruction_is_for_the_batch_as_scaled() {
    // Doses scale with the batch: twice the batch, twice the dose (pH is intensive).
    let project = Project::demo();
    let library = library();
    let dose_at = |g: f64| {
        let sheet = batch_sheet(&SheetRequest {
            project: &project,
            library: &library,
            variant: 0,
            batch: Some(BatchSize::grams(g)),
            date: String::new(),
            qc: None,
        })
        .expect("sheet");
        match sheet.dose {
            DoseInstruction::Add { amount_g, .. } => amount_g,
            other => panic!("{other:?}"),
        }
    };
    let (one, two) = (dose_at(1000.0), dose_at(2000.0));
    // Relative 1e-6: the root solve's own tolerance is far tighter (curve.rs, 1e-10 in pH).
    assert!((two / one - 2.0).abs() < 1e-6, "{one} {two}");
}

/// pH against dilution of an invented product on a log axis, two curves sharing their x.
fn dilution_chart() -> saltwise_export::LineChart {
    let xs: Vec<f64> = (0..=30).map(|i| 10f64.powf(f64::from(i) / 10.0)).collect();
    let series = |name: &str, start: f64, dashed: bool| saltwise_export::Series {
        name: name.into(),
        points: xs.iter().map(|&x| (x, start - 0.5 * x.log10())).collect(),
        color: saltwise_export::chart::PH_LINE,
        dashed,
    };
    saltwise_export::LineChart {
        title: "pH against dilution".into(),
        x_label: "Dilution".into(),
        y_label: "pH".into(),
        x_column: "dilution".into(),
        series: vec![series("Main", 11.0, false), series("Lean", 10.5, true)],
        marker: Some((1.0, "Product as made".into())),
        log_x: true,
    }
}

#[test]
fn a_line_chart_draws_as_svg_and_png_and_reads_back_from_csv() {
    let chart = dilution_chart();
    let (shapes, texts) = parse_svg(&svg(Chart::Lines(&chart), Size::DEFAULT).expect("svg"));
    assert!(shapes > 10, "{shapes}");
    for label in [
        "pH against dilution",
        "Dilution",
        "Main",
        "Lean",
        "Product as made",
    ] {
        assert!(texts.contains(label), "{label}: {texts}");
    }
    let bytes = png(Chart::Lines(&chart), Size::DEFAULT).expect("png");
    let reader = ::png::Decoder::new(std::io::Cursor::new(bytes))
        .read_info()
        .expect("PNG header");
    assert_eq!(reader.info().width, Size::DEFAULT.width);
    // Shared x: one x column, one column per curve, exact numbers.
    let (h, rows) = read_csv(&csv(Chart::Lines(&chart)).expect("csv"));
    assert_eq!(h, vec!["dilution", "Main", "Lean"]);
    assert_eq!(rows.len(), 31);
    assert_eq!(rows[10][0], chart.series[0].points[10].0);
    assert_eq!(rows[10][2], chart.series[1].points[10].1);
    // A log axis cannot start at 0.
    let mut bad = chart.clone();
    bad.series[0].points[0].0 = 0.0;
    assert!(matches!(
        svg(Chart::Lines(&bad), Size::DEFAULT),
        Err(ExportError::Draw(_))
    ));
    // Curves with their own x go one row per point.
    bad.series[0].points[0].0 = 0.5;
    bad.log_x = false;
    let text = csv(Chart::Lines(&bad)).expect("csv");
    assert!(text.starts_with("series,dilution,y\n"), "{text}");
}
