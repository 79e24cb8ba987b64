//! The query server: HTTP JSON over the same engine the command line uses, on loopback
//! unless another address is given, read-only unless started with a token.
//!
//! Connections are accepted and served by `accept` (header and idle timeouts, a cap on open
//! connections). Routes (all under `/v1`) are in `routes`; limits and their defaults in `limits`; the
//! bearer token in `auth`; request logs and panic catching in `layers`; the JSON error
//! shape in `reply`. The engine is shared behind an `RwLock<Arc<Engine>>`: a request takes
//! the current snapshot and keeps it to the end, and a reload swaps in a fresh one.
//!
//! ```no_run
//! use satline::server::{Config, start};
//! let running = start(Config::default())?;
//! println!("serving on http://{}", running.addr());
//! running.stop()?;
//! # Ok::<(), satline::server::ServerError>(())
//! ```

mod accept;
mod admin;
mod auth;
mod layers;
mod limits;
mod openapi;
mod page;
mod queue;
mod reply;
mod responses;
mod routes;

use std::io;
use std::net::{Ipv4Addr, SocketAddr};
use std::path::PathBuf;
use std::sync::{Arc, PoisonError, RwLock};
use std::thread::JoinHandle;
use std::time::Duration;

use tokio::sync::{Semaphore, oneshot};

pub use accept::MAX_HEAD_BYTES;
pub use auth::Token;
pub use limits::{
    DEFAULT_BODY_BYTES, DEFAULT_CONCURRENT, DEFAULT_CONNECTIONS, DEFAULT_HEADER_TIME,
    DEFAULT_IDLE_TIME, DEFAULT_STATEMENTS, DEFAULT_TIME, Limits,
};

use crate::engine::Engine;

/// The port the server listens on unless told otherwise.
pub const DEFAULT_PORT: u16 = 8734;

/// The address the server listens on unless told otherwise: loopback only.
pub const DEFAULT_ADDR: SocketAddr =
    SocketAddr::new(std::net::IpAddr::V4(Ipv4Addr::LOCALHOST), DEFAULT_PORT);

/// How long a stopping server waits for evaluations still running on blocking threads.
const SHUTDOWN_GRACE: Duration = Duration::from_secs(5);

