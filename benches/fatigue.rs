//! Fatigue on the critical plane for one point: a 1,000-step non-proportional history (bending,
//! torsion and a transverse stress at three frequencies and phases; invented), Findley with the
//! circumscribed circle over the whole critical-plane search, and the other criteria and finite
//! life beside it. Run: `cargo bench --bench fatigue`. Figures go in notes, never in tests.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use planewise::mechanics::fatigue::circle::enclosing_circle;
use planewise::mechanics::fatigue::{
    Constants, Criterion as Fatigue, FatigueLimits, PathMethod, PlaneAxes, PlanePath,
    SearchSettings, SnCurve, StressHistory, critical_plane, damage_plane,
};

fn history(steps: usize) -> StressHistory {
    let time: Vec<f64> = (0..steps).map(|i| i as f64 / steps as f64).collect();
    let tensors = time
        .iter()
        .map(|t| {
            let w = std::f64::consts::TAU * t;
            [
                200e6 * w.sin() + 40e6 * (3.0 * w).sin(),
                60e6 * (2.0 * w + 0.4).sin(),
                0.0,
                110e6 * (w - 1.2).sin() + 30e6,
                15e6 * (5.0 * w).cos(),
                20e6 * (w + 0.7).cos(),
            ]
        })
        .collect();
    StressHistory::new(time, tensors).expect("a valid history")
}

fn fatigue(c: &mut Criterion) {
    let h = history(1000);
    let limits = FatigueLimits {
        bending_pa: Some(320e6),
        torsion_pa: 200e6,
        tensile_strength_pa: Some(800e6),
    };
    let settings = SearchSettings::default();
    let mut group = c.benchmark_group("fatigue_1000_steps");
    group.sample_size(20);
    for (name, criterion, method) in [
        ("findley_circle", Fatigue::Findley, PathMethod::Circle),
        ("findley_chord", Fatigue::Findley, PathMethod::Chord),
        ("matake_circle", Fatigue::Matake, PathMethod::Circle),
        ("dang_van_circle", Fatigue::DangVan, PathMethod::Circle),
    ] {
        let constants = Constants::derive(criterion, &limits).expect("calibrated");
        group.bench_function(name, |b| {
            b.iter(|| black_box(critical_plane(black_box(&h), &constants, method, &settings)));
        });
    }
    let k = Constants::derive(Fatigue::Findley, &limits)
        .expect("calibrated")
        .coefficient;
    let sn = SnCurve::new(550e6, -0.08, None).expect("a valid curve");
    group.bench_function("findley_damage_plane", |b| {
        b.iter(|| black_box(damage_plane(black_box(&h), k, &sn, &settings)));
    });
    // Where one plane's evaluation goes: the projection of the history on the plane, and the
    // circumscribed circle of its shear path.
    let axes = PlaneAxes::of(nalgebra::Vector3::new(0.3, -0.5, 0.8).normalize());
    let mut path = PlanePath::default();
    group.bench_function("one_plane_projection", |b| {
        b.iter(|| {
            path.fill(black_box(&h), &axes);
            black_box(&path);
        });
    });
    group.bench_function("one_plane_circle", |b| {
        b.iter(|| black_box(enclosing_circle(black_box(&path.tau))));
    });
    let constants = Constants::derive(Fatigue::Findley, &limits).expect("calibrated");
    let found = critical_plane(&h, &constants, PathMethod::Circle, &settings);
    println!("findley_circle evaluates {} planes", found.evaluations);
    group.finish();
}

criterion_group!(benches, fatigue);
criterion_main!(benches);
