//! Rainflow counting of a scalar history (ASTM E1049-85 (reapproved 2017), "Standard Practices
//! for Cycle Counting in Fatigue Analysis", §5.4.4, the three-point method for a history that is
//! not repeated): ranges are formed from the last three reversals on a stack; a range Y that is
//! not larger than the following range X is counted as one cycle and its two points leave the
//! stack, unless Y holds the history's starting point, in which case it is counted as one half
//! cycle and only its first point leaves; what is left at the end (the residue) is counted as
//! half cycles.

/// One counted range: a full cycle (`count` 1) or a half cycle (`count` 0.5).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Cycle {
    /// Range (peak minus valley, ≥ 0), in the history's unit.
    pub range: f64,
    /// Mean of the two reversals.
    pub mean: f64,
    /// 1 for a full cycle, 0.5 for a half cycle.
    pub count: f64,
    /// Index into the history of the range's first reversal.
    pub from: usize,
    /// Index into the history of the range's second reversal.
    pub to: usize,
}

impl Cycle {
    /// Half the range.
    #[must_use]
    pub fn amplitude(&self) -> f64 {
        0.5 * self.range
    }
}

/// Indices of the reversals (peaks and valleys) of `values`: the first and the last point, and
/// every point where the direction changes; runs of equal values count once (their first point).
/// NaN values are skipped.
#[must_use]
pub fn reversals(values: &[f64]) -> Vec<usize> {
    let mut out: Vec<usize> = Vec::new();
    let mut direction = 0.0_f64;
    for (i, &v) in values.iter().enumerate() {
        if v.is_nan() {
            continue;
        }
        let Some(&last) = out.last() else {
            out.push(i);
            continue;
        };
        let step = v - values[last];
        if step == 0.0 {
            continue;
        }
        if direction == 0.0 || step.signum() == direction {
            // Still going the same way: the newest point replaces the last one, unless the
            // last one is the very first point (which always stays).
            if direction != 0.0 && out.len() > 1 {
                out.pop();
            }
            out.push(i);
        } else {
            out.push(i);
        }
        direction = step.signum();
    }
    out
}

/// Counts the cycles of `values` by the three-point rainflow method. Ranges of zero are not
/// reported.
#[must_use]
pub fn count(values: &[f64]) -> Vec<Cycle> {
    let mut cycles = Vec::new();
    let mut stack: Vec<usize> = Vec::new();
    let cycle = |a: usize, b: usize, count: f64| Cycle {
        range: (values[b] - values[a]).abs(),
        mean: 0.5 * (values[a] + values[b]),
        count,
        from: a,
        to: b,
    };
    for i in reversals(values) {
        stack.push(i);
        while stack.len() >= 3 {
            let n = stack.len();
            let x = (values[stack[n - 1]] - values[stack[n - 2]]).abs();
            let y = (values[stack[n - 2]] - values[stack[n - 3]]).abs();
            if x < y {
                break;
            }
            if n == 3 {
                // Y holds the starting point: a half cycle, and the start moves on.
                cycles.push(cycle(stack[0], stack[1], 0.5));
                stack.remove(0);
            } else {
                cycles.push(cycle(stack[n - 3], stack[n - 2], 1.0));
                let last = stack[n - 1];
                stack.truncate(n - 3);
                stack.push(last);
            }
        }
    }
    for w in stack.windows(2) {
        cycles.push(cycle(w[0], w[1], 0.5));
    }
    cycles.retain(|c| c.range > 0.0);
    cycles
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reversals_drop_points_that_keep_the_direction_and_repeated_values() {
        let v = [0.0, 1.0, 2.0, 2.0, 1.0, 1.0, 3.0, 3.0];
        assert_eq!(reversals(&v), vec![0, 2, 4, 6]);
        assert_eq!(reversals(&[5.0, 5.0, 5.0]), vec![0]);
        assert!(count(&[5.0, 5.0]).is_empty());
    }

    #[test]
    fn astm_e1049_rainflow_example() {
        // ASTM E1049-85 (2017), Fig. 6 / Table 4: loading -2, 1, -3, 5, -1, 3, -4, 4, -2 gives
        // range 3: ½ cycle, 4: 1½, 6: ½, 8: 1, 9: ½ (the standard's worked example, from memory
        // of its table, and the same figures as the `rainflow` Python package's tests).
        let v = [-2.0, 1.0, -3.0, 5.0, -1.0, 3.0, -4.0, 4.0, -2.0];
        let mut by_range = std::collections::BTreeMap::<i64, f64>::new();
        for c in count(&v) {
            *by_range.entry(c.range.round() as i64).or_default() += c.count;
        }
        let got: Vec<(i64, f64)> = by_range.into_iter().collect();
        assert_eq!(got, vec![(3, 0.5), (4, 1.5), (6, 0.5), (8, 1.0), (9, 0.5)]);
    }

    #[test]
    fn a_cycle_knows_its_reversals() {
        let v = [0.0, 10.0, 4.0, 6.0, 0.0];
        let full: Vec<Cycle> = count(&v).into_iter().filter(|c| c.count == 1.0).collect();
        assert_eq!(full.len(), 1);
        assert_eq!(
            (full[0].from, full[0].to, full[0].range, full[0].mean),
            (2, 3, 2.0, 5.0)
        );
    }
}
