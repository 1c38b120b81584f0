-- wrk's side of npm run bench:http (scripts/bench-http.ts): POSTs one body after another from a
-- file of one JSON body per line, so every request carries a different scene, and prints one JSON
-- line with the counts and latencies when the run ends. Headers come from wrk's -H options.
wrk.method = "POST"

local bodies = {}
local n = 0

function init(args)
  for line in io.lines(args[1]) do
    bodies[#bodies + 1] = line
  end
  -- Threads start at different places in the pool.
  n = math.random(#bodies)
end

function request()
  n = n % #bodies + 1
  return wrk.format(nil, nil, nil, bodies[n])
end

function done(summary, latency, requests)
  local e = summary.errors
  io.write(string.format(
    '{"requests":%d,"durationUs":%d,"connect":%d,"read":%d,"write":%d,"status":%d,"timeout":%d,"p50Us":%d,"p99Us":%d}\n',
    summary.requests, summary.duration, e.connect, e.read, e.write, e.status, e.timeout,
    latency:percentile(50), latency:percentile(99)))
end
