// Browser tests of the cycle view, the program editor, the design helpers and the intensity view.
import { readFileSync } from 'node:fs';
import { inflateSync, strFromU8 } from 'fflate';
import { assert } from './harness.mjs';
import { openApp, stepTo, waitReady } from './page.mjs';

const ROOT = new URL('../../', import.meta.url).pathname;
const ARTIFACTS = ROOT + 'test-artifacts/';
const hazel = JSON.parse(readFileSync(ROOT + 'examples/hazel-transition-jump.json', 'utf8'));

async function openPreset(ctx, url, id) {
  const page = await openApp(ctx, url);
  await page.selectOption('#preset', id);
  await waitReady(page);
  return page;
}

// Wait until a cycle plot shows a cycle of at least tEnd ms (a plan of the previous setup may be drawn first).
async function waitCycleEnd(page, plot, tEnd) {
  await page.waitForFunction(([p, e]) => {
    const t = document.getElementById('plot-cycle-' + p)?.data?.[0];
    return t && t.x[t.x.length - 1] >= e;
  }, [plot, tEnd], { timeout: 20000 });
}

// x and y of a named trace of a cycle plot, once the plot is drawn.
async function cycleTrace(page, plot, name) {
  await page.waitForFunction(([p, n]) => document.getElementById('plot-cycle-' + p)?.data?.some((t) => t.name === n), [plot, name], { timeout: 20000 });
  return page.evaluate(([p, n]) => {
    const t = document.getElementById('plot-cycle-' + p).data.find((d) => d.name === n);
    return { x: Array.from(t.x), y: Array.from(t.y) };
  }, [plot, name]);
}

