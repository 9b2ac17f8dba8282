//! The standard streams as the front doors write them. A reader that goes away (`| head`)
//! closes the pipe; that is not a failure of ours and must not change the exit code, which
//! still says whether the sheet had errors, nor end in a panic (`eprintln!` panics when it
//! cannot write). Standard error is buffered per message batch: diagnostics are drawn in many
//! small pieces, and thousands of warnings were hundreds of thousands of write calls.

use codespan_reporting::term::termcolor::{Ansi, ColorSpec, NoColor, WriteColor};
use std::io::{self, BufWriter, IsTerminal, Write};

/// A writer that discards everything once its reader has closed the pipe.
pub struct PipeSafe<W: Write> {
    inner: W,
    closed: bool,
}

impl<W: Write> PipeSafe<W> {
    pub fn new(inner: W) -> Self {
        PipeSafe {
            inner,
            closed: false,
        }
    }

    /// Whether the reader went away; what was written since is lost, on purpose.
    pub fn is_closed(&self) -> bool {
        self.closed
    }

    fn absorb<T>(&mut self, result: io::Result<T>, instead: T) -> io::Result<T> {
        match result {
            Err(error) if error.kind() == io::ErrorKind::BrokenPipe => {
                self.closed = true;
                Ok(instead)
            }
            other => other,
        }
    }
}

impl<W: Write> Write for PipeSafe<W> {
    fn write(&mut self, buffer: &[u8]) -> io::Result<usize> {
        if self.closed {
            return Ok(buffer.len());
        }
        let result = self.inner.write(buffer);
        self.absorb(result, buffer.len())
    }

    fn flush(&mut self) -> io::Result<()> {
        if self.closed {
            return Ok(());
        }
        let result = self.inner.flush();
        self.absorb(result, ())
    }
}

/// Standard error, buffered until dropped (or flushed), coloured when it is a terminal and
/// `NO_COLOR` is unset; it implements `WriteColor` for diagnostics snippets.
pub enum ErrorStream {
    Coloured(Ansi<BufWriter<PipeSafe<io::Stderr>>>),
    Plain(NoColor<BufWriter<PipeSafe<io::Stderr>>>),
}

/// A fresh buffered handle on standard error; write a batch of messages through it and drop it.
pub fn error_stream() -> ErrorStream {
    let buffered = BufWriter::with_capacity(64 * 1024, PipeSafe::new(io::stderr()));
    if io::stderr().is_terminal() && std::env::var_os("NO_COLOR").is_none() {
        ErrorStream::Coloured(Ansi::new(buffered))
    } else {
        ErrorStream::Plain(NoColor::new(buffered))
    }
}

/// Writes one line to standard error; a closed or failing standard error is ignored, since
/// there is nowhere left to report it.
pub fn error_line(message: std::fmt::Arguments<'_>) {
    let mut stream = error_stream();
    let _ = writeln!(stream, "{message}");
    let _ = stream.flush();
}

/// `eprintln!` that neither panics nor fails when standard error is closed.
#[macro_export]
macro_rules! stderr_line {
    ($($argument:tt)*) => {
        $crate::front::streams::error_line(format_args!($($argument)*))
    };
}

impl Write for ErrorStream {
    fn write(&mut self, buffer: &[u8]) -> io::Result<usize> {
        match self {
            ErrorStream::Coloured(writer) => writer.write(buffer),
            ErrorStream::Plain(writer) => writer.write(buffer),
        }
    }

    fn flush(&mut self) -> io::Result<()> {
        match self {
            ErrorStream::Coloured(writer) => writer.flush(),
            ErrorStream::Plain(writer) => writer.flush(),
        }
    }
}

impl WriteColor for ErrorStream {
    fn supports_color(&self) -> bool {
        matches!(self, ErrorStream::Coloured(_))
    }

    fn set_color(&mut self, spec: &ColorSpec) -> io::Result<()> {
        match self {
            ErrorStream::Coloured(writer) => writer.set_color(spec),
            ErrorStream::Plain(writer) => writer.set_color(spec),
        }
    }

    fn reset(&mut self) -> io::Result<()> {
        match self {
            ErrorStream::Coloured(writer) => writer.reset(),
            ErrorStream::Plain(writer) => writer.reset(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A reader that has gone away.
    struct ClosedPipe;

    impl Write for ClosedPipe {
        fn write(&mut self, _: &[u8]) -> io::Result<usize> {
            Err(io::Error::from(io::ErrorKind::BrokenPipe))
        }
        fn flush(&mut self) -> io::Result<()> {
            Err(io::Error::from(io::ErrorKind::BrokenPipe))
        }
    }

    #[test]
    fn a_closed_pipe_swallows_writes_and_says_so() {
        let mut writer = PipeSafe::new(ClosedPipe);
        assert!(!writer.is_closed());
        assert_eq!(writer.write(b"abc").unwrap(), 3);
        assert!(writer.is_closed());
        writeln!(writer, "more").unwrap();
        writer.flush().unwrap();
    }

    #[test]
    fn other_errors_still_surface() {
        struct Full;
        impl Write for Full {
            fn write(&mut self, _: &[u8]) -> io::Result<usize> {
                Err(io::Error::other("disk full"))
            }
            fn flush(&mut self) -> io::Result<()> {
                Ok(())
            }
        }
        let mut writer = PipeSafe::new(Full);
        assert!(writer.write(b"x").is_err());
        assert!(!writer.is_closed());
    }
}
