// autocannon in a process of its own, for scripts/bench/load.mjs: the load generator does not share an event loop
// or a heap with the bench process, which holds the seeded season, an in-process DataSource and the figures so far
// (its garbage collection would otherwise pause the client and read as server latency).
// argv[2] is JSON: a list of runs, started together (one per server process when the load is split). stdout gets
// JSON: for each run, every response's time, requests/s and failures.
import autocannon from 'autocannon';

async function run({ url, method = 'GET', headers = {}, body, connections, duration, requests }) {
  const times = [];
  let bad = 0;
  const instance = autocannon({ url, method, headers: { ...headers, ...(body ? { 'content-type': 'application/json' } : {}) }, body, connections, duration, requests });
  instance.on('response', (_client, status, _bytes, t) => {
    if (status >= 400) bad += 1;
    times.push(t);
  });
  const result = await instance;
  return { times, rps: result.requests.average, bad: bad + result.errors + result.timeouts };
}

const results = await Promise.all(JSON.parse(process.argv[2]).map(run));
process.stdout.write(JSON.stringify(results));
