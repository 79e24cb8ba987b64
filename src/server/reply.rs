//! JSON replies: success bodies, and the one error shape every route answers with,
//! `{"error": {"code", "message", "line", "column"}}`.

use axum::http::{HeaderValue, StatusCode, header};
use axum::response::{IntoResponse, Response};
use serde::Serialize;

use crate::answer::{Answer, ErrorReport};

const JSON: &str = "application/json";

/// The fields of an error body. `line` and `column` are 1-based positions in the query text
/// (or the JSON body); they are `null` for errors that have no position.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, utoipa::ToSchema)]
pub(crate) struct ErrorFields {
    pub code: &'static str,
    pub message: String,
    pub line: Option<usize>,
    pub column: Option<usize>,
    /// `parse` or `evaluate` for an error of a statement; absent otherwise.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stage: Option<&'static str>,
}

impl ErrorFields {
    pub fn new(code: &'static str, message: impl Into<String>) -> Self {
        ErrorFields {
            code,
            message: message.into(),
            line: None,
            column: None,
            stage: None,
        }
    }

    pub fn at(mut self, line: usize, column: usize) -> Self {
        self.line = Some(line);
        self.column = Some(column);
        self
    }

    /// The error of a statement, as the engine reported it.
    pub fn from_report(report: &ErrorReport) -> Self {
        ErrorFields {
            code: report.code,
            message: report.message.clone(),
            line: Some(report.line),
            column: Some(report.column),
            stage: Some(report.stage),
        }
    }
}

/// The body of every error reply.
#[derive(Serialize, utoipa::ToSchema)]
pub(crate) struct ErrorBody<'a> {
    #[schema(value_type = ErrorFields)]
    error: &'a ErrorFields,
    /// Every answer of a query whose statements all failed, so the caller sees each one.
    #[serde(skip_serializing_if = "Option::is_none")]
    #[schema(value_type = Option<Vec<Answer>>)]
    answers: Option<&'a [Answer]>,
}

/// An error reply: a status and the JSON error body.
#[derive(Debug, Clone)]
pub(crate) struct ApiError {
    pub status: StatusCode,
    pub fields: ErrorFields,
    /// Extra headers (`WWW-Authenticate`, `Retry-After`).
    pub headers: Vec<(header::HeaderName, HeaderValue)>,
}

impl ApiError {
    pub fn new(status: StatusCode, code: &'static str, message: impl Into<String>) -> Self {
        ApiError {
            status,
            fields: ErrorFields::new(code, message),
            headers: Vec::new(),
        }
    }

    pub fn with_fields(status: StatusCode, fields: ErrorFields) -> Self {
        ApiError {
            status,
            fields,
            headers: Vec::new(),
        }
    }

    pub fn header(mut self, name: header::HeaderName, value: &'static str) -> Self {
        self.headers.push((name, HeaderValue::from_static(value)));
        self
    }

    /// A 500 for trouble inside the server (a panic, a lost task).
    pub fn internal(message: impl Into<String>) -> Self {
        ApiError::new(StatusCode::INTERNAL_SERVER_ERROR, "internal", message)
    }
}

impl IntoResponse for ApiError {
    fn into_response(self) -> Response {
        let body = error_body(&self.fields, None);
        let mut response = bytes(self.status, body);
        for (name, value) in self.headers {
            response.headers_mut().insert(name, value);
        }
        response
    }
}

/// The bytes of an error body, with the answers of a failed query when given.
pub(crate) fn error_body(fields: &ErrorFields, answers: Option<&[Answer]>) -> Vec<u8> {
    let body = ErrorBody {
        error: fields,
        answers,
    };
    // Serialising plain strings, numbers and answers cannot fail; the fallback keeps the
    // reply JSON all the same.
    serde_json::to_vec(&body).unwrap_or_else(|_| {
        br#"{"error":{"code":"internal","message":"could not write the error","line":null,"column":null}}"#
            .to_vec()
    })
}

/// A JSON reply from bytes already serialised.
pub(crate) fn bytes(status: StatusCode, body: Vec<u8>) -> Response {
    let mut response = (status, body).into_response();
    response
        .headers_mut()
        .insert(header::CONTENT_TYPE, HeaderValue::from_static(JSON));
    response
}

/// A JSON reply of any serialisable value.
pub(crate) fn json(status: StatusCode, value: &impl Serialize) -> Response {
    match serde_json::to_vec(value) {
        Ok(body) => bytes(status, body),
        Err(e) => ApiError::internal(format!("could not write the reply: {e}")).into_response(),
    }
}

/// Line and column (1-based, column in characters) of byte `offset` in `text`.
pub(crate) fn line_column(text: &str, offset: usize) -> (usize, usize) {
    crate::query::line_column(text, offset.min(text.len()))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn error_body_has_the_four_fields_and_null_positions() {
        let body = error_body(&ErrorFields::new("no-such-route", "no route"), None);
        let v: serde_json::Value = serde_json::from_slice(&body).unwrap();
        assert_eq!(v["error"]["code"], "no-such-route");
        assert_eq!(v["error"]["message"], "no route");
        assert!(v["error"]["line"].is_null());
        assert!(v["error"]["column"].is_null());
        assert!(v["error"].get("stage").is_none());
        assert!(v.get("answers").is_none());
    }

    #[test]
    fn positions_are_one_based() {
        let fields = ErrorFields::new("bad-json", "x").at(2, 5);
        let v = serde_json::to_value(&fields).unwrap();
        assert_eq!(
            (v["line"].as_u64(), v["column"].as_u64()),
            (Some(2), Some(5))
        );
        assert_eq!(line_column("ab\ncd", 4), (2, 2));
    }
}
