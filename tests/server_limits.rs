//! The server's limits on `/v1/plot` over loopback: a body that never arrives is answered
//! 408 within the time limit (it cannot hold a worker open), and a picture larger than the
//! pixel cap is refused before anything is drawn.

use std::io::{Read, Write};
use std::net::TcpStream;
use std::time::{Duration, Instant};

use satline::server::{Config, Limits, start};

fn config(limits: Limits) -> Config {
    Config {
        addr: "127.0.0.1:0".parse().expect("an address"),
        limits,
        log_requests: false,
        ..Config::default()
    }
}

/// Sends `head` (and nothing more) and reads the reply's status line, waiting at most 20 s.
fn status_after(addr: std::net::SocketAddr, head: &str) -> (String, Duration) {
    let started = Instant::now();
    let mut stream = TcpStream::connect(addr).expect("connects");
    stream
        .set_read_timeout(Some(Duration::from_secs(20)))
        .expect("a read timeout");
    stream.write_all(head.as_bytes()).expect("writes");
    let mut reply = Vec::new();
    let mut buf = [0u8; 1024];
    while !reply.windows(2).any(|w| w == b"\r\n") {
        match stream.read(&mut buf) {
            Ok(0) | Err(_) => break,
            Ok(n) => reply.extend_from_slice(&buf[..n]),
        }
    }
    let text = String::from_utf8_lossy(&reply);
    (
        text.lines().next().unwrap_or("").to_string(),
        started.elapsed(),
    )
}

#[test]
fn a_slow_body_on_plot_is_answered_408_within_the_time_limit() {
    let running = start(config(Limits {
        time: Duration::from_millis(500),
        ..Limits::default()
    }))
    .expect("the server starts");
    // 40 bytes promised, none sent.
    let (status, took) = status_after(
        running.addr(),
        "POST /v1/plot HTTP/1.1\r\nHost: x\r\nContent-Length: 40\r\n\r\n",
    );
    assert!(status.contains(" 408 "), "{status}");
    assert!(took < Duration::from_secs(10), "{took:?}");
}

#[test]
fn an_oversize_picture_is_refused_before_drawing() {
    let running = start(config(Limits::default())).expect("the server starts");
    let body = "plot KNO3 from 0 C to 100 C";
    let (status, _) = status_after(
        running.addr(),
        &format!(
            "POST /v1/plot?format=png&width=4000&height=4000 HTTP/1.1\r\nHost: x\r\nContent-Length: {}\r\n\r\n{body}",
            body.len()
        ),
    );
    assert!(status.contains(" 413 "), "{status}");
    // A picture within the cap is drawn.
    let (status, _) = status_after(
        running.addr(),
        &format!(
            "POST /v1/plot?format=png&width=1000&height=800 HTTP/1.1\r\nHost: x\r\nContent-Length: {}\r\n\r\n{body}",
            body.len()
        ),
    );
    assert!(status.contains(" 200 "), "{status}");
}
