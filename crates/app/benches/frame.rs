//! Frame time of the workbench: one frame of the demo project while an amount changes, through
//! the kittest harness without rendering (the solve, the dose curve, the species and the layout).

use criterion::{Criterion, criterion_group, criterion_main};
use egui_kittest::Harness;
use saltwise::{ConfigStore, Workbench};
use saltwise_chem::project::Project;

fn frame_while_dragging(c: &mut Criterion) {
    let mut harness = Harness::builder()
        .with_size([1600.0, 1000.0])
        .build_ui_state(
            |ui, app: &mut Workbench| app.show(ui),
            Workbench::with_project(Project::demo(), ConfigStore::none()),
        );
    let mut step = 0u32;
    c.bench_function("workbench frame, demo, amount changing", |b| {
        b.iter(|| {
            step = step.wrapping_add(1);
            if let Some(line) = harness
                .state_mut()
                .project_mut()
                .recipe_mut()
                .lines
                .first_mut()
            {
                line.amount.value = 0.8 + 0.001 * f64::from(step % 200);
            }
            harness.step();
        });
    });
    c.bench_function("workbench frame, demo, nothing changing", |b| {
        b.iter(|| harness.step());
    });
}

criterion_group!(benches, frame_while_dragging);
criterion_main!(benches);
