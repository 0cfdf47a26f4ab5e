// Minimal browser-test harness: Debian's Chromium through playwright-core, a fresh context per test, and a
// probe that fails a test on console errors, page errors, failed requests or any request off localhost.
import { cpus, loadavg } from 'node:os';
import { chromium } from 'playwright-core';

const LAUNCH_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
  '--disable-background-networking', '--disable-component-update', '--disable-sync'];

/** Launch the browser (flags from the shared stack notes). */
export function launch() {
  return chromium.launch({ executablePath: process.env.CHROMIUM ?? '/usr/bin/chromium', headless: true, args: LAUNCH_ARGS });
}

/** Watch a context: collects problems; `allowFailures` is set by tests that cut the network on purpose. */
export function probe(ctx, origin) {
  const problems = [];
  const state = { allowFailures: false, requests: 0 };
  const local = (u) => u.startsWith(origin) || u.startsWith('data:') || u.startsWith('blob:') || /^http:\/\/127\.0\.0\.1:\d+\//.test(u);
  ctx.on('console', (m) => { if (m.type() === 'error') problems.push(`console error: ${m.text()}`); });
  ctx.on('weberror', (e) => problems.push(`page error: ${e.error().message}`));
  ctx.on('request', (r) => {
    state.requests++;
    if (!local(r.url())) problems.push(`request off localhost: ${r.url()}`);
  });
  ctx.on('requestfailed', (r) => { if (!state.allowFailures) problems.push(`request failed: ${r.url()} (${r.failure()?.errorText})`); });
  return {
    state,
    check() {
      if (problems.length) throw new Error(problems.join('\n'));
    },
  };
}

/** Assert a condition; throws with the message when it fails. */
export function assert(cond, msg) {
  if (!cond) throw new Error(msg);
}

/** Run tests in order, one fresh context each; prints the summary line CI reads. */
export async function runAll(tests, setup) {
  const browser = await launch();
  let passed = 0, failed = 0;
  for (const t of tests) {
    // A timing test (loadSensitive) that fails while other programs hold more than every core gets one more
    // try: a task stretched by waiting for a core says nothing about the app. Both attempts are printed.
    for (let attempt = 1; ; attempt++) {
      const t0 = Date.now();
      const ctx = await browser.newContext({ viewport: { width: 1600, height: 1000 }, deviceScaleFactor: 1 });
      const p = probe(ctx, setup.origin);
      try {
        await t.fn({ ctx, probe: p, ...setup });
        p.check();
        passed++;
        console.log(`ok   ${t.name} (${Date.now() - t0} ms)`);
        break;
      } catch (e) {
        const load = loadavg()[0], cores = cpus().length;
        const msg = `${t.name} (${Date.now() - t0} ms)\n     ${String(e?.stack ?? e).split('\n').slice(0, 6).join('\n     ')}`;
        if (t.loadSensitive && attempt === 1 && load > cores) {
          console.log(`retry ${msg}\n     (load average ${load.toFixed(1)} > ${cores} cores: trying once more)`);
          continue;
        }
        failed++;
        console.log(`FAIL ${msg}`);
        break;
      } finally {
        await ctx.close().catch(() => {});
      }
    }
  }
  await browser.close();
  return { passed, failed };
}