// The setup a page's link carries (the fragment is deflated JSON in base64url). The address bar follows edits
// after a short delay: poll until `until(setup)` holds (at most 5 s), then return the last one read.
async function linkedSetup(page, until = () => true) {
  let doc = null;
  for (let i = 0; i < 50; i++) {
    await page.waitForTimeout(100);
    const b64 = new URL(page.url()).hash.replace(/^#s1=/, '').replace(/-/g, '+').replace(/_/g, '/');
    doc = JSON.parse(strFromU8(inflateSync(Buffer.from(b64, 'base64'))));
    if (until(doc)) break;
  }
  return doc;
}

const csv = (name, text) => ({ name, mimeType: 'text/csv', buffer: Buffer.from(text) });

export const cycleTests = [
  {
    name: 'cycle view: φs crosses 90° at the transition time, the slope switch shows up while tracking',
    async fn({ ctx, url }) {
      const page = await openPreset(ctx, url, 'hazel-transition-jump');
      await page.click('#tab-cycle');
      await waitCycleEnd(page, 'phis', 5.6); // the hazel cycle: 16000 turns, 5.68 ms
      const { x, y } = await cycleTrace(page, 'phis', 'φs');
      const i = y.findIndex((v, k) => k > 0 && y[k - 1] < 90 && v > 90);
      assert(i > 0, `φs never crosses 90°: ${y.slice(0, 5)} … ${y.slice(-5)}`);
      const dx = x[1] - x[0];
      // The preset sets the switch at the time γ crosses γt = 3 (rf.switchTime, in s; the plot is in ms).
      const tSwitch = hazel.rf.switchTime * 1e3;
      assert(x[i - 1] <= tSwitch + dx && x[i] >= tSwitch - dx, `φs crosses 90° between ${x[i - 1]} and ${x[i]} ms, switch at ${tSwitch} ms`);
      const tt = Number(await page.getAttribute('#cycle-transition', 'data-value')) * 1e3;
      assert(Math.abs(tt - tSwitch) < dx, `planner's transition time ${tt} ms vs ${tSwitch} ms`);
      assert(y.slice(0, i).every((v) => v < 90) && y.slice(i).every((v) => v > 90), 'φs should stay on one side of 90° before and after');
      // Flagged intervals: listed and shaded; the filling threshold is the user's, a bad one is named and not used.
      assert(/not adiabatic/.test(await page.textContent('#cycle-intervals')), 'the jump at transition is not adiabatic');
      const rects = () => page.evaluate(() => document.getElementById('plot-cycle-phis').layout.shapes.filter((r) => r.type === 'rect').length);
      const r0 = await rects();
      assert(r0 >= 1, 'the flagged interval is shaded');
      await page.fill('#cycle-filling-limit', '-1');
      const ferr = await page.textContent('#cycle-filling-limit-error');
      assert(/filling limit = -1: must be a number in \[1e-6, 10\]/.test(ferr), `limit error: ${ferr}`);
      await page.fill('#cycle-filling-limit', '0.001');
      await page.waitForFunction(() => /bucket too small/.test(document.getElementById('cycle-intervals').textContent));
      await page.waitForFunction((n) => document.getElementById('plot-cycle-phis').layout.shapes.filter((r) => r.type === 'rect').length > n, r0, { timeout: 10000 });
      await page.screenshot({ path: ARTIFACTS + 'cycle-flagged.png' });
      await page.fill('#cycle-filling-limit', '0.8');
      await page.waitForFunction(() => !/bucket too small/.test(document.getElementById('cycle-intervals').textContent));
      // The slope switch offered at the planner's transition time, in the editor's ms.
      await page.selectOption('#f-rf-slope', 'auto');
      await page.selectOption('#f-rf-slope', 'timed');
      const sw = Number(await page.inputValue('#f-rf-switchTime'));
      assert(Math.abs(sw - tt) < 1e-5, `switch time prefilled with ${sw} ms, planner ${tt} ms`);
      await page.fill('#tpf', '400');
      await stepTo(page, 3600, 3600, 90000);
      const events = await page.textContent('#cycle-events');
      assert(/stable phase switched from the rising to the falling RF slope/.test(events), `events: ${events}`);
      assert(/rf\.switchTime = 0\.00121029 s/.test(events), `the message names the set time: ${events}`);
      await page.waitForTimeout(1200);
      await page.screenshot({ path: ARTIFACTS + 'cycle-view.png' });
    },
  },
  {
    name: 'program editor: a CSV momentum table is imported; a file with a bad row names the line and keeps the program',
    async fn({ ctx, url }) {
      const page = await openApp(ctx, url);
      await page.setInputFiles('#csv-momentum', csv('ramp.csv', 'time_ms,kinetic_MeV\n# a slow ramp\n2,205\n10,230\n'));
      await page.waitForSelector('#csv-momentum-done');
      assert((await page.inputValue('#f-energy-ramp-points-0-0')) === '2' && (await page.inputValue('#f-energy-ramp-points-1-1')) === '230', 'table rows after import');
      const linked = await linkedSetup(page, (d) => d.energy.ramp.kind === 'table');
      assert(JSON.stringify(linked.energy.ramp) === JSON.stringify({ kind: 'table', quantity: 'kinetic', points: [[0.002, 2.05e8], [0.01, 2.3e8]] }), `link: ${JSON.stringify(linked.energy.ramp)}`);
      await page.click('#tab-cycle');
      await waitCycleEnd(page, 'energy', 9.99); // the table ends at 10 ms
      const e = await cycleTrace(page, 'energy', 'kinetic energy');
      assert(Math.abs(e.y[e.y.length - 1] - 0.23) < 1e-6, `the planned cycle ends at ${e.y[e.y.length - 1]} GeV, the table at 0.23`);
      // Line 4 holds the bad value (line 2 is a comment, blank lines count).
      await page.setInputFiles('#csv-momentum', csv('bad.csv', 'time_ms,kinetic_MeV\n# comment\n1,220\n2,abc\n3,300\n'));
      const err = await (await page.waitForSelector('#csv-momentum-error')).textContent();
      assert(/line 4: kinetic "abc" is not a number/.test(err), `error: ${err}`);
      assert((await page.inputValue('#f-energy-ramp-points-1-1')) === '230' && (await page.$$('#tbl-energy-ramp-points tbody tr')).length === 2, 'the previous table must stay');
      assert(JSON.stringify((await linkedSetup(page)).energy.ramp) === JSON.stringify(linked.energy.ramp), 'the link must keep the previous program');
      // A bad cell: the message names the field, the value and the range next to the table; the text stays.
      await page.fill('#f-energy-ramp-points-1-0', '-2');
      const cell = await (await page.waitForSelector('#tbl-energy-ramp-points-error')).textContent();
      assert(/energy\.ramp\.points\[1\]\[0\] = -0\.002: must be in \[0, 10000\] s/.test(cell), `cell error: ${cell}`);
      assert((await page.inputValue('#f-energy-ramp-points-1-0')) === '-2', 'the typed text must stay');
      await page.screenshot({ path: ARTIFACTS + 'cycle-program-editor.png' });
    },
  },
  {
    name: 'design helper: a constant-bucket voltage program is proposed, applied, and carried by the link',
    async fn({ ctx, url }) {
      const page = await openApp(ctx, url);
      await page.fill('#f-run-turns', '20000'); // a ten times longer ramp: the bucket grows by 10 % at constant voltage
      await page.click('#tab-cycle');
      await waitCycleEnd(page, 'area', 21); // the 20000-turn cycle (21.2 ms)
      const before = await cycleTrace(page, 'voltage', 'system 1');
      assert(new Set(before.y).size === 1, 'the demo voltage should start constant');
      const area0 = await cycleTrace(page, 'area', 'bucket area');
      assert(Math.max(...area0.y) / Math.min(...area0.y) > 1.05, 'at constant voltage the bucket area should change along the ramp');
      await page.click('#design-constant');
      await page.waitForSelector('#design-proposal', { timeout: 30000 });
      await cycleTrace(page, 'voltage', 'proposed, system 1');
      await page.screenshot({ path: ARTIFACTS + 'cycle-design-proposal.png' });
      await page.click('#design-apply');
      await page.waitForFunction(() => {
        const t = document.getElementById('plot-cycle-voltage')?.data?.find((d) => d.name === 'system 1');
        return t && new Set(t.y).size > 10;
      }, null, { timeout: 20000 });
      const after = await cycleTrace(page, 'voltage', 'system 1');
      assert(Math.max(...after.y) / Math.min(...after.y) > 1.02, `the voltage should follow the ramp: ${after.y[0]} → ${after.y[after.y.length - 1]} kV`);
      // The point of the program: the planner now sees a bucket area constant to within 2 %.
      const area = await cycleTrace(page, 'area', 'bucket area');
      const lo = Math.min(...area.y), hi = Math.max(...area.y);
      assert(hi / lo < 1.02, `bucket area ${lo} … ${hi} eV·s`);
      const linked = await linkedSetup(page, (d) => d.rf.systems[0].program?.voltage);
      const prog = linked.rf.systems[0].program?.voltage;
      assert(Array.isArray(prog) && prog.length > 5, `link voltage program: ${JSON.stringify(prog)?.slice(0, 80)}`);
      assert(await page.isVisible('#tbl-rf-systems-0-program-voltage'), 'the editor shows the voltage table');
      await page.screenshot({ path: ARTIFACTS + 'cycle-design-applied.png' });
    },
  },
  {
    name: 'intensity: induced voltage, impedance loss and radiation numbers of the example rings',
    async fn({ ctx, url }) {
      const page = await openPreset(ctx, url, 'fir-intense-protons');
      await page.click('#tab-intensity');
      await page.waitForFunction(() => document.getElementById('plot-int-voltage')?.data?.some((t) => t.name === 'induced'), null, { timeout: 30000 });
      const ind = await page.evaluate(() => document.getElementById('plot-int-voltage').data.find((t) => t.name === 'induced').y);
      const peak = Math.max(...ind.map(Math.abs));
      assert(peak > 0.1, `peak induced voltage ${peak} kV`);
      const k = Number(await page.getAttribute('#int-loss-factor', 'data-value'));
      const u = Number(await page.getAttribute('#int-loss-particle', 'data-value'));
      assert(k > 0 && u > 0, `a resistive impedance takes energy: k = ${k} V/C, ${u} eV per particle per turn`);
      // The well with the beam stays close to the RF one (a 4e12 bunch changes the bucket by some per cent, not by orders).
      const well = await page.evaluate(() => Object.fromEntries(document.getElementById('plot-int-well').data.map((t) => [t.name, Math.max(...t.y)])));
      assert(well['with the beam'] > 0.5 * well['RF alone'] && well['with the beam'] < 2 * well['RF alone'], `well depths: ${JSON.stringify(well)}`);
      const sep = await page.evaluate(() => document.getElementById('plot-int-separatrix').data.map((t) => t.name));
      assert(sep.includes('with the beam') && sep.includes('RF alone'), `separatrix traces: ${sep}`);
      await page.waitForTimeout(600);
      await page.screenshot({ path: ARTIFACTS + 'intensity-view.png' });
      // Impedance table from CSV: a bad row is named by its line and nothing changes; a good file adds the table.
      const models = () => page.$$eval('#sec-collective legend', (l) => l.map((x) => x.textContent).filter((t) => /Resonator|Space charge|Inductive|table/.test(t)).length);
      const n0 = await models();
      await page.setInputFiles('#csv-impedance', csv('z-bad.csv', 'frequency_GHz,re_Ohm,im_Ohm\n0.1,10,1\nx,1,1\n'));
      const zerr = await (await page.waitForSelector('#csv-impedance-error')).textContent();
      assert(/line 3: frequency "x" is not a number/.test(zerr), `impedance CSV error: ${zerr}`);
      assert((await models()) === n0, 'a bad impedance file must not change the list');
      await page.setInputFiles('#csv-impedance', csv('z.csv', 'frequency_GHz,re_Ohm,im_Ohm\n0.1,10,1\n1,20,5\n'));
      await page.waitForFunction((n) => [...document.querySelectorAll('#sec-collective legend')].filter((l) => /Impedance table/.test(l.textContent)).length === 1, n0);
      const zl = (await linkedSetup(page, (d) => d.impedances.at(-1)?.kind === 'table')).impedances.at(-1);
      assert(zl.kind === 'table' && zl.frequency[1] === 1e9 && zl.im[1] === 5, `link impedance: ${JSON.stringify(zl)}`);
      await page.evaluate(() => document.getElementById('sec-collective').scrollIntoView());
      await page.screenshot({ path: ARTIFACTS + 'intensity-editor.png' });
      // Lepton ring: U0 = 88.46 keV·E[GeV]⁴/ρ[m] (Sands, SLAC-121, electrons and positrons) = 843 keV at 3 GeV, ρ = 8.5 m.
      await page.selectOption('#preset', 'elm-lepton-ring');
      await waitReady(page);
      await page.click('#tab-beam');
      await page.waitForSelector('#sum-loss-turn', { timeout: 30000 });
      const u0 = Number(await page.getAttribute('#sum-u0', 'data-value'));
      assert(Math.abs(u0 / ((88.46e3 * 81) / 8.5) - 1) < 2e-3, `U0 = ${u0} eV`);
      assert(Number(await page.getAttribute('#sum-tau-e', 'data-value')) > 0, 'damping time');
      await page.screenshot({ path: ARTIFACTS + 'intensity-summary.png' });
    },
  },
];
