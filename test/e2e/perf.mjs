// Speed and size checks of the built app, and the browser benchmark: prints the figures the README's "Speed"
// table quotes (frames per second with 1e6 particles, long tasks, separatrix update times, Mpt/s in the workers
// for one and two workers, the turn kernel alone in a worker, worker memory). Frame rate and speed-up are
// printed, not asserted: on a shared 2-core
// machine they follow the load of the neighbours (the load average is printed beside them). Asserted: the size
// budget, that two workers give the same diagnostics as one, and loose floors that catch a stalled page.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { cpus, loadavg } from 'node:os';
import { gzipSync } from 'node:zlib';
import { deflateSync, strToU8 } from 'fflate';
import { assert } from './harness.mjs';
import { waitReady } from './page.mjs';

const ROOT = new URL('../../', import.meta.url).pathname;
/** Budget for all JavaScript of the built app, gzip [bytes] (issue: ≤ 600 kB). */
export const JS_BUDGET = 600 * 1000;
const demo = JSON.parse(readFileSync(ROOT + 'examples/alder-booster.json', 'utf8'));
const b64url = (u8) => Buffer.from(u8).toString('base64').replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
const linkFor = (doc) => '#s1=' + b64url(deflateSync(strToU8(JSON.stringify(doc))));
const load = () => `load average ${loadavg()[0].toFixed(1)} on ${cpus().length} cores`;

function jsFiles(dir) {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? jsFiles(p) : f.endsWith('.js') || f.endsWith('.mjs') ? [p] : [];
  });
}

async function open(ctx, url, query, doc) {
  const page = await ctx.newPage();
  await page.goto(url + query + (doc ? linkFor(doc) : ''));
  await waitReady(page, 60000);
  return page;
}

// CPU time [s] of Chromium's renderer main threads and of its dedicated workers, from /proc (Linux; null elsewhere).
function rendererCpu() {
  if (!existsSync('/proc/self/task')) return null;
  const tick = 0.01; // USER_HZ = 100 on Linux
  const out = { main: 0, workers: 0 };
  for (const pid of readdirSync('/proc').filter((x) => /^\d+$/.test(x))) {
    try {
      if (!readFileSync(`/proc/${pid}/cmdline`, 'utf8').includes('--type=renderer')) continue;
      for (const tid of readdirSync(`/proc/${pid}/task`)) {
        const st = readFileSync(`/proc/${pid}/task/${tid}/stat`, 'utf8');
        const name = st.slice(st.indexOf('(') + 1, st.lastIndexOf(')'));
        const f = st.slice(st.lastIndexOf(')') + 2).split(' ');
        const cpu = (Number(f[11]) + Number(f[12])) * tick; // utime + stime
        if (tid === pid) out.main += cpu;
        else if (name.startsWith('DedicatedWorker')) out.workers += cpu;
      }
    } catch { /* a process or thread that ended meanwhile */ }
  }
  return out;
}

function withParticles(n) {
  const d = structuredClone(demo);
  d.beam.particles = n;
  return d;
}

// Diagnostics CSV of a page (downloaded through the app's export button), as rows of numbers.
async function diagnosticsCsv(page) {
  const [d] = await Promise.all([page.waitForEvent('download'), page.click('#export-diagnostics')]);
  const lines = readFileSync(await d.path(), 'utf8').trim().split('\n');
  const head = lines[0].split(',');
  return lines.slice(1).map((l) => Object.fromEntries(l.split(',').map((v, i) => [head[i], Number(v)])));
}

async function stepTo(page, n, until) {
  await page.fill('#step-n', String(n));
  await page.click('#step');
  await page.waitForFunction((u) => document.getElementById('turn')?.textContent === String(u) && document.getElementById('run')?.textContent === 'Run', until, { timeout: 120000 });
}

