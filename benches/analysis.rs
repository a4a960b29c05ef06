//! Throughput of the mechanics core, side by side with nalgebra's general symmetric solver.
//! Run: `cargo bench --bench analysis`. Figures go in notes, never in tests.

use std::hint::black_box;

use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use planewise::mechanics::{
    Analysis, SignConvention, StressTensor, principal_values_into, principal_values_pa,
};

/// A fixed batch of pseudo-random tensors (xorshift; no dependency, same batch every run).
fn batch(n: usize) -> Vec<StressTensor> {
    let mut state: u64 = 0x9E37_79B9_7F4A_7C15;
    let mut next = move || {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        (state >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0
    };
    (0..n)
        .filter_map(|_| StressTensor::from_pa([(); 6].map(|()| next() * 2e8)).ok())
        .collect()
}

fn analysis(c: &mut Criterion) {
    let tensors = batch(1024);
    let mut group = c.benchmark_group("analysis");
    group.throughput(Throughput::Elements(tensors.len() as u64));
    // The batch entry point, as bulk work (tables, orientation maps) calls it.
    let mut out = vec![[0.0; 3]; tensors.len()];
    group.bench_function("principal_values", |b| {
        b.iter(|| {
            principal_values_into(black_box(&tensors), &mut out);
            black_box(&out);
        });
    });
    // One call per tensor, as the window calls it.
    group.bench_function("principal_values_single", |b| {
        b.iter(|| {
            for t in &tensors {
                black_box(principal_values_pa(black_box(t)));
            }
        });
    });
    // Values and directions, as the window and the analysis need them.
    group.bench_function("principal_with_directions", |b| {
        b.iter(|| {
            for t in &tensors {
                black_box(planewise::mechanics::principal(black_box(t)));
            }
        });
    });
    group.bench_function("full_analysis", |b| {
        b.iter(|| {
            for t in &tensors {
                black_box(Analysis::new(black_box(t), SignConvention::TensionPositive));
            }
        });
    });
    group.bench_function("nalgebra_symmetric_eigen", |b| {
        b.iter(|| {
            for t in &tensors {
                black_box(nalgebra::SymmetricEigen::new(black_box(t).matrix_pa()).eigenvalues);
            }
        });
    });
    group.finish();
}

criterion_group!(benches, analysis);
criterion_main!(benches);
