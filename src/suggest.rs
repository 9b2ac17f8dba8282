//! "Did you mean" for every layer: the closest known word to a misspelt one. Names, functions
//! and session commands all use this one measure (Jaro–Winkler similarity, from `strsim`).

/// The candidate most similar to `word`, if any is at least `threshold` similar (0 to 1).
pub fn closest<'a>(
    word: &str,
    candidates: impl IntoIterator<Item = &'a str>,
    threshold: f64,
) -> Option<&'a str> {
    candidates
        .into_iter()
        .map(|candidate| (strsim::jaro_winkler(word, candidate), candidate))
        .filter(|(score, _)| *score > threshold)
        .max_by(|left, right| left.0.total_cmp(&right.0).then_with(|| right.1.cmp(left.1)))
        .map(|(_, candidate)| candidate)
}

#[cfg(test)]
mod tests {
    use super::closest;

    #[test]
    fn closest_word_above_the_threshold() {
        assert_eq!(
            closest("K_sit", ["K_site", "k_lab", "T"], 0.8),
            Some("K_site")
        );
        assert_eq!(closest("sqr", ["sqrt", "exp"], 0.8), Some("sqrt"));
        assert_eq!(closest("zzz", ["sqrt", "exp"], 0.8), None);
        // Ties go to the alphabetically first, so suggestions do not depend on map order.
        assert_eq!(closest("ab", ["ax", "aa"], 0.5), Some("aa"));
    }
}