/// What can stop the server from starting or serving.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum ServerError {
    /// The database could not be opened: `satline serve --db missing.db`.
    #[error("cannot open {database}: {source}")]
    OpenStore {
        database: String,
        #[source]
        source: Box<crate::Error>,
    },
    /// The address could not be bound: `satline serve --addr 127.0.0.1:80` without the
    /// right to, or a port already in use.
    #[error("cannot listen on {addr}: {source}")]
    Bind {
        addr: SocketAddr,
        #[source]
        source: io::Error,
    },
    /// The token file could not be read: `satline serve --token-file missing.txt`.
    #[error("cannot read the token file {path}: {source}")]
    ReadToken {
        path: String,
        #[source]
        source: io::Error,
    },
    /// The token file holds nothing but white space: `--token-file empty.txt`.
    #[error("the token file {path} holds no token")]
    EmptyToken { path: String },
    /// The async runtime or its thread could not start (out of threads or memory).
    #[error("cannot start the server: {0}")]
    Start(#[source] io::Error),
    /// Serving stopped with an I/O error from the listener.
    #[error("serving stopped: {0}")]
    Serve(#[source] io::Error),
    /// The server's thread ended by a panic outside any request.
    #[error("the server's thread stopped unexpectedly")]
    Stopped,
}

impl ServerError {
    /// The exit code of the command line: 2 for a bad token file, 3 for store, network or
    /// system trouble.
    pub fn exit_code(&self) -> u8 {
        match self {
            ServerError::EmptyToken { .. } => 2,
            _ => 3,
        }
    }
}

/// How to start the server.
#[derive(Debug, Clone)]
pub struct Config {
    /// Where to listen; loopback by default. Port 0 picks a free port (see [`Running::addr`]).
    pub addr: SocketAddr,
    /// The database, or the embedded default when `None`.
    pub db: Option<PathBuf>,
    /// The token write operations need; without one the server is read-only.
    pub token: Option<Token>,
    pub limits: Limits,
    /// One JSON line per request on the error stream.
    pub log_requests: bool,
    /// Answer a short query of light statements (a lookup, a conversion: microseconds) on
    /// the async worker instead of handing it to the blocking pool; heavier queries always
    /// go to the pool. `--offload-all` turns this off.
    pub inline_light: bool,
    /// Stop gracefully on SIGINT or SIGTERM (the command line); tests stop by `Running::stop`.
    pub stop_on_signals: bool,
}

impl Default for Config {
    fn default() -> Self {
        Config {
            addr: DEFAULT_ADDR,
            db: None,
            token: None,
            limits: Limits::default(),
            log_requests: true,
            inline_light: true,
            stop_on_signals: false,
        }
    }
}

/// What every handler shares.
pub(crate) struct AppState {
    engine: RwLock<Arc<Engine>>,
    db: Option<PathBuf>,
    token: Option<Token>,
    limits: Limits,
    permits: Arc<Semaphore>,
    log_requests: bool,
    inline_light: bool,
}

pub(crate) type Shared = Arc<AppState>;

impl AppState {
    /// The current snapshot; the caller keeps it however long it needs.
    fn engine(&self) -> Arc<Engine> {
        // Nothing panics while holding the lock, so a poisoned lock still holds a whole
        // engine.
        self.engine
            .read()
            .unwrap_or_else(PoisonError::into_inner)
            .clone()
    }

    /// Puts in a fresh snapshot and returns the one it replaces.
    fn swap(&self, fresh: Arc<Engine>) -> Arc<Engine> {
        let mut slot = self.engine.write().unwrap_or_else(PoisonError::into_inner);
        std::mem::replace(&mut *slot, fresh)
    }
}

/// A server running on its own thread.
#[derive(Debug)]
pub struct Running {
    addr: SocketAddr,
    stop: Option<oneshot::Sender<()>>,
    thread: Option<JoinHandle<Result<(), ServerError>>>,
}

impl Running {
    /// The address actually bound (the free port chosen for port 0).
    pub fn addr(&self) -> SocketAddr {
        self.addr
    }

    /// Stops accepting, lets the requests in progress finish, and waits for the end.
    pub fn stop(mut self) -> Result<(), ServerError> {
        if let Some(stop) = self.stop.take() {
            let _ = stop.send(());
        }
        self.join()
    }

    /// Waits until the server stops by itself (a signal, with `stop_on_signals`).
    pub fn wait(mut self) -> Result<(), ServerError> {
        self.join()
    }

    fn join(&mut self) -> Result<(), ServerError> {
        match self.thread.take() {
            Some(thread) => thread.join().map_err(|_| ServerError::Stopped)?,
            None => Ok(()),
        }
    }
}

impl Drop for Running {
    fn drop(&mut self) {
        if let Some(stop) = self.stop.take() {
            let _ = stop.send(());
        }
        let _ = self.join();
    }
}

/// Opens the database, binds the address and starts serving on a thread of its own.
/// Returns once the address is bound, so a client may connect at once.
pub fn start(config: Config) -> Result<Running, ServerError> {
    let engine = Engine::open(config.db.as_deref()).map_err(|source| ServerError::OpenStore {
        database: crate::store::database_name(config.db.as_deref()),
        source: Box::new(source),
    })?;
    let listener =
        std::net::TcpListener::bind(config.addr).map_err(|source| ServerError::Bind {
            addr: config.addr,
            source,
        })?;
    let addr = listener.local_addr().map_err(|source| ServerError::Bind {
        addr: config.addr,
        source,
    })?;
    listener.set_nonblocking(true).map_err(ServerError::Start)?;
    let runtime = tokio::runtime::Builder::new_multi_thread()
        .enable_all()
        .thread_name("satline-serve")
        // Every evaluation holds a request permit, so this many blocking threads suffice.
        .max_blocking_threads(config.limits.concurrent.max(1) + 2)
        .build()
        .map_err(ServerError::Start)?;
    let state = Arc::new(AppState {
        engine: RwLock::new(Arc::new(engine)),
        db: config.db,
        token: config.token,
        limits: config.limits,
        permits: Arc::new(Semaphore::new(config.limits.concurrent.max(1))),
        log_requests: config.log_requests,
        inline_light: config.inline_light,
    });
    let app = routes::router(state);
    let (stop, stopped) = oneshot::channel::<()>();
    let on_signals = config.stop_on_signals;
    let limits = config.limits;
    let thread = std::thread::Builder::new()
        .name("satline-server".into())
        .spawn(move || {
            let served = runtime.block_on(async move {
                let listener = tokio::net::TcpListener::from_std(listener)?;
                accept::serve(listener, app, limits, shutdown(stopped, on_signals)).await;
                Ok::<(), io::Error>(())
            });
            runtime.shutdown_timeout(SHUTDOWN_GRACE);
            served.map_err(ServerError::Serve)
        })
        .map_err(ServerError::Start)?;
    Ok(Running {
        addr,
        stop: Some(stop),
        thread: Some(thread),
    })
}

/// Resolves when the server should stop: `Running::stop` (or its drop), or a signal.
async fn shutdown(stopped: oneshot::Receiver<()>, on_signals: bool) {
    if !on_signals {
        let _ = stopped.await;
        return;
    }
    tokio::select! {
        _ = stopped => {}
        _ = signal() => {}
    }
}

/// SIGINT or SIGTERM. Where a handler cannot be installed, that signal is never awaited
/// (the default action of the signal still ends the process).
async fn signal() {
    let interrupt = async {
        if tokio::signal::ctrl_c().await.is_err() {
            std::future::pending::<()>().await;
        }
    };
    #[cfg(unix)]
    let terminate = async {
        use tokio::signal::unix::{SignalKind, signal};
        match signal(SignalKind::terminate()) {
            Ok(mut s) => {
                s.recv().await;
            }
            Err(_) => std::future::pending::<()>().await,
        }
    };
    #[cfg(not(unix))]
    let terminate = std::future::pending::<()>();
    tokio::select! {
        _ = interrupt => {}
        _ = terminate => {}
    }
}

/// `satline serve`: starts the server, says where on the error stream, and serves until
/// SIGINT or SIGTERM, letting requests in progress finish.
pub fn serve(mut config: Config) -> Result<(), ServerError> {
    config.stop_on_signals = true;
    let writes = if config.token.is_some() {
        "writes need the bearer token"
    } else {
        "read-only"
    };
    let loopback = config.addr.ip().is_loopback();
    let has_token = config.token.is_some();
    let running = start(config)?;
    eprintln!(
        "satline: serving on http://{}/ (open it in a browser; the API is under /v1, {writes}); \
         stop with Ctrl-C",
        running.addr()
    );
    if !loopback {
        eprintln!("satline: note: listening beyond loopback, as asked with --addr");
        if has_token {
            eprintln!(
                "satline: warning: the write token travels in clear over plain HTTP; beyond loopback put a TLS-terminating proxy in front (README: \"Serving beyond this machine\") and let only it reach this port"
            );
        }
    }
    running.wait()?;
    eprintln!("satline: stopped");
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use axum::routing::get;
    use std::io::{Read, Write};

    fn get_once(addr: SocketAddr, path: &str) -> String {
        let mut s = std::net::TcpStream::connect(addr).unwrap();
        write!(
            s,
            "GET {path} HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n"
        )
        .unwrap();
        let mut out = String::new();
        s.read_to_string(&mut out).unwrap();
        out
    }

    #[test]
    fn a_panicking_handler_gets_500_and_the_server_goes_on() {
        let rt = tokio::runtime::Builder::new_multi_thread()
            .worker_threads(1)
            .enable_all()
            .build()
            .unwrap();
        let listener = std::net::TcpListener::bind("127.0.0.1:0").unwrap();
        let addr = listener.local_addr().unwrap();
        listener.set_nonblocking(true).unwrap();
        let app = axum::Router::new()
            .route(
                "/boom",
                get(|| async {
                    if std::hint::black_box(true) {
                        panic!("boom on purpose");
                    }
                    "never"
                }),
            )
            .route("/fine", get(|| async { "fine" }))
            .layer(axum::middleware::from_fn(layers::catch_panic));
        rt.spawn(async move {
            let listener = tokio::net::TcpListener::from_std(listener).unwrap();
            axum::serve(listener, app).await.unwrap();
        });
        for _ in 0..2 {
            let reply = get_once(addr, "/boom");
            assert!(reply.starts_with("HTTP/1.1 500"), "{reply}");
            assert!(reply.contains("\"code\":\"internal\""), "{reply}");
            assert!(reply.contains("boom on purpose"), "{reply}");
        }
        assert!(get_once(addr, "/fine").ends_with("fine"));
    }

    #[test]
    fn default_address_is_loopback() {
        assert!(DEFAULT_ADDR.ip().is_loopback());
        assert!(Config::default().token.is_none());
    }
}
