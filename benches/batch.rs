//! Ranking a finite-element table: one million rows (id + six components, an invented random
//! field generated here), read, analysed (von Mises) and ranked top 100, from memory so the
//! disk does not enter. Run: `cargo bench --bench batch`; `scripts/bench-batch.sh` times the
//! command against pandas + numpy on the same file. Figures go in notes, never in tests.

use std::fmt::Write as _;
use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use planewise::mechanics::criteria::Strengths;
use planewise::mechanics::search::{Measure as PlaneMeasure, SearchSettings};
use planewise::mechanics::{SignConvention, StressUnit};
use planewise::study::EnvelopeMeasure;
use planewise::study::table::{Measure, TableOptions, rank};

fn table(rows: usize) -> Vec<u8> {
    let mut state: u64 = 0x9e37_79b9_7f4a_7c15;
    let mut next = || {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        ((state >> 11) as f64 / (1u64 << 53) as f64) * 400.0 - 200.0
    };
    let mut text = String::from("id,xx,yy,zz,xy,yz,zx\n");
    for i in 0..rows {
        let _ = write!(text, "{}", i + 1);
        for _ in 0..6 {
            let _ = write!(text, ",{:.6}", next());
        }
        text.push('\n');
    }
    text.into_bytes()
}

fn batch(c: &mut Criterion) {
    let bytes = table(1_000_000);
    let settings = SearchSettings::plain(PlaneMeasure::Shear, SignConvention::TensionPositive);
    let strengths = Strengths::default();
    let measure = Measure {
        measure: EnvelopeMeasure::VonMises,
        convention: SignConvention::TensionPositive,
        plane_settings: &settings,
        strengths: &strengths,
    };
    let options = TableOptions {
        top: Some(100),
        ..TableOptions::new(StressUnit::MPa, SignConvention::TensionPositive)
    };
    let mut group = c.benchmark_group("batch");
    group.sample_size(10);
    group.bench_function("batch_rank_1m", |b| {
        b.iter(|| {
            black_box(
                rank(
                    black_box(&bytes[..]),
                    "bench.csv",
                    &options,
                    &measure,
                    |_| true,
                )
                .map(|r| r.rows.len()),
            )
        });
    });
    group.finish();
}

criterion_group!(benches, batch);
criterion_main!(benches);
