//! Byte ranges into a sheet's source text. Line and column are computed only when a diagnostic
//! is drawn, so spans stay two integers everywhere else.

/// A half-open byte range `start..end` in one source text.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default)]
pub struct Span {
    pub start: usize,
    pub end: usize,
}

impl Span {
    pub fn new(start: usize, end: usize) -> Span {
        Span { start, end }
    }

    /// The smallest span covering both.
    pub fn to(self, other: Span) -> Span {
        Span {
            start: self.start.min(other.start),
            end: self.end.max(other.end),
        }
    }

    pub fn shifted(self, offset: usize) -> Span {
        Span {
            start: self.start + offset,
            end: self.end + offset,
        }
    }

    pub fn range(self) -> std::ops::Range<usize> {
        self.start..self.end
    }
}
