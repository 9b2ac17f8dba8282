//! Placeholder until the numerics module lands (replaced in this change).
pub struct Root {
    pub x: f64,
    pub iterations: u32,
    pub residual: f64,
}
#[derive(Debug)]
pub enum SolveError<E> {
    NoSignChange {
        lower: f64,
        upper: f64,
        f_lower: f64,
        f_upper: f64,
    },
    Discontinuous {
        near: f64,
        f_left: f64,
        f_right: f64,
    },
    NotConverged {
        iterations: u32,
    },
    Function(E),
    BadBracket,
}
impl<E> std::fmt::Display for SolveError<E> {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str("solve error")
    }
}
pub fn brent<E>(
    _f: impl FnMut(f64) -> Result<f64, E>,
    _lower: f64,
    _upper: f64,
    _x_tolerance: f64,
    _max_iterations: u32,
) -> Result<Root, SolveError<E>> {
    Err(SolveError::BadBracket)
}
