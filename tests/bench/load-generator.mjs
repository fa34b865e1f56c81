// The benchmark's load generator, run in a process of its own so the servers being measured do not
// share an event loop with it: autocannon against one URL, every response time kept (exact p95).
// Usage: node load-generator.mjs <url> <connections> <seconds>; prints JSON on stdout.
import autocannon from "autocannon";

const [url, connections, seconds] = process.argv.slice(2);
const latencies = [];
let failures = 0;
/** Answers other than 200, by status (HAProxy's 503 when no instance passes its health check, say). */
const statuses = {};
const instance = autocannon({ url, connections: Number(connections), duration: Number(seconds), pipelining: 1 });
instance.on("response", (_client, statusCode, _bytes, responseTime) => {
  if (statusCode !== 200) {
    failures += 1;
    statuses[statusCode] = (statuses[statusCode] ?? 0) + 1;
  }
  latencies.push(responseTime);
});
const result = await instance;
process.stdout.write(JSON.stringify({ latencies, failures, statuses, errors: result.errors }));
