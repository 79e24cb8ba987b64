//! The server's own accept loop: every connection is served by hyper's HTTP/1 connection
//! with limits that `axum::serve` does not set, so no client can hold the server open.
//!
//! - **Header timeout** ([`Limits::header_time`]): a request's head (request line and
//!   headers) must arrive whole within this time of the connection becoming ready for it —
//!   when it opens, and again after each answer on a kept-alive connection. A silent socket,
//!   a head sent a byte at a time or never finished, and an idle kept-alive connection are
//!   all closed then (hyper's `header_read_timeout`).
//! - **Idle timeout** ([`Limits::idle_after`]): a connection on which no byte moves either way
//!   for this long is closed, whatever it is doing (a client that stops reading its answer).
//!   It is longer than the time limit, so an evaluation in progress is never cut by it.
//! - **Connection cap** ([`Limits::connections`]): at most this many connections are open.
//!   One more, or an accept refused for want of file descriptors, closes the connection that
//!   has been quiet longest among those with no request in progress, so a crowd of idle
//!   sockets cannot keep `/v1/health` (or anyone) out.
//! - **Header size**: a request head larger than [`MAX_HEAD_BYTES`] is refused (431).
//!
//! Stopping: the loop stops accepting, every connection is told to finish its request in
//! progress and close, and the loop waits for them up to a grace period.

use std::collections::HashMap;
use std::io;
use std::pin::{Pin, pin};
use std::sync::atomic::{AtomicU64, AtomicUsize, Ordering};
use std::sync::{Arc, Mutex, PoisonError};
use std::task::{Context, Poll};
use std::time::Duration;

use hyper_util::rt::{TokioIo, TokioTimer};
use hyper_util::service::TowerToHyperService;
use tokio::io::{AsyncRead, AsyncWrite, ReadBuf};
use tokio::net::{TcpListener, TcpStream};
use tokio::sync::{Notify, watch};
use tokio::task::JoinSet;
use tokio::time::Instant;

use super::Limits;

/// The largest request head (request line and headers) read, in bytes (431 past it).
pub const MAX_HEAD_BYTES: usize = 16 * 1024;

/// How long a stopping server waits for its connections to finish their requests.
const DRAIN_GRACE: Duration = Duration::from_secs(5);

/// Pause after an accept error that is not about one connection (out of descriptors), so
/// the loop never spins.
const ACCEPT_PAUSE: Duration = Duration::from_millis(20);

/// What the accept loop knows of one open connection.
struct Watch {
    /// Milliseconds after `Registry::epoch` when a byte last moved either way.
    last_ms: AtomicU64,
    /// Requests of this connection being answered now.
    in_flight: AtomicUsize,
    /// Told to close (evicted to make room).
    evict: Notify,
}

impl Watch {
    fn touch(&self, epoch: Instant) {
        let ms = u64::try_from(epoch.elapsed().as_millis()).unwrap_or(u64::MAX);
        self.last_ms.store(ms, Ordering::Relaxed);
    }
}

/// Every open connection, for the cap and for eviction.
struct Registry {
    epoch: Instant,
    open: Mutex<HashMap<u64, Arc<Watch>>>,
}

impl Registry {
    fn open(&self) -> std::sync::MutexGuard<'_, HashMap<u64, Arc<Watch>>> {
        // Nothing panics while the map is locked; a poisoned lock still holds a whole map.
        self.open.lock().unwrap_or_else(PoisonError::into_inner)
    }

    fn len(&self) -> usize {
        self.open().len()
    }

    fn add(&self, id: u64) -> Arc<Watch> {
        let watch = Arc::new(Watch {
            last_ms: AtomicU64::new(0),
            in_flight: AtomicUsize::new(0),
            evict: Notify::new(),
        });
        watch.touch(self.epoch);
        self.open().insert(id, Arc::clone(&watch));
        watch
    }

    fn remove(&self, id: u64) {
        self.open().remove(&id);
    }

    /// Tells the connection quiet longest, among those with no request in progress, to
    /// close; false when every connection is answering a request.
    fn evict_quietest(&self) -> bool {
        let open = self.open();
        let quietest = open
            .iter()
            .filter(|(_, w)| w.in_flight.load(Ordering::Relaxed) == 0)
            .min_by_key(|(id, w)| (w.last_ms.load(Ordering::Relaxed), **id));
        match quietest {
            Some((id, watch)) => {
                watch.evict.notify_one();
                let id = *id;
                drop(open);
                // Counted out now, so the next accept sees the room it makes.
                self.remove(id);
                true
            }
            None => false,
        }
    }
}

