//! A minimal axum server that only echoes the request body, as the yardstick for the query
//! server's load run (README-server-section.md, "Load run"). Same runtime as `satline serve`
//! (tokio multi-thread, axum, HTTP/1.1), no engine, no limits, no logs.
//!
//! `cargo bench` runs this file too; without `--serve` it only says how to use it and ends,
//! so a plain `cargo bench` never blocks. With `--serve` it listens on loopback and stops on
//! Ctrl-C or after `--seconds` (120 unless given), whichever is first.
//!
//! ```text
//! cargo bench --bench echo_server -- --serve 127.0.0.1:8735 --seconds 60
//! ```

use std::net::SocketAddr;
use std::time::Duration;

use axum::Router;
use axum::body::Bytes;
use axum::routing::post;

async fn echo(body: Bytes) -> Bytes {
    body
}

fn main() -> std::process::ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let Some(at) = args.iter().position(|a| a == "--serve") else {
        println!(
            "echo_server: start it with `cargo bench --bench echo_server -- --serve [IP:PORT] [--seconds N]`"
        );
        return std::process::ExitCode::SUCCESS;
    };
    let addr: SocketAddr = match args.get(at + 1).filter(|a| !a.starts_with("--")) {
        Some(a) => match a.parse() {
            Ok(addr) => addr,
            Err(e) => {
                eprintln!("echo_server: bad address {a}: {e}");
                return std::process::ExitCode::from(2);
            }
        },
        None => SocketAddr::from(([127, 0, 0, 1], 8735)),
    };
    if !addr.ip().is_loopback() {
        eprintln!("echo_server: loopback addresses only");
        return std::process::ExitCode::from(2);
    }
    let seconds = args
        .iter()
        .position(|a| a == "--seconds")
        .and_then(|i| args.get(i + 1))
        .and_then(|s| s.parse::<u64>().ok())
        .unwrap_or(120);
    let runtime = match tokio::runtime::Builder::new_multi_thread()
        .enable_all()
        .build()
    {
        Ok(rt) => rt,
        Err(e) => {
            eprintln!("echo_server: {e}");
            return std::process::ExitCode::from(3);
        }
    };
    let served = runtime.block_on(async move {
        let listener = tokio::net::TcpListener::bind(addr).await?;
        eprintln!("echo_server: echoing on http://{addr} for at most {seconds} s");
        let app = Router::new().fallback(post(echo));
        axum::serve(listener, app)
            .with_graceful_shutdown(async move {
                tokio::select! {
                    _ = tokio::signal::ctrl_c() => {}
                    _ = tokio::time::sleep(Duration::from_secs(seconds)) => {}
                }
            })
            .await
    });
    match served {
        Ok(()) => std::process::ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("echo_server: {e}");
            std::process::ExitCode::from(3)
        }
    }
}
