// Browser tests of the cycle view, the program editor, the design helpers and the intensity view.
import { readFileSync } from 'node:fs';
import { ok } from './harness.mjs';
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

// x and y of a named trace of a cycle plot, once the plot is drawn.
async function cycleTrace(page, plot, name) {
  await page.waitForFunction(([p, n]) => document.getElementById('plot-cycle-' + p)?.data?.some((t) => t.name === n), [plot, name], { timeout: 20000 });
  return page.evaluate(([p, n]) => {
    const t = document.getElementById('plot-cycle-' + p).data.find((d) => d.name === n);
    return { x: Array.from(t.x), y: Array.from(t.y) };
  }, [plot, name]);
}

export const cycleTests = [
  {
    name: 'cycle view: φs crosses 90° at the transition time, the slope switch shows up while tracking',
    async fn({ ctx, url }) {
      const page = await openPreset(ctx, url, 'hazel-transition-jump');
      await page.click('#tab-cycle');
      const { x, y } = await cycleTrace(page, 'phis', 'φs');
      const i = y.findIndex((v, k) => k > 0 && y[k - 1] < 90 && v > 90);
      ok(i > 0, `φs never crosses 90°: ${y.slice(0, 5)} … ${y.slice(-5)}`);
      const dx = x[1] - x[0];
      // The preset sets the switch at the time γ crosses γt = 3 (rf.switchTime, in s; the plot is in ms).
      const tSwitch = hazel.rf.switchTime * 1e3;
      ok(x[i - 1] <= tSwitch + dx && x[i] >= tSwitch - dx, `φs crosses 90° between ${x[i - 1]} and ${x[i]} ms, switch at ${tSwitch} ms`);
      const tt = Number(await page.getAttribute('#cycle-transition', 'data-value')) * 1e3;
      ok(Math.abs(tt - tSwitch) < dx, `planner's transition time ${tt} ms vs ${tSwitch} ms`);
      ok(y.slice(0, i).every((v) => v < 90) && y.slice(i).every((v) => v > 90), 'φs should stay on one side of 90° before and after');
      await page.fill('#tpf', '400');
      await stepTo(page, 3600, 3600, 90000);
      const events = await page.textContent('#cycle-events');
      ok(/stable phase switched from the rising to the falling RF slope/.test(events), `events: ${events}`);
      ok(/rf\.switchTime = 0\.00121029 s/.test(events), `the message names the set time: ${events}`);
      await page.waitForTimeout(1200);
      await page.screenshot({ path: ARTIFACTS + 'cycle-view.png' });
    },
  },
];
