//! The laws an uncertain input can follow, in checked SI numbers, and how a standard normal
//! score becomes a sample of each: x = F⁻¹(Φ(z)), kept inside the bounds by drawing the
//! probability from [F(low), F(high)] instead of rejecting samples (so a rank correlation,
//! which acts on the scores, survives truncation, and no sample is ever thrown away).

use super::normal::{normal_cdf, normal_quantile};

/// A family with its parameters, SI.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Law {
    Normal {
        mean: f64,
        sd: f64,
    },
    /// `sdln` is the standard deviation of ln x (ln of the multiplicative standard deviation).
    LogNormal {
        median: f64,
        sdln: f64,
    },
    Uniform {
        low: f64,
        high: f64,
    },
    LogUniform {
        low: f64,
        high: f64,
    },
    Triangular {
        low: f64,
        high: f64,
        likely: f64,
    },
}

/// A law kept between bounds (or not): what one input's samples are drawn from.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Spread {
    pub law: Law,
    /// `between low and high`, SI.
    pub bounds: Option<(f64, f64)>,
    /// F(low) and F(high) of the bounds: the share of the law that is kept.
    kept: (f64, f64),
}

/// Why bounds cannot be applied.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum BoundsError {
    /// The law puts (almost) no probability between them.
    NothingInside { share: f64 },
}

/// Bounds that keep less than this share of a law are refused: the inverse CDF would be
/// drawing from rounding error.
pub const SMALLEST_KEPT_SHARE: f64 = 1e-9;

impl Law {
    /// F(x).
    pub fn cdf(&self, x: f64) -> f64 {
        match *self {
            Law::Normal { mean, sd } => normal_cdf((x - mean) / sd),
            Law::LogNormal { median, sdln } if x > 0.0 => normal_cdf((x / median).ln() / sdln),
            Law::LogNormal { .. } => 0.0,
            Law::Uniform { low, high } => ((x - low) / (high - low)).clamp(0.0, 1.0),
            Law::LogUniform { low, high } if x > low => {
                ((x / low).ln() / (high / low).ln()).clamp(0.0, 1.0)
            }
            Law::LogUniform { .. } => 0.0,
            Law::Triangular { low, high, likely } => {
                if x <= low {
                    0.0
                } else if x >= high {
                    1.0
                } else if x <= likely {
                    (x - low).powi(2) / ((high - low) * (likely - low))
                } else {
                    1.0 - (high - x).powi(2) / ((high - low) * (high - likely))
                }
            }
        }
    }

    /// F⁻¹(p), 0 < p < 1.
    pub fn quantile(&self, p: f64) -> f64 {
        match *self {
            Law::Normal { mean, sd } => mean + sd * normal_quantile(p),
            Law::LogNormal { median, sdln } => median * (sdln * normal_quantile(p)).exp(),
            Law::Uniform { low, high } => low + p * (high - low),
            Law::LogUniform { low, high } => low * (p * (high / low).ln()).exp(),
            Law::Triangular { low, high, likely } => {
                let width = high - low;
                let at_likely = (likely - low) / width;
                if p <= at_likely {
                    low + (p * width * (likely - low)).sqrt()
                } else {
                    high - ((1.0 - p) * width * (high - likely)).sqrt()
                }
            }
        }
    }
}

impl Spread {
    /// The law, kept between `bounds` if given.
    pub fn new(law: Law, bounds: Option<(f64, f64)>) -> Result<Spread, BoundsError> {
        let kept = match bounds {
            None => (0.0, 1.0),
            Some((low, high)) => (law.cdf(low), law.cdf(high)),
        };
        let share = kept.1 - kept.0;
        if share < SMALLEST_KEPT_SHARE || share.is_nan() {
            return Err(BoundsError::NothingInside { share });
        }
        Ok(Spread { law, bounds, kept })
    }

    /// The median of the kept law: the value shown when the sheet is not sampled.
    pub fn median(&self) -> f64 {
        self.keep_inside(self.law.quantile(0.5 * (self.kept.0 + self.kept.1)))
    }