// Track 1e6 particles for `ms` with the given worker count; frame and speed figures.
async function trackFigures(ctx, url, workers, ms) {
  await ctx.addInitScript(() => {
    window.__long = [];
    new PerformanceObserver((l) => { for (const e of l.getEntries()) window.__long.push(e.duration); }).observe({ type: 'longtask', buffered: true });
  });
  const page = await open(ctx, url, `?debug&workers=${workers}`, withParticles(1_000_000));
  const used = await page.evaluate(() => window.__phasewellDebug.workers());
  const mem0 = await page.evaluate(() => window.__phasewellDebug.memory());
  await page.evaluate(() => { window.__long = []; performance.clearMeasures(); window.__phasewellDebug.resetStats(); });
  const turn0 = Number(await page.textContent('#turn'));
  const t0 = Date.now(), cpu0 = rendererCpu();
  await page.click('#run');
  await page.waitForTimeout(ms);
  await page.click('#run');
  const wall = (Date.now() - t0) / 1000, cpu1 = rendererCpu();
  await page.waitForFunction(() => document.getElementById('run').textContent === 'Run');
  const r = await page.evaluate(() => ({
    long: window.__long, stats: window.__phasewellDebug.stats(),
    draws: performance.getEntriesByType('measure').filter((e) => e.name === 'draw phase').length,
    drawMs: performance.getEntriesByType('measure').filter((e) => e.name.startsWith('draw ')).reduce((a, e) => a + e.duration, 0),
  }));
  const mem1 = await page.evaluate(() => window.__phasewellDebug.memory());
  const turns = Number(await page.textContent('#turn')) - turn0;
  await page.close();
  return {
    workers: used, turns, wall,
    workerMpts: (r.stats.turns * 1e6) / (r.stats.trackMs * 1e3),
    appMpts: (turns * 1e6) / wall / 1e6,
    densityFps: r.draws / wall,
    drawShare: r.drawMs / 1000 / wall, // of one core: the page's plot calls (layout, paint and compositing come on top)
    // of one core: the page's main thread (scripts, layout, paint), and the tracking workers together
    mainShare: cpu0 && cpu1 ? (cpu1.main - cpu0.main) / wall : NaN, workerShare: cpu0 && cpu1 ? (cpu1.workers - cpu0.workers) / wall : NaN,
    frames: r.stats.frames / wall,
    longTasks: r.long.length, longest: Math.max(0, ...r.long),
    memoryMB: mem1.map((m) => (m.bufferBytes / 2 ** 20).toFixed(1) + (m.heapBytes ? `+${(m.heapBytes / 2 ** 20).toFixed(1)} heap` : '')).join(', '),
    memoryGrowthMB: mem1.reduce((a, m, k) => a + ((m.heapBytes ?? 0) - (mem0[k]?.heapBytes ?? 0)), 0) / 2 ** 20,
  };
}

// Time from a field edit to the updated bucket area (DOM) and separatrix (Plotly trace), measured in the page.
async function separatrixMs(page, field, values) {
  const times = [];
  for (const v of values) {
    times.push(await page.evaluate(async ([field, v]) => {
      const el = document.getElementById(field);
      const sum = document.getElementById('sum-area');
      const plot = document.getElementById('plot-phase');
      // The separatrix counts as updated when its drawn SVG line has changed (what one sees); its data in Plotly
      // must follow too (checked after the timing).
      const path = () => plot.querySelector('.scatterlayer .trace path.js-line');
      const line = () => path()?.getAttribute('d');
      const area0 = sum.dataset.value, d0 = line();
      window.__sepY0 = plot.data.find((t) => t.name === 'separatrix').y;
      // The drawn line's box in data units [x0, x1, y0, y1], from the layout's ranges and margins and the element's
      // size (independent of how the line was drawn): the window may change between two drawings.
      window.__sepBox = () => {
        const b = plot.querySelector('.scatterlayer .trace path.js-line').getBBox();
        const L = plot.layout, m = L.margin, w = plot.clientWidth - m.l - m.r, h = plot.clientHeight - m.t - m.b;
        const [x0, x1] = L.xaxis.range, [y0, y1] = L.yaxis.range;
        const X = (p) => x0 + (p / w) * (x1 - x0), Y = (p) => y1 - (p / h) * (y1 - y0);
        return { box: [X(b.x), X(b.x + b.width), Y(b.y + b.height), Y(b.y)], px: [(x1 - x0) / w, (y1 - y0) / h] };
      };
      const setter = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, 'value').set;
      const t0 = performance.now();
      setter.call(el, String(v));
      el.dispatchEvent(new Event('input', { bubbles: true }));
      // The edit's own task: its length, and whether numbers and line were already new at its end.
      const tTask = performance.now() - t0, inTask = sum.dataset.value !== area0 && line() !== d0;
      if (inTask) window.__firstBox = window.__sepBox();
      // Poll once per task (a MessageChannel loop is not clamped like nested timers).
      const ch = new MessageChannel();
      return new Promise((resolve) => {
        let tArea = NaN;
        ch.port1.onmessage = () => {
          const now = performance.now();
          if (Number.isNaN(tArea) && sum.dataset.value !== area0) tArea = now - t0;
          if (!Number.isNaN(tArea) && line() !== d0) {
            if (!inTask) window.__firstBox = window.__sepBox(); // the first drawing of the new line
            resolve([tArea, now - t0, inTask ? tTask : NaN]);
          }
          else if (now - t0 > 5000) resolve([tArea, NaN, NaN]);
          else ch.port2.postMessage(null);
        };
        ch.port2.postMessage(null);
      });
    }, [field, v]));
    await page.waitForTimeout(1500); // each edit redraws several plots (~250 ms of Plotly): start the next on an idle page
    // By now Plotly holds the new data and has redrawn the line itself: the first drawing must match its box (1 px).
    const check = await page.evaluate(() => {
      const plot = document.getElementById('plot-phase');
      return { followed: plot.data.find((t) => t.name === 'separatrix').y !== window.__sepY0, now: window.__sepBox(), first: window.__firstBox };
    });
    assert(check.followed, `Plotly's separatrix data did not follow the edit to ${v}`);
    const tol = (i) => 1.5 * Math.max(check.now.px[i >> 1], check.first.px[i >> 1]); // 1.5 px in the coarser drawing
    assert(check.now.box.every((q, i) => Math.abs(q - check.first.box[i]) <= tol(i)), `first drawing ${check.first.box} vs Plotly's ${check.now.box} (edit to ${v})`);
  }
  // The first edits run code V8 has not compiled yet; the later ones show the page as it stays once warm.
  const med = (i, ts) => ts.map((t) => t[i]).sort((a, b) => a - b)[Math.floor(ts.length / 2)];
  const first = times.slice(0, 5), warm = times.slice(5);
  // taskMs: the edit's own task when it drew numbers and line itself (NaN sorts last: an edit that did not).
  const medTask = (ts) => ts.map((t) => (Number.isNaN(t[2]) ? Infinity : t[2])).sort((a, b) => a - b)[Math.floor(ts.length / 2)];
  return { numbersMs: med(0, first), separatrixMs: med(1, first), warmNumbersMs: med(0, warm), warmSeparatrixMs: med(1, warm), taskMs: medTask(first), warmTaskMs: medTask(warm) };
}