/// A TCP stream that notes the time of every byte read or written.
struct Watched {
    stream: TcpStream,
    watch: Arc<Watch>,
    epoch: Instant,
}

impl Watched {
    /// Notes a write that moved bytes; passes the poll on.
    fn wrote(&self, polled: Poll<io::Result<usize>>) -> Poll<io::Result<usize>> {
        if matches!(polled, Poll::Ready(Ok(n)) if n > 0) {
            self.watch.touch(self.epoch);
        }
        polled
    }
}

impl AsyncRead for Watched {
    fn poll_read(
        self: Pin<&mut Self>,
        cx: &mut Context<'_>,
        buf: &mut ReadBuf<'_>,
    ) -> Poll<io::Result<()>> {
        let this = self.get_mut();
        let before = buf.filled().len();
        let polled = Pin::new(&mut this.stream).poll_read(cx, buf);
        if buf.filled().len() > before {
            this.watch.touch(this.epoch);
        }
        polled
    }
}

impl AsyncWrite for Watched {
    fn poll_write(
        self: Pin<&mut Self>,
        cx: &mut Context<'_>,
        buf: &[u8],
    ) -> Poll<io::Result<usize>> {
        let this = self.get_mut();
        let polled = Pin::new(&mut this.stream).poll_write(cx, buf);
        this.wrote(polled)
    }

