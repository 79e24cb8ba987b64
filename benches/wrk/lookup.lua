-- wrk script for the load run: every request POSTs one lookup statement as plain text.
-- The same script drives the echo server, which sends the body back.
--   wrk -t2 -c16 -d10s --latency -s benches/wrk/lookup.lua http://127.0.0.1:8734/v1/query
wrk.method = "POST"
wrk.body = "solubility of KNO3 at 20 C"
wrk.headers["Content-Type"] = "text/plain"

-- One summary line that is easy to copy: requests per second, p50 and p99 in ms, errors.
done = function(summary, latency, requests)
   local errors = summary.errors.connect + summary.errors.read + summary.errors.write
      + summary.errors.status + summary.errors.timeout
   io.write(string.format(
      "summary: %.0f requests/s, p50 %.3f ms, p99 %.3f ms, max %.3f ms, %d requests, %d errors (%d non-2xx)\n",
      summary.requests / (summary.duration / 1e6),
      latency:percentile(50) / 1000, latency:percentile(99) / 1000, latency.max / 1000,
      summary.requests, errors, summary.errors.status))
end
