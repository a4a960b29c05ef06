//! Big projects: `project show` and the envelope on 100,000 load cases (an invented project).
//! Both should grow linearly with the number of cases (issue: 100 k cases shown in ≤ 1 s).

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use planewise::study::{CaseInput, EnvelopeMeasure, LoadCase, Project, TypedTensor};

fn big(n: usize) -> Project {
    let mut p = Project::new(
        "Invented: many cases",
        planewise::mechanics::StressUnit::MPa,
        planewise::mechanics::SignConvention::TensionPositive,
    );
    for i in 0..n {
        p.cases.push(LoadCase {
            unknown: planewise::study::unknown::UnknownKeys::new(),
            name: format!("c{i}"),
            description: String::new(),
            input: CaseInput::Tensor(TypedTensor {
                unit: "MPa".to_owned(),
                compression_positive: false,
                components: [(i % 7) as f64, 1.0, 2.0, 3.0, 4.0, 5.0],
            }),
        });
    }
    p
}

fn project(c: &mut Criterion) {
    let p = big(100_000);
    let file = std::env::temp_dir().join(format!("planewise-bench-{}.json", std::process::id()));
    planewise::study::save(&file, &p).unwrap_or_default();
    let show = planewise::cli::Command::Project(planewise::cli::project::ProjectArgs {
        action: planewise::cli::project::ProjectAction::Show(planewise::cli::project::ShowArgs {
            file: file.clone(),
            json: false,
        }),
    });
    let mut group = c.benchmark_group("project");
    group.sample_size(10);
    group.bench_function("project_show_100k", |b| {
        b.iter(|| {
            black_box(
                planewise::cli::run(&show)
                    .map(|s| s.len())
                    .unwrap_or_default(),
            )
        });
    });
    let settings = p.search_settings();
    group.bench_function("envelope_von_mises_100k", |b| {
        b.iter(|| {
            black_box(
                planewise::study::envelope(&p, EnvelopeMeasure::VonMises, &settings)
                    .map(|e| e.rows.len())
                    .unwrap_or_default(),
            )
        });
    });
    group.finish();
    let _ = std::fs::remove_file(&file);
}

criterion_group!(benches, project);
criterion_main!(benches);
