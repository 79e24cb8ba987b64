//! Layers around every route: one structured log line per request on the error stream, and
//! a panic anywhere in a handler turned into a 500 JSON error while the server goes on.

use std::any::Any;
use std::future::Future;
use std::io::Write;
use std::panic::{AssertUnwindSafe, catch_unwind};
use std::pin::Pin;
use std::task::{Context, Poll};
use std::time::{Instant, SystemTime, UNIX_EPOCH};

use axum::extract::{Request, State};
use axum::middleware::Next;
use axum::response::{IntoResponse, Response};

use super::Shared;
use super::reply::ApiError;

/// Writes `{"time_unix_ms", "method", "path", "status", "duration_ms"}` for each request,
/// one line of JSON, when request logs are on.
pub(crate) async fn log_request(
    State(state): State<Shared>,
    request: Request,
    next: Next,
) -> Response {
    if !state.log_requests {
        return next.run(request).await;
    }
    let started = Instant::now();
    let method = request.method().to_string();
    let path = request.uri().path().to_string();
    let response = next.run(request).await;
    let time_unix_ms = SystemTime::now()
        .duration_since(UNIX_EPOCH)
        .map_or(0, |d| d.as_millis());
    // Written by hand to keep the fields in this order; the strings go through serde_json
    // so any path is escaped.
    let line = format!(
        "{{\"time_unix_ms\":{time_unix_ms},\"method\":{},\"path\":{},\"status\":{},\"duration_ms\":{:.3}}}",
        serde_json::Value::from(method),
        serde_json::Value::from(path),
        response.status().as_u16(),
        started.elapsed().as_secs_f64() * 1000.0,
    );
    // A log line that cannot be written cannot be reported either; the reply still goes.
    let _ = writeln!(std::io::stderr().lock(), "{line}");
    response
}

/// Answers 500 with a JSON error when the rest of the request's handling panics.
pub(crate) async fn catch_panic(request: Request, next: Next) -> Response {
    match CatchUnwind(Box::pin(next.run(request))).await {
        Ok(response) => response,
        Err(payload) => ApiError::internal(format!(
            "the server failed while answering: {}",
            panic_message(payload.as_ref())
        ))
        .into_response(),
    }
}

/// The text a panic was raised with, where it has one.
pub(crate) fn panic_message(payload: &(dyn Any + Send)) -> String {
    payload
        .downcast_ref::<&str>()
        .map(|s| s.to_string())
        .or_else(|| payload.downcast_ref::<String>().cloned())
        .unwrap_or_else(|| "a panic".to_string())
}

/// A future that reports a panic in the future it wraps as `Err` instead of unwinding.
struct CatchUnwind<F>(Pin<Box<F>>);

impl<F: Future> Future for CatchUnwind<F> {
    type Output = Result<F::Output, Box<dyn Any + Send>>;

    fn poll(self: Pin<&mut Self>, cx: &mut Context<'_>) -> Poll<Self::Output> {
        let inner = self.get_mut().0.as_mut();
        // The wrapped future is dropped right after a panic, never polled again, so no
        // broken state it may hold is observed.
        match catch_unwind(AssertUnwindSafe(|| inner.poll(cx))) {
            Ok(Poll::Pending) => Poll::Pending,
            Ok(Poll::Ready(value)) => Poll::Ready(Ok(value)),
            Err(payload) => Poll::Ready(Err(payload)),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_panicking_future_becomes_err() {
        let rt = tokio::runtime::Builder::new_current_thread()
            .build()
            .unwrap();
        let caught = rt.block_on(CatchUnwind(Box::pin(async {
            if std::hint::black_box(true) {
                panic!("boom");
            }
            1
        })));
        let payload = caught.unwrap_err();
        assert_eq!(panic_message(payload.as_ref()), "boom");
        let fine = rt.block_on(CatchUnwind(Box::pin(async { 2 })));
        assert_eq!(fine.unwrap(), 2);
    }
}
