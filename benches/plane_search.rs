//! Worst-plane search and orientation-map cost. Run: `cargo bench --bench plane_search`.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use planewise::mechanics::criteria::MohrCoulomb;
use planewise::mechanics::search::{Measure, SearchSettings, worst_plane};
use planewise::mechanics::{SignConvention, StressTensor, StressUnit};

fn search(c: &mut Criterion) {
    // An invented compressive state at depth (compression-positive 20, 40, 50 MPa with shear).
    let t =
        StressTensor::from_components([20.0, 40.0, 50.0, 5.0, -3.0, 8.0], StressUnit::MPa, -1.0)
            .unwrap_or_default();
    let settings = SearchSettings {
        measure: Measure::MohrCoulomb,
        convention: SignConvention::CompressionPositive,
        pore_pressure_pa: 10e6,
        material: MohrCoulomb::new(5e6, 30.0).ok(),
    };
    let mut group = c.benchmark_group("plane_search");
    group.bench_function("worst_plane_mohr_coulomb", |b| {
        b.iter(|| black_box(worst_plane(black_box(&t), &settings)));
    });
    group.bench_function("orientation_map_256", |b| {
        b.iter(|| {
            black_box(planewise::mechanics::stereonet::orientation_map(
                black_box(&t),
                &settings,
                256,
            ))
        });
    });
    group.finish();
}

criterion_group!(benches, search);
criterion_main!(benches);
