//! The options of `run` and `report` that sample a sheet's distributions (`--samples N`).

use clap::Args;

/// Sampling of a sheet's distributions, shared by `run` and `report`.
#[derive(Args, Debug, Clone)]
pub struct SampleArgs {
    /// Evaluate the sheet N times with its distributions sampled, and summarise each uncertain
    /// line (mean, sd, percentiles), each check (probability of failing) and each result (which
    /// inputs drive it)
    #[arg(long, value_name = "N", value_parser = clap::value_parser!(u64).range(2..=100_000_000))]
    pub samples: Option<u64>,
    /// The generator's seed: the same seed gives the same samples on any machine
    #[arg(long, value_name = "S", default_value_t = 1, requires = "samples")]
    pub seed: u64,
    /// Percentiles to show, 0 to 100, separated by commas
    #[arg(long, value_name = "P,P,…", value_delimiter = ',', requires = "samples", value_parser = percentile_argument)]
    pub percentiles: Vec<f64>,
    /// Threads to sample on (default: every core); the output does not depend on it
    #[arg(long, value_name = "N", requires = "samples", value_parser = clap::value_parser!(u64).range(1..=256))]
    pub threads: Option<u64>,
}

impl SampleArgs {
    pub fn sampling(&self) -> Option<crate::eval::uncertainty::Sampling> {
        let samples = usize::try_from(self.samples?).ok()?;
        let mut sampling = crate::eval::uncertainty::Sampling::new(samples, self.seed);
        if !self.percentiles.is_empty() {
            sampling.percentiles = self.percentiles.clone();
        }
        if let Some(threads) = self
            .threads
            .and_then(|threads| usize::try_from(threads).ok())
        {
            sampling.threads = threads;
        }
        Some(sampling)
    }
}

/// A percentile of `--percentiles`: a number from 0 to 100.
fn percentile_argument(text: &str) -> Result<f64, String> {
    match text.trim().trim_start_matches(['P', 'p']).parse::<f64>() {
        Ok(value) if (0.0..=100.0).contains(&value) => Ok(value),
        _ => Err(format!(
            "`{text}` is not a percentile from 0 to 100 (e.g. `5,50,95`)"
        )),
    }
}
