//! Summary statistics of samples: mean, standard deviation, percentiles and Spearman's rank
//! correlation, on plain `f64`.

/// The mean and the sample standard deviation (n − 1), in two passes for accuracy, on values
/// scaled by the largest magnitude so that neither the sum nor the squares overflow.
pub fn mean_and_sd(values: &[f64]) -> (f64, f64) {
    let count = values.len() as f64;
    if values.is_empty() {
        return (f64::NAN, f64::NAN);
    }
    let largest = values
        .iter()
        .fold(0.0f64, |largest, x| largest.max(x.abs()));
    let scale = if largest > 0.0 && largest.is_finite() {
        largest
    } else {
        1.0
    };
    let mean = values.iter().map(|x| x / scale).sum::<f64>() / count;
    if values.len() < 2 {
        return (mean * scale, 0.0);
    }
    let squares: f64 = values.iter().map(|x| (x / scale - mean).powi(2)).sum();
    (mean * scale, (squares / (count - 1.0)).sqrt() * scale)
}

/// The `p`-th percentile (0 to 100) of sorted values, linear between the closest ranks:
/// h = (n − 1) p / 100, definition 7 of Hyndman & Fan (1996), the usual default of
/// statistics packages.
pub fn percentile(sorted: &[f64], p: f64) -> f64 {
    let Some(last) = sorted.len().checked_sub(1) else {
        return f64::NAN;
    };
    let h = last as f64 * (p / 100.0).clamp(0.0, 1.0);
    let below = h.floor() as usize;
    let above = (below + 1).min(last);
    // Weighted, not `a + t (b − a)`: the difference of two large values could overflow.
    let fraction = h - below as f64;
    if fraction == 0.0 {
        return sorted[below];
    }
    sorted[below] * (1.0 - fraction) + sorted[above] * fraction
}

/// Each value's rank (1-based), ties sharing their mean rank, and the values sorted.
pub fn ranks(values: &[f64]) -> (Vec<f64>, Vec<f64>) {
    let mut order: Vec<(f64, u32)> = values
        .iter()
        .enumerate()
        .map(|(index, value)| (*value, index as u32))
        .collect();
    order.sort_unstable_by(|a, b| a.0.total_cmp(&b.0));
    let mut ranks = vec![0.0; values.len()];
    let mut start = 0;
    while start < order.len() {
        let mut end = start + 1;
        while end < order.len() && order[end].0 == order[start].0 {
            end += 1;
        }
        let shared = (start + end + 1) as f64 / 2.0;
        for (_, index) in &order[start..end] {
            ranks[*index as usize] = shared;
        }
        start = end;
    }
    (ranks, order.into_iter().map(|(value, _)| value).collect())
}

/// Pearson's correlation of two equally long series; `None` when either does not vary.
pub fn correlation(x: &[f64], y: &[f64]) -> Option<f64> {
    let (mean_x, _) = mean_and_sd(x);
    let (mean_y, _) = mean_and_sd(y);
    let (mut xy, mut xx, mut yy) = (0.0, 0.0, 0.0);
    for (a, b) in x.iter().zip(y) {
        let (dx, dy) = (a - mean_x, b - mean_y);
        xy += dx * dy;
        xx += dx * dx;
        yy += dy * dy;
    }
    (xx > 0.0 && yy > 0.0).then(|| (xy / (xx * yy).sqrt()).clamp(-1.0, 1.0))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Worked by hand: 1..=5 has mean 3 and sample sd sqrt(2.5); its 25th percentile by
    /// definition 7 is at h = 1, the value 2; the 10th at h = 0.4, 1.4.
    #[test]
    fn small_series_by_hand() {
        let values = [1.0, 2.0, 3.0, 4.0, 5.0];
        let (mean, sd) = mean_and_sd(&values);
        assert_eq!(mean, 3.0);
        assert!((sd - 2.5f64.sqrt()).abs() < 1e-15);
        assert_eq!(percentile(&values, 25.0), 2.0);
        assert!((percentile(&values, 10.0) - 1.4).abs() < 1e-15);
        assert_eq!(percentile(&values, 100.0), 5.0);
        assert_eq!(percentile(&values, 0.0), 1.0);
    }

    /// Values near the largest double: no sum or square overflows.
    #[test]
    fn huge_values_keep_a_finite_spread() {
        let values = [1e308, -1e308, 5e307, 1.7e308];
        let (mean, sd) = mean_and_sd(&values);
        assert!(mean.is_finite() && sd.is_finite(), "{mean} {sd}");
        assert!((mean - 5.5e307).abs() < 1e293, "{mean}");
        let sorted = [-1.7e308, 1.7e308];
        assert_eq!(percentile(&sorted, 50.0), 0.0);
    }

    #[test]
    fn ties_share_their_mean_rank() {
        let (ranks, sorted) = ranks(&[10.0, 20.0, 10.0, 30.0]);
        assert_eq!(ranks, vec![1.5, 3.0, 1.5, 4.0]);
        assert_eq!(sorted, vec![10.0, 10.0, 20.0, 30.0]);
    }

    /// A monotone but curved relation has rank correlation 1; a reversed one −1; a constant
    /// none.
    #[test]
    fn rank_correlation_of_monotone_relations() {
        let x: Vec<f64> = (1..=50).map(f64::from).collect();
        let cubed: Vec<f64> = x.iter().map(|v| v.powi(3)).collect();
        let reversed: Vec<f64> = x.iter().map(|v| -v.exp()).collect();
        let (rx, _) = ranks(&x);
        let (rc, _) = ranks(&cubed);
        let (rr, _) = ranks(&reversed);
        assert!(correlation(&rx, &rc).is_some_and(|r| (r - 1.0).abs() < 1e-12));
        assert!(correlation(&rx, &rr).is_some_and(|r| (r + 1.0).abs() < 1e-12));
        assert_eq!(correlation(&rx, &[2.0; 50]), None);
    }
}
