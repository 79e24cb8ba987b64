//! The write token: read from a file at start, and compared with a request's
//! `Authorization: Bearer <token>` in constant time.

use std::fmt;
use std::path::Path;

use axum::extract::FromRequestParts;
use axum::http::request::Parts;
use axum::http::{HeaderMap, StatusCode, header};
use sha2::{Digest, Sha256};

use super::reply::ApiError;
use super::{ServerError, Shared};

/// The secret that write operations must present. Its `Debug` form never shows it.
#[derive(Clone)]
pub struct Token {
    secret: Vec<u8>,
}

impl fmt::Debug for Token {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("Token(<hidden>)")
    }
}

impl Token {
    /// A token from its text; white space around it is not part of it. `None` when nothing
    /// is left.
    pub fn new(text: &str) -> Option<Token> {
        let secret = text.trim();
        (!secret.is_empty()).then(|| Token {
            secret: secret.as_bytes().to_vec(),
        })
    }

    /// Reads the token from a file (its whole text, trimmed, so a trailing newline is fine).
    pub fn from_file(path: &Path) -> Result<Token, ServerError> {
        let name = path.display().to_string();
        let text = std::fs::read_to_string(path).map_err(|source| ServerError::ReadToken {
            path: name.clone(),
            source,
        })?;
        Token::new(&text).ok_or(ServerError::EmptyToken { path: name })
    }

    /// Whether `given` is the token. Both are hashed first and the digests compared byte by
    /// byte without stopping at the first difference, so neither the length nor the
    /// position of a mismatch shows in the time taken.
    pub fn matches(&self, given: &[u8]) -> bool {
        let expected = Sha256::digest(&self.secret);
        let given = Sha256::digest(given);
        let difference = expected
            .iter()
            .zip(given.iter())
            .fold(0u8, |acc, (a, b)| acc | (a ^ b));
        std::hint::black_box(difference) == 0
    }
}

/// Decides whether a request may write. Without a configured token the server is read-only
/// (403); with one, the request needs `Authorization: Bearer <token>` (401 otherwise).
pub(crate) fn authorize(token: Option<&Token>, headers: &HeaderMap) -> Result<(), ApiError> {
    let Some(token) = token else {
        return Err(ApiError::new(
            StatusCode::FORBIDDEN,
            "read-only",
            "this server is read-only: start it with --token-file to allow writes",
        ));
    };
    let unauthorized = |message: &str| {
        ApiError::new(StatusCode::UNAUTHORIZED, "unauthorized", message)
            .header(header::WWW_AUTHENTICATE, "Bearer")
    };
    let Some(value) = headers.get(header::AUTHORIZATION) else {
        return Err(unauthorized(
            "this operation needs an Authorization: Bearer <token> header",
        ));
    };
    let value = value.as_bytes();
    let scheme = b"bearer ";
    if value.len() < scheme.len() || !value[..scheme.len()].eq_ignore_ascii_case(scheme) {
        return Err(unauthorized(
            "the Authorization header must be Bearer <token>",
        ));
    }
    let given = value[scheme.len()..].trim_ascii();
    if token.matches(given) {
        Ok(())
    } else {
        Err(unauthorized("the bearer token is not the server's token"))
    }
}

/// A request that presented the token. A handler taking it answers only such requests; the
/// others get the reply of [`authorize`] (403 on a read-only server, 401 otherwise).
pub(crate) struct Librarian;

impl FromRequestParts<Shared> for Librarian {
    type Rejection = ApiError;

    async fn from_request_parts(parts: &mut Parts, state: &Shared) -> Result<Self, ApiError> {
        authorize(state.token.as_ref(), &parts.headers).map(|()| Librarian)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use axum::http::HeaderValue;

    fn headers(auth: &str) -> HeaderMap {
        let mut h = HeaderMap::new();
        h.insert(header::AUTHORIZATION, HeaderValue::from_str(auth).unwrap());
        h
    }

    #[test]
    fn matches_only_the_same_token() {
        let t = Token::new(" s3cret\n").unwrap();
        assert!(t.matches(b"s3cret"));
        assert!(!t.matches(b"s3cre"));
        assert!(!t.matches(b"s3cretx"));
        assert!(!t.matches(b""));
        assert!(Token::new(" \n").is_none());
    }

    #[test]
    fn debug_hides_the_secret() {
        let t = Token::new("s3cret").unwrap();
        assert!(!format!("{t:?}").contains("s3cret"));
    }

    #[test]
    fn authorize_statuses() {
        let t = Token::new("s3cret").unwrap();
        assert_eq!(
            authorize(None, &headers("Bearer s3cret"))
                .unwrap_err()
                .status,
            StatusCode::FORBIDDEN
        );
        assert_eq!(
            authorize(Some(&t), &HeaderMap::new()).unwrap_err().status,
            StatusCode::UNAUTHORIZED
        );
        assert_eq!(
            authorize(Some(&t), &headers("Bearer nope"))
                .unwrap_err()
                .status,
            StatusCode::UNAUTHORIZED
        );
        assert_eq!(
            authorize(Some(&t), &headers("Basic s3cret"))
                .unwrap_err()
                .status,
            StatusCode::UNAUTHORIZED
        );
        assert!(authorize(Some(&t), &headers("bearer s3cret")).is_ok());
    }

    #[test]
    fn empty_token_file_is_refused() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("token");
        std::fs::write(&path, "\n").unwrap();
        assert!(matches!(
            Token::from_file(&path),
            Err(ServerError::EmptyToken { .. })
        ));
        assert!(matches!(
            Token::from_file(&dir.path().join("missing")),
            Err(ServerError::ReadToken { .. })
        ));
    }
}