// Edits typed as a user does (the field's last digit selected and replaced: one input event each), on an idle page,
// as Chromium's Event Timing sees them: the keypress's own processing (the input handler runs inside it) and its
// duration from the key event to the next frame presented after it (multiples of 8 ms; entries under 16 ms are not
// reported, and count here as 16).
async function typedEdits(page, field, n) {
  await page.evaluate(() => {
    window.__keys = [];
    new PerformanceObserver((l) => { for (const e of l.getEntries()) if (e.name === 'keypress') window.__keys.push([e.processingEnd - e.processingStart, e.duration]); })
      .observe({ type: 'event', durationThreshold: 16 });
  });
  await page.click('#' + field);
  for (let k = 0; k < n; k++) {
    await page.keyboard.press('End');
    await page.keyboard.press('Shift+ArrowLeft');
    await page.waitForTimeout(200);
    await page.keyboard.type(String((k + 1) % 10));
    await page.waitForTimeout(800); // the plots redrawn after the edit settle
  }
  const keys = await page.evaluate(() => window.__keys);
  const med = (xs) => [...xs].sort((a, b) => a - b)[xs.length >> 1];
  const durations = [...keys.map((k) => k[1]), ...Array(Math.max(0, n - keys.length)).fill(16)];
  return { processingMs: keys.length ? med(keys.map((k) => k[0])) : NaN, durationMs: med(durations), under16: n - keys.length };
}