    fn poll_write_vectored(
        self: Pin<&mut Self>,
        cx: &mut Context<'_>,
        bufs: &[io::IoSlice<'_>],
    ) -> Poll<io::Result<usize>> {
        let this = self.get_mut();
        let polled = Pin::new(&mut this.stream).poll_write_vectored(cx, bufs);
        this.wrote(polled)
    }

    fn is_write_vectored(&self) -> bool {
        self.stream.is_write_vectored()
    }

    fn poll_flush(self: Pin<&mut Self>, cx: &mut Context<'_>) -> Poll<io::Result<()>> {
        Pin::new(&mut self.get_mut().stream).poll_flush(cx)
    }

    fn poll_shutdown(self: Pin<&mut Self>, cx: &mut Context<'_>) -> Poll<io::Result<()>> {
        Pin::new(&mut self.get_mut().stream).poll_shutdown(cx)
    }
}

/// Counts a request as in progress on its connection until dropped.
struct InFlight(Arc<Watch>);

impl InFlight {
    fn new(watch: &Arc<Watch>) -> InFlight {
        watch.in_flight.fetch_add(1, Ordering::Relaxed);
        InFlight(Arc::clone(watch))
    }
}

impl Drop for InFlight {
    fn drop(&mut self) {
        self.0.in_flight.fetch_sub(1, Ordering::Relaxed);
    }
}

/// Resolves when no byte has moved on the connection for `idle`.
async fn gone_quiet(watch: &Watch, epoch: Instant, idle: Duration) {
    loop {
        let last = watch.last_ms.load(Ordering::Relaxed);
        tokio::time::sleep_until(epoch + Duration::from_millis(last) + idle).await;
        if watch.last_ms.load(Ordering::Relaxed) == last {
            return;
        }
    }
}

/// Accepts and serves connections on `listener` with `app` until `stop` resolves, then
/// lets the connections finish their requests (up to a grace period).
pub(crate) async fn serve(
    listener: TcpListener,
    app: axum::Router,
    limits: Limits,
    stop: impl std::future::Future<Output = ()>,
) {
    let registry = Arc::new(Registry {
        epoch: Instant::now(),
        open: Mutex::new(HashMap::new()),
    });
    let mut http = hyper::server::conn::http1::Builder::new();
    http.timer(TokioTimer::new())
        .header_read_timeout(limits.header_time)
        .max_buf_size(MAX_HEAD_BYTES);
    let http = Arc::new(http);
    let (stopping, stopped) = watch::channel(false);
    let mut connections = JoinSet::new();
    let mut next_id: u64 = 0;
    let mut stop = pin!(stop);
    loop {
        let accepted = tokio::select! {
            () = &mut stop => break,
            // Reap finished connections as they end, so the set stays small.
            Some(_) = connections.join_next(), if !connections.is_empty() => continue,
            accepted = listener.accept() => accepted,
        };
        let stream = match accepted {
            Ok((stream, _)) => stream,
            Err(e) => {
                if !is_connection_error(&e) {
                    // Out of descriptors (or memory): make room, then try again.
                    registry.evict_quietest();
                    tokio::time::sleep(ACCEPT_PAUSE).await;
                }
                continue;
            }
        };
        if registry.len() >= limits.connections.max(1) {
            registry.evict_quietest();
        }
        let _ = stream.set_nodelay(true);
        next_id += 1;
        let id = next_id;
        let watch = registry.add(id);
        let io = TokioIo::new(Watched {
            stream,
            watch: Arc::clone(&watch),
            epoch: registry.epoch,
        });
        let router = TowerToHyperService::new(app.clone());
        let counted = Arc::clone(&watch);
        let service = hyper::service::service_fn(move |request| {
            let in_flight = InFlight::new(&counted);
            let answered = hyper::service::Service::call(&router, request);
            async move {
                let answer = answered.await;
                drop(in_flight);
                answer
            }
        });
        let http = Arc::clone(&http);
        let registry = Arc::clone(&registry);
        let mut stopped = stopped.clone();
        let idle = limits.idle_after();
        connections.spawn(async move {
            let mut connection = pin!(http.serve_connection(io, service));
            let mut quiet = pin!(gone_quiet(&watch, registry.epoch, idle));
            let mut told_to_stop = false;
            loop {
                tokio::select! {
                    // A connection's own error (a reset, a malformed request already
                    // answered by hyper) ends it and nothing else.
                    _ = connection.as_mut() => break,
                    // Dropping the connection closes the socket.
                    () = &mut quiet => break,
                    () = watch.evict.notified() => break,
                    changed = stopped.changed(), if !told_to_stop => {
                        told_to_stop = true;
                        if changed.is_ok() {
                            connection.as_mut().graceful_shutdown();
                        }
                    }
                }
            }
            registry.remove(id);
        });
    }
    drop(listener);
    let _ = stopping.send(true);
    let drained = async { while connections.join_next().await.is_some() {} };
    if tokio::time::timeout(DRAIN_GRACE, drained).await.is_err() {
        connections.abort_all();
    }
}

/// Errors of one connection that came and went before it was accepted: nothing to do.
fn is_connection_error(e: &io::Error) -> bool {
    matches!(
        e.kind(),
        io::ErrorKind::ConnectionRefused
            | io::ErrorKind::ConnectionAborted
            | io::ErrorKind::ConnectionReset
            | io::ErrorKind::Interrupted
            | io::ErrorKind::WouldBlock
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_quietest_idle_connection_is_evicted_and_a_busy_one_never() {
        let registry = Registry {
            epoch: Instant::now(),
            open: Mutex::new(HashMap::new()),
        };
        let (a, b, c) = (registry.add(1), registry.add(2), registry.add(3));
        a.last_ms.store(50, Ordering::Relaxed);
        b.last_ms.store(10, Ordering::Relaxed);
        c.last_ms.store(5, Ordering::Relaxed);
        let busy = InFlight::new(&c);
        assert!(registry.evict_quietest());
        // c is quieter but answering a request: b goes.
        assert_eq!(registry.len(), 2);
        assert!(!registry.open().contains_key(&2));
        drop(busy);
        assert!(registry.evict_quietest());
        assert!(!registry.open().contains_key(&3));
    }

    #[test]
    fn a_connection_goes_quiet_only_after_the_idle_time_without_a_byte() {
        let rt = tokio::runtime::Builder::new_current_thread()
            .enable_time()
            .build()
            .unwrap();
        rt.block_on(async {
            let registry = Registry {
                epoch: Instant::now(),
                open: Mutex::new(HashMap::new()),
            };
            let watch = registry.add(1);
            let started = Instant::now();
            let idle = Duration::from_millis(200);
            // A byte moves at 150 ms: quiet comes 200 ms after that, not at 200 ms.
            let touching = async {
                tokio::time::sleep(Duration::from_millis(150)).await;
                watch.touch(registry.epoch);
            };
            tokio::join!(gone_quiet(&watch, registry.epoch, idle), touching);
            let waited = started.elapsed();
            assert!(waited >= Duration::from_millis(340), "{waited:?}");
            assert!(waited < Duration::from_secs(2), "{waited:?}");
        });
    }

    #[test]
    fn nothing_is_evicted_when_every_connection_is_busy() {
        let registry = Registry {
            epoch: Instant::now(),
            open: Mutex::new(HashMap::new()),
        };
        let a = registry.add(1);
        let _busy = InFlight::new(&a);
        assert!(!registry.evict_quietest());
        assert_eq!(registry.len(), 1);
    }
}
