//! Standard normal scores for a block of samples: drawn from a ChaCha8 stream per block, then
//! mixed by the Cholesky factor of the inputs' correlation (a Gaussian copula), so that the
//! same seed gives the same numbers whatever the number of threads.

use rand::SeedableRng;
use rand_chacha::ChaCha8Rng;
use rand_distr::{Distribution, StandardNormal};
use std::sync::Arc;

/// Samples per block. Fixed, so that a block's numbers depend only on the seed and the
/// block's index, never on how blocks are shared among threads.
pub const BLOCK: usize = 8192;

/// The generator, as stated in the output.
pub const GENERATOR: &str =
    "ChaCha8 (rand_chacha 0.9), one stream per block of 8192 samples; StandardNormal (rand_distr 0.5)";

/// The lower Cholesky factor of the correlation of the inputs' normal scores; `None` when
/// no two inputs are correlated.
#[derive(Debug, Clone, PartialEq)]
pub struct Mixing {
    lower: Option<Vec<Vec<f64>>>,
}

/// Why the correlations cannot hold together.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct NotPositiveDefinite;

/// The Pearson correlation of two normal scores whose ranks correlate by `rank` (Spearman):
/// r = 2 sin(π ρ / 6), Pearson (1907), exact for a bivariate normal. Monotone transforms keep
/// ranks, so each input's samples then have rank correlation `rank`.
pub fn score_correlation(rank: f64) -> f64 {
    2.0 * (std::f64::consts::PI * rank / 6.0).sin()
}

impl Mixing {
    /// From `(i, j, rank)` correlations among `inputs` inputs.
    pub fn new(
        inputs: usize,
        correlations: &[(usize, usize, f64)],
    ) -> Result<Mixing, NotPositiveDefinite> {
        if correlations.is_empty() {
            return Ok(Mixing { lower: None });
        }
        let mut matrix = nalgebra::DMatrix::<f64>::identity(inputs, inputs);
        for (i, j, rank) in correlations {
            let r = score_correlation(*rank);
            matrix[(*i, *j)] = r;
            matrix[(*j, *i)] = r;
        }
        let factor = matrix.cholesky().ok_or(NotPositiveDefinite)?.l();
        let lower = (0..inputs)
            .map(|row| (0..=row).map(|column| factor[(row, column)]).collect())
            .collect();
        Ok(Mixing { lower: Some(lower) })
    }

    /// The scores of block `block` (`len` samples) for each of `inputs` inputs, seeded by
    /// `seed`: input by input from one stream, then mixed.
    pub fn block_scores(
        &self,
        inputs: usize,
        seed: u64,
        block: u64,
        len: usize,
    ) -> Vec<Arc<Vec<f64>>> {
        let mut generator = ChaCha8Rng::seed_from_u64(seed);
        generator.set_stream(block);
        let independent: Vec<Vec<f64>> = (0..inputs)
            .map(|_| {
                (0..len)
                    .map(|_| StandardNormal.sample(&mut generator))
                    .collect()
            })
            .collect();
        let Some(lower) = &self.lower else {
            return independent.into_iter().map(Arc::new).collect();
        };
        lower
            .iter()
            .enumerate()
            .map(|(input, weights)| {
                if weights.len() == input + 1 && weights[..input].iter().all(|w| *w == 0.0) {
                    return Arc::new(independent[input].clone());
                }
                let mixed = (0..len)
                    .map(|sample| {
                        weights
                            .iter()
                            .zip(&independent)
                            .map(|(weight, scores)| weight * scores[sample])
                            .sum()
                    })
                    .collect();
                Arc::new(mixed)
            })
            .collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::eval::uncertainty::statistics::{correlation, ranks};

    #[test]
    fn a_block_depends_only_on_the_seed_and_its_index() {
        let mixing = Mixing::new(2, &[]).unwrap_or_else(|_| panic!("no correlation"));
        let first = mixing.block_scores(2, 7, 3, 100);
        let again = mixing.block_scores(2, 7, 3, 100);
        let other_block = mixing.block_scores(2, 7, 4, 100);
        let other_seed = mixing.block_scores(2, 8, 3, 100);
        assert_eq!(first, again);
        assert_ne!(first, other_block);
        assert_ne!(first, other_seed);
        assert_ne!(first[0], first[1]);
    }

    /// The rank correlation asked for is the one the scores show (to the sampling error of
    /// 20 000 pairs, about 0.005).
    #[test]
    fn mixed_scores_have_the_rank_correlation_asked_for() {
        for rank in [-0.8, -0.3, 0.5, 0.9] {
            let mixing = Mixing::new(2, &[(0, 1, rank)]).unwrap_or_else(|_| panic!("{rank}"));
            let scores = mixing.block_scores(2, 11, 0, 20_000);
            let (a, _) = ranks(&scores[0]);
            let (b, _) = ranks(&scores[1]);
            let measured = correlation(&a, &b).unwrap_or(f64::NAN);
            assert!(
                (measured - rank).abs() < 0.02,
                "asked {rank}, got {measured}"
            );
        }
    }

    #[test]
    fn correlations_that_cannot_hold_together_are_refused() {
        // a with b and a with c strongly positive, b with c strongly negative: impossible.
        let refused = Mixing::new(3, &[(0, 1, 0.9), (0, 2, 0.9), (1, 2, -0.9)]);
        assert_eq!(refused, Err(NotPositiveDefinite));
    }
}