/** Speed and size tests (registered in run.mjs). */
export const perfTests = [
  {
    name: 'all JavaScript of the built app is at most 600 kB gzip',
    async fn() {
      const files = jsFiles(ROOT + 'dist').map((p) => ({ p: p.slice(ROOT.length), raw: statSync(p).size, gz: gzipSync(readFileSync(p)).length }));
      const total = files.reduce((a, f) => a + f.gz, 0);
      for (const f of files) console.log(`     ${f.p}: ${(f.raw / 1000).toFixed(0)} kB, ${(f.gz / 1000).toFixed(1)} kB gzip`);
      console.log(`     total JavaScript: ${(total / 1000).toFixed(1)} kB gzip (budget ${JS_BUDGET / 1000} kB)`);
      assert(total <= JS_BUDGET, `built JavaScript is ${(total / 1000).toFixed(1)} kB gzip, over the ${JS_BUDGET / 1000} kB budget`);
    },
  },
  {
    name: 'two workers give the diagnostics of one (same seed, same turns), and a split run repeats exactly',
    async fn({ ctx, url }) {
      const doc = withParticles(200_000); // at workers.pool SPLIT_MIN: split where two cores are offered
      const one = await open(ctx, url, '?debug&workers=1', doc);
      const two = await open(ctx, url, '?debug&workers=2', doc);
      const again = await open(ctx, url, '?debug&workers=2', doc);
      assert((await one.evaluate(() => window.__phasewellDebug.workers())) === 1, 'one worker asked for');
      assert((await two.evaluate(() => window.__phasewellDebug.workers())) === 2, 'the beam should be split over two workers');
      for (const p of [one, two, again]) await stepTo(p, 40, 40);
      const [a, b, c] = [await diagnosticsCsv(one), await diagnosticsCsv(two), await diagnosticsCsv(again)];
      assert(a.length === 5 && b.length === 5, `rows (turns 0, 10, …, 40): ${a.length}, ${b.length}`);
      assert(JSON.stringify(b) === JSON.stringify(c), 'a split run must repeat exactly with the same seed');
      for (const p of [one, two, again]) await p.close();
      const rel = (x, y) => Math.abs(x - y) / Math.max(Math.abs(x), Math.abs(y), 1e-300);
      for (let i = 0; i < a.length; i++) {
        for (const k of ['turn', 'alive', 'lost', 'lengthFwhm_s', 'insideFraction']) assert(a[i][k] === b[i][k], `row ${i} ${k}: ${a[i][k]} vs ${b[i][k]}`);
        // Same particles, same arithmetic per particle; only the summation order differs (1e-9 ≫ rounding of 1e5 terms).
        for (const k of ['rmsDt_s', 'rmsDE_eV', 'emittanceRms_eVs']) assert(rel(a[i][k], b[i][k]) < 1e-9, `row ${i} ${k}: ${a[i][k]} vs ${b[i][k]}`);
        for (const k of ['meanDt_s', 'meanDE_eV']) assert(Math.abs(a[i][k] - b[i][k]) < 1e-9 * (k === 'meanDt_s' ? a[i].rmsDt_s : a[i].rmsDE_eV), `row ${i} ${k}`);
        // Split 90/95 % areas come from the merged action histogram: within 0.1 % (core/diagnostics/partial.ts).
        for (const k of ['emittance90_eVs', 'emittance95_eVs']) assert(rel(a[i][k], b[i][k]) < 1e-3, `row ${i} ${k}: ${a[i][k]} vs ${b[i][k]}`);
      }
    },
  },
  {
    name: 'a split beam moves into one worker, keeping its turn, when radiation is added',
    async fn({ ctx, url }) {
      const page = await open(ctx, url, '?debug&workers=2', withParticles(200_000));
      assert((await page.evaluate(() => window.__phasewellDebug.workers())) === 2, 'the beam should start split');
      await stepTo(page, 20, 20);
      const rms = Number(await page.getAttribute('#sum-rms-length', 'data-value'));
      await page.click('#add-radiation'); // radiation noise needs one random stream: one worker
      await page.waitForFunction(() => window.__phasewellDebug.workers() === 1, null, { timeout: 30000 });
      assert((await page.textContent('#turn')) === '20', 'the turn must be kept');
      await stepTo(page, 10, 30);
      const after = Number(await page.getAttribute('#sum-rms-length', 'data-value'));
      // Radiation over 10 turns of a proton ring changes σt by far less than 1 %; a lost or regenerated beam would not.
      assert(Math.abs(after / rms - 1) < 0.05, `rms length ${rms} → ${after}`);
      assert((await page.evaluate(async () => (await window.__phasewellDebug.memory()).length)) === 1, 'one worker left');
    },
  },
  {
    name: 'browser benchmark: 1e6 particles with one and two workers, separatrix update times',
    async fn({ ctx, url }) {
      const figures = [];
      for (const w of [1, 2]) {
        const f = await trackFigures(ctx, url, w, 8000);
        figures.push(f);
        console.log(`     1e6 particles, ${f.workers} worker(s): ${f.turns} turns in ${f.wall.toFixed(1)} s; ${f.workerMpts.toFixed(0)} Mpt/s in the workers, ${f.appMpts.toFixed(0)} Mpt/s in the app; ` +
          `${f.densityFps.toFixed(1)} density pictures/s (plot calls ${(100 * f.drawShare).toFixed(0)} % of a core), ${f.frames.toFixed(1)} frames/s received; ` +
          `CPU: page's main thread ${(100 * f.mainShare).toFixed(0)} %, workers ${(100 * f.workerShare).toFixed(0)} % of a core; long tasks ${f.longTasks}, longest ${f.longest.toFixed(0)} ms; ` +
          `worker memory ${f.memoryMB} MB (heap growth ${f.memoryGrowthMB.toFixed(1)} MB); ${load()}`);
      }
      console.log(`     two workers / one: ${(figures[1].workerMpts / figures[0].workerMpts).toFixed(2)}x in the workers, ${(figures[1].appMpts / figures[0].appMpts).toFixed(2)}x in the app`);
      // Tracking alone (no diagnostics, no pictures, the pages idle): the demo's 1e6 particles, exact drift. One page
      // per worker count; rounds alternate between them, so a change of the machine's load hits both alike. Rounds of
      // 50 turns, as `npm run bench:wasm -- --threads`: each call also costs 1–3 ms of messages and thread wake-ups
      // (page wall time against the workers' own), 2–5 % of a two-worker call of 20 turns.
      const ROUND = 50;
      const pages = [];
      for (const w of [1, 2]) pages.push(await open(ctx, url, `?debug&workers=${w}`, withParticles(1_000_000)));
      for (const tp of pages) await tp.evaluate(() => window.__phasewellDebug.trackSpeed(20, 1)); // warm-up
      const rounds = [];
      for (let r = 0; r < 7; r++) {
        const x = [];
        for (const tp of pages) x.push(await tp.evaluate((t) => window.__phasewellDebug.trackSpeed(t, 1), ROUND));
        rounds.push(x);
      }
      for (const tp of pages) await tp.close();
      const med = (xs) => [...xs].sort((a, b) => a - b)[xs.length >> 1];
      const split = [med(rounds.map((x) => x[0])), med(rounds.map((x) => x[1]))], ratio = med(rounds.map((x) => x[1] / x[0]));
      console.log(`     tracking alone, 1e6 particles (demo, exact drift), 7 alternating rounds of ${ROUND} turns: one worker ${split[0].toFixed(0)}, two workers ${split[1].toFixed(0)} Mpt/s (median ratio ${ratio.toFixed(2)}x); ${load()}`);
      assert(split.every((x) => x > 0), 'the tracking benchmark must run');
      const page = await open(ctx, url, '', null);
      const volts = [21000, 22000, 23000, 24000, 25000, 26000, 27000, 28000, 29000, 30000];
      const one = await separatrixMs(page, 'f-rf-systems-0-voltage', volts);
      const two = structuredClone(demo);
      two.rf.systems.push({ harmonic: 8, voltage: 8000, phase: 180, position: 0 });
      await page.goto(url + 'index.html' + linkFor(two));
      await waitReady(page);
      const several = await separatrixMs(page, 'f-rf-systems-0-voltage', volts);
      await page.goto(url + 'index.html' + linkFor(demo));
      await waitReady(page);
      const typed = await typedEdits(page, 'f-rf-systems-0-voltage', 10);
      console.log(`     edit → bucket numbers / separatrix drawn [ms, median of 5]: 1 RF ${one.numbersMs.toFixed(1)} / ${one.separatrixMs.toFixed(1)}; 2 RF ${several.numbersMs.toFixed(1)} / ${several.separatrixMs.toFixed(1)}; ` +
        `the next 5 edits (warm): 1 RF ${one.warmSeparatrixMs.toFixed(1)}, 2 RF ${several.warmSeparatrixMs.toFixed(1)}; ` +
        `the edit's own task (new numbers and line at its end), first 5 / next 5: 1 RF ${one.taskMs.toFixed(1)} / ${one.warmTaskMs.toFixed(1)}, 2 RF ${several.taskMs.toFixed(1)} / ${several.warmTaskMs.toFixed(1)}; ${load()}`);
      console.log(`     10 typed edits, 1 RF (Event Timing): keypress processing ${typed.processingMs.toFixed(1)} ms, key → next frame ${typed.durationMs} ms (medians; ${typed.under16} under 16 ms); ${load()}`);
      // The turn kernel alone in the tracking worker (core/kernels/speed.ts), on an idle page.
      const kp = await open(ctx, url, '?debug', null);
      const ks = await kp.evaluate(() => window.__phasewellDebug.kernelSpeeds());
      await kp.close();
      console.log(`     turn kernel alone in a Chromium worker, 1e6 particles: ${ks.map((k) => `${k.rfSystems} RF ${k.drift} ${k.mpts.toFixed(0)}`).join(', ')} Mpt/s (${ks[0].impl}); ${load()}`);
      assert(ks.length === 3 && ks.every((k) => k.mpts > 0), 'the kernel benchmark must run in the worker');
      assert(figures.every((f) => f.turns > 0 && f.densityFps >= 2), 'the density picture must keep updating while tracking');
      assert(Number.isFinite(one.separatrixMs) && Number.isFinite(several.separatrixMs), 'the separatrix must follow an edit');
    },
  },
];
