//! The standard normal distribution's CDF and quantile, on plain `f64`: every law is sampled
//! as a transform of a standard normal score, so these two carry the others (the copula of a
//! rank correlation, truncation, the non-normal families).

/// Φ(z), the standard normal CDF, through `erfc` so that both tails keep their relative
/// precision on the small side.
pub fn normal_cdf(z: f64) -> f64 {
    0.5 * libm::erfc(-z / std::f64::consts::SQRT_2)
}

/// Φ⁻¹(p) for 0 < p < 1: the rational start of Abramowitz & Stegun (1964) eq. 26.2.23
/// (error below 4.5e-4), polished by Halley steps on `normal_cdf` to full precision.
pub fn normal_quantile(p: f64) -> f64 {
    if p <= 0.0 {
        return f64::NEG_INFINITY;
    }
    if p >= 1.0 {
        return f64::INFINITY;
    }
    // Work in the lower tail, where `p` itself is exact, and reflect.
    if p > 0.5 {
        return -normal_quantile(1.0 - p);
    }
    let t = (-2.0 * p.ln()).sqrt();
    let numerator = 2.515517 + t * (0.802853 + t * 0.010328);
    let denominator = 1.0 + t * (1.432788 + t * (0.189269 + t * 0.001308));
    let mut x = -(t - numerator / denominator);
    for _ in 0..3 {
        let error = normal_cdf(x) - p;
        let density = (-0.5 * x * x).exp() / (2.0 * std::f64::consts::PI).sqrt();
        if density == 0.0 {
            break;
        }
        let step = error / density;
        x -= step / (1.0 + 0.5 * x * step);
    }
    x
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Standard normal quantiles as printed in statistical tables (from memory, to the digits
    /// every table gives: 1.644854, 1.959964, 2.326348, 3.090232).
    #[test]
    fn quantiles_match_the_printed_tables() {
        for (p, z) in [
            (0.95, 1.644_853_626_951_472_2),
            (0.975, 1.959_963_984_540_054),
            (0.99, 2.326_347_874_040_841),
            (0.999, 3.090_232_306_167_813_6),
            (0.5, 0.0),
        ] {
            assert!(
                (normal_quantile(p) - z).abs() < 1e-9,
                "p {p}: {}",
                normal_quantile(p)
            );
            assert!((normal_quantile(1.0 - p) + z).abs() < 1e-9, "p {}", 1.0 - p);
        }
    }

    #[test]
    fn quantile_inverts_the_cdf_far_into_both_tails() {
        for exponent in 1..=300 {
            let p = 10f64.powi(-exponent);
            let z = normal_quantile(p);
            let back = normal_cdf(z);
            assert!((back - p).abs() <= 1e-12 * p, "p {p}: z {z}, back {back}");
        }
        for step in 1..1000 {
            let p = step as f64 / 1000.0;
            assert!((normal_cdf(normal_quantile(p)) - p).abs() < 1e-15, "p {p}");
        }
    }

    /// Φ(1.96) = 0.9750021 and Φ(-1) = 0.1586553 (printed tables, from memory).
    #[test]
    fn cdf_matches_the_printed_tables() {
        assert!((normal_cdf(1.96) - 0.975_002_104_851_780).abs() < 1e-12);
        assert!((normal_cdf(-1.0) - 0.158_655_253_931_457).abs() < 1e-12);
    }
}
