//! Per-frame CPU work of the 3D view and the cost of a large PNG export.
//! Run: `cargo bench --bench view`. Figures go in notes, never in tests.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use planewise::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};
use planewise::picture::draw::camera::Camera;
use planewise::picture::draw::{Sizes, egui_backend, figure, png, render};
use planewise::picture::scene::{FaceChoice, Layers, Scene, SceneInput};

fn demo_input(t: &StressTensor) -> SceneInput<'_> {
    SceneInput {
        tensor: t,
        plane: PlaneNormal::from_vector(nalgebra::Vector3::new(1.0, 0.5, 0.3))
            .unwrap_or(PlaneNormal::X),
        unit: StressUnit::MPa,
        convention: SignConvention::TensionPositive,
        // Every layer on, the ellipsoid included: the heaviest ordinary frame.
        layers: Layers {
            ellipsoid: true,
            ..Layers::default()
        },
        faces: FaceChoice::FacingViewer,
        worst_planes: &[],
        marked_plane: None,
    }
}

/// Scene, projection, lighting, depth order, label placement, egui shapes and egui's
/// tessellation into triangles: everything the CPU does for the 3D view in one window frame.
fn frame_cpu(ctx: &egui::Context, raw: &egui::RawInput, input: &SceneInput<'_>, camera: &Camera) {
    let output = ctx.run_ui(raw.clone(), |ui| {
        let rect = ui.max_rect();
        let scene = Scene::build(black_box(input), &camera.towards_eye());
        let frame = render(
            &scene,
            camera,
            rect.width(),
            rect.height(),
            Sizes::default(),
        );
        ui.painter()
            .extend(egui_backend::shapes(&frame, rect, ui.ctx()));
    });
    black_box(ctx.tessellate(output.shapes, output.pixels_per_point));
}

fn view(c: &mut Criterion) {
    let t = StressTensor::from_components(
        [120.0, -35.0, 15.0, 48.0, -12.0, 22.0],
        StressUnit::MPa,
        1.0,
    )
    .unwrap_or_default();
    let input = demo_input(&t);
    let camera = Camera::default();
    let ctx = egui::Context::default();
    let raw = egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(
            egui::Pos2::ZERO,
            egui::vec2(1280.0, 800.0),
        )),
        ..Default::default()
    };
    // Every layer the view has: element, traction field, lit ellipsoid, cut plane, faces,
    // principal axes, labels with placement, legend.
    let all = SceneInput {
        layers: Layers {
            ellipsoid: true,
            element: true,
            traction_field: true,
            ..Layers::default()
        },
        ..input
    };
    let mut group = c.benchmark_group("view");
    group.bench_function("frame_cpu_1280x800", |b| {
        b.iter(|| frame_cpu(&ctx, &raw, &input, &camera));
    });
    group.bench_function("frame_cpu_all_layers", |b| {
        b.iter(|| frame_cpu(&ctx, &raw, &all, &camera));
    });
    // The program's own share of that frame: scene, projection, lighting, depth order and
    // label placement, without egui.
    group.bench_function("render_all_layers", |b| {
        b.iter(|| {
            let scene = Scene::build(black_box(&all), &camera.towards_eye());
            black_box(render(&scene, &camera, 1280.0, 800.0, Sizes::default()))
        });
    });
    group.sample_size(10);
    group.bench_function("figure_png_3840x2160", |b| {
        b.iter(|| black_box(png::to_png(&figure(black_box(&input), &camera, 3840, 2160))));
    });
    group.finish();
}

criterion_group!(benches, view);
criterion_main!(benches);
