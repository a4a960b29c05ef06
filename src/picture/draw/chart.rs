//! The 2D figures' colour map and tick helpers (the orientation map and the Mohr circles). Their
//! colours are the one palette of [`crate::picture::scene::style`], so a plane reads the same
//! in every figure.

use crate::mechanics::StressUnit;
use crate::picture::scene::style::Rgba;

/// The viridis colour map (van der Walt & Smith, matplotlib, 2015; CC0), as nine stops
/// interpolated linearly: perceptually close to uniform and readable in grey and by most
/// colour-blind readers. `t` in [0, 1].
#[must_use]
pub fn viridis(t: f64) -> [u8; 3] {
    const STOPS: [[u8; 3]; 9] = [
        [0x44, 0x01, 0x54],
        [0x48, 0x28, 0x78],
        [0x3e, 0x49, 0x89],
        [0x31, 0x68, 0x8e],
        [0x26, 0x82, 0x8e],
        [0x1f, 0x9e, 0x89],
        [0x35, 0xb7, 0x79],
        [0x6e, 0xce, 0x58],
        [0xfd, 0xe7, 0x25],
    ];
    let t = if t.is_finite() {
        t.clamp(0.0, 1.0)
    } else {
        0.0
    };
    let x = t * 8.0;
    let i = (x.floor() as usize).min(7);
    let f = x - i as f64;
    let mix = |a: u8, b: u8| (f64::from(a) + (f64::from(b) - f64::from(a)) * f).round() as u8;
    [
        mix(STOPS[i][0], STOPS[i + 1][0]),
        mix(STOPS[i][1], STOPS[i + 1][1]),
        mix(STOPS[i][2], STOPS[i + 1][2]),
    ]
}

/// Multiples of a round step between `lo` and `hi` (inclusive), about `target_count` of them.
#[must_use]
pub fn round_ticks(lo: f64, hi: f64, target_count: f64) -> Vec<f64> {
    let step = crate::text::format::round_step((hi - lo) / target_count);
    if step <= 0.0 {
        return Vec::new();
    }
    let first = (lo / step).ceil() as i64;
    let last = (hi / step).floor() as i64;
    (first..=last).map(|k| k as f64 * step).collect()
}

/// Tick positions in pascals: round multiples *in the display unit*, between `lo_pa` and
/// `hi_pa`, so that psi ticks read 500, 1000… psi rather than converted round pascals.
#[must_use]
pub fn stress_ticks(lo_pa: f64, hi_pa: f64, target_count: f64, unit: StressUnit) -> Vec<f64> {
    round_ticks(unit.from_pa(lo_pa), unit.from_pa(hi_pa), target_count)
        .into_iter()
        .map(|v| unit.to_pa(v))
        .collect()
}

/// Writes `lines`, each in its colour, as the key in the figure's top-left corner, one under
/// the other (the Mohr diagram and the orientation map).
pub fn key(
    frame: &mut super::frame::Frame,
    lines: impl IntoIterator<Item = (String, Rgba)>,
    sizes: super::frame::Sizes,
) {
    let x0 = 12.0 * sizes.line;
    let mut y = 16.0 * sizes.line;
    for (text, color) in lines {
        frame.prims.push(super::frame::Prim::Text {
            at: [x0, y],
            text,
            size: sizes.text,
            color,
            anchor: super::frame::Anchor::LeftCenter,
            halo: false,
        });
        y += sizes.text * 1.45;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_ticks_are_round_and_inside() {
        // Common practice for chart axes (1-2-5 steps), no source.
        let close = |got: Vec<f64>, want: &[f64]| {
            assert_eq!(got.len(), want.len(), "{got:?}");
            for (g, w) in got.iter().zip(want) {
                assert!((g - w).abs() < 1e-12, "{got:?}");
            }
        };
        close(round_ticks(0.13, 0.97, 4.0), &[0.2, 0.4, 0.6, 0.8]);
        close(
            round_ticks(-35.0, 120.0, 4.0),
            &[-20.0, 0.0, 20.0, 40.0, 60.0, 80.0, 100.0, 120.0],
        );
        assert!(round_ticks(1.0, 1.0, 4.0).is_empty());
        // Round in the unit shown: psi ticks are round psi, not converted round pascals.
        let psi = stress_ticks(0.0, StressUnit::Psi.to_pa(2400.0), 4.0, StressUnit::Psi);
        let shown: Vec<f64> = psi.iter().map(|&v| StressUnit::Psi.from_pa(v)).collect();
        close(shown, &[0.0, 500.0, 1000.0, 1500.0, 2000.0]);
    }
}
