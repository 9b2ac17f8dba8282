//! Reading messages: `lsp-server` frames and parses them; this keeps the bytes of the message
//! being read, so that one the crate refuses (not JSON, not JSON-RPC) can be answered with a
//! protocol error naming its request, and reading goes on with the next message.

use lsp_server::{ErrorCode, Message, RequestId, Response};
use std::io::{self, BufRead, Read};

/// What reading the next message gave.
pub enum Incoming {
    Message(Message),
    /// A message that could not be read as JSON-RPC: the error response to send when its
    /// request id could be recovered, and what was wrong.
    Malformed {
        response: Option<Response>,
        problem: String,
    },
    /// The input ended (or broke).
    End,
}

/// Standard input, remembering the bytes of the message being read.
pub struct MessageReader<R> {
    input: R,
    consumed: Vec<u8>,
}

impl<R: BufRead> MessageReader<R> {
    pub fn new(input: R) -> MessageReader<R> {
        MessageReader {
            input,
            consumed: Vec::new(),
        }
    }

    pub fn next(&mut self) -> Incoming {
        self.consumed.clear();
        match Message::read(self) {
            Ok(Some(message)) => Incoming::Message(message),
            Ok(None) => Incoming::End,
            Err(error) if error.kind() == io::ErrorKind::InvalidData => Incoming::Malformed {
                response: self.error_response(),
                problem: error.to_string(),
            },
            Err(_) => Incoming::End,
        }
    }

    /// An "invalid request" response when the refused message is a JSON object with an id.
    fn error_response(&self) -> Option<Response> {
        let text = String::from_utf8_lossy(&self.consumed);
        let body = text.split_once("\r\n\r\n").map_or(&*text, |(_, body)| body);
        let value: serde_json::Value = serde_json::from_str(body).ok()?;
        let id: RequestId = serde_json::from_value(value.get("id")?.clone()).ok()?;
        Some(Response::new_err(
            id,
            ErrorCode::InvalidRequest as i32,
            "not a valid JSON-RPC request".to_string(),
        ))
    }
}

impl<R: BufRead> Read for MessageReader<R> {
    fn read(&mut self, buffer: &mut [u8]) -> io::Result<usize> {
        let available = self.fill_buf()?;
        let count = available.len().min(buffer.len());
        buffer[..count].copy_from_slice(&available[..count]);
        self.consume(count);
        Ok(count)
    }
}

impl<R: BufRead> BufRead for MessageReader<R> {
    fn fill_buf(&mut self) -> io::Result<&[u8]> {
        self.input.fill_buf()
    }

    fn consume(&mut self, amount: usize) {
        if let Ok(available) = self.input.fill_buf() {
            let kept = amount.min(available.len());
            self.consumed.extend_from_slice(&available[..kept]);
        }
        self.input.consume(amount);
    }
}

#[cfg(test)]
mod tests {
    use super::{Incoming, MessageReader};

    fn framed(body: &str) -> String {
        format!("Content-Length: {}\r\n\r\n{body}", body.len())
    }

    #[test]
    fn a_refused_message_is_answered_and_reading_goes_on() {
        let input = [
            framed(r#"{"jsonrpc":"2.0","id":7,"method":5}"#),
            framed("{not json"),
            framed(r#"{"jsonrpc":"2.0","method":"exit"}"#),
        ]
        .concat();
        let mut reader = MessageReader::new(input.as_bytes());
        let Incoming::Malformed {
            response: Some(response),
            ..
        } = reader.next()
        else {
            panic!("a request with a wrong method type is refused with its id");
        };
        assert_eq!(response.id, 7.into());
        assert!(matches!(
            reader.next(),
            Incoming::Malformed { response: None, .. }
        ));
        assert!(matches!(reader.next(), Incoming::Message(_)));
        assert!(matches!(reader.next(), Incoming::End));
    }
}