    /// The samples for standard normal `scores`, one each, into `samples`.
    pub fn transform(&self, scores: &[f64], samples: &mut Vec<f64>) {
        samples.clear();
        samples.reserve(scores.len());
        match (self.law, self.bounds) {
            // The direct forms: exact, and the fast path of the common inputs.
            (Law::Normal { mean, sd }, None) => {
                samples.extend(scores.iter().map(|z| mean + sd * z));
            }
            (Law::LogNormal { median, sdln }, None) => {
                samples.extend(scores.iter().map(|z| median * (sdln * z).exp()));
            }
            _ => {
                let (from, width) = (self.kept.0, self.kept.1 - self.kept.0);
                samples.extend(scores.iter().map(|z| {
                    let p = from + width * normal_cdf(*z);
                    // A probability of exactly 0 or 1 (a score past ±38) stays in the law.
                    let p = p.clamp(f64::MIN_POSITIVE, 1.0 - f64::EPSILON / 2.0);
                    self.keep_inside(self.law.quantile(p))
                }));
            }
        }
    }

    /// Rounding in F⁻¹ never takes a sample past a bound.
    fn keep_inside(&self, x: f64) -> f64 {
        match self.bounds {
            Some((low, high)) => x.clamp(low, high),
            None => x,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn laws() -> Vec<Law> {
        vec![
            Law::Normal { mean: 2.0, sd: 0.5 },
            Law::LogNormal {
                median: 1e-9,
                sdln: 1.1,
            },
            Law::Uniform {
                low: 0.2,
                high: 0.4,
            },
            Law::LogUniform {
                low: 1e-3,
                high: 10.0,
            },
            Law::Triangular {
                low: 0.1,
                high: 0.6,
                likely: 0.3,
            },
            Law::Triangular {
                low: 0.1,
                high: 0.6,
                likely: 0.1,
            },
        ]
    }

    #[test]
    fn quantile_inverts_the_cdf() {
        for law in laws() {
            for step in 1..100 {
                let p = step as f64 / 100.0;
                let x = law.quantile(p);
                assert!((law.cdf(x) - p).abs() < 1e-12, "{law:?} at {p}: {x}");
            }
        }
    }

    /// Closed forms: the median of a normal is its mean, of a log-normal its median, of a
    /// uniform the midpoint, of a log-uniform the geometric midpoint; a symmetric triangle's
    /// median is its peak.
    #[test]
    fn medians_of_untruncated_laws_are_the_closed_forms() {
        let median = |law| Spread::new(law, None).map(|spread| spread.median()).ok();
        assert_eq!(median(Law::Normal { mean: 2.0, sd: 0.5 }), Some(2.0));
        let lognormal = median(Law::LogNormal {
            median: 1e-9,
            sdln: 1.1,
        });
        assert!(lognormal.is_some_and(|value| (value - 1e-9).abs() < 1e-24));
        assert_eq!(
            median(Law::Uniform {
                low: 0.2,
                high: 0.4
            }),
            Some(0.30000000000000004)
        );
        let geometric = median(Law::LogUniform {
            low: 1e-3,
            high: 10.0,
        });
        assert!(geometric.is_some_and(|value| (value - 0.1).abs() < 1e-15));
        let peak = median(Law::Triangular {
            low: 0.0,
            high: 2.0,
            likely: 1.0,
        });
        assert!(peak.is_some_and(|value| (value - 1.0).abs() < 1e-15));
    }

    #[test]
    fn bounds_keep_every_sample_inside() {
        let spread = Spread::new(
            Law::Normal {
                mean: 0.35,
                sd: 0.3,
            },
            Some((0.0, 1.0)),
        );
        let Ok(spread) = spread else {
            panic!("bounds refused: {spread:?}")
        };
        let scores: Vec<f64> = (-400..=400).map(|step| step as f64 / 20.0).collect();
        let mut samples = Vec::new();
        spread.transform(&scores, &mut samples);
        assert!(samples.iter().all(|x| (0.0..=1.0).contains(x)));
        // The extreme scores reach the bounds, and the scores stay in order.
        assert!(samples.windows(2).all(|pair| pair[0] <= pair[1]));
        assert!(samples[0] < 1e-6 && samples[samples.len() - 1] > 1.0 - 1e-6);
    }

    #[test]
    fn bounds_that_keep_nothing_are_refused() {
        let far = Spread::new(Law::Normal { mean: 0.0, sd: 1.0 }, Some((40.0, 50.0)));
        assert!(matches!(far, Err(BoundsError::NothingInside { .. })));
        let outside = Spread::new(
            Law::Uniform {
                low: 0.0,
                high: 1.0,
            },
            Some((2.0, 3.0)),
        );
        assert!(matches!(outside, Err(BoundsError::NothingInside { .. })));
    }
}
