// Browser tests of worker supervision: a worker made to fail (through the ?debug hook) is replaced, the notice bar
// says so, the setup (fields and link) stays as it was and the beam starts again from turn 0.
import { assert } from './harness.mjs';
import { stepTo, waitReady } from './page.mjs';

const FIELDS = ['#f-rf-systems-0-voltage', '#f-beam-seed', '#f-beam-particles', '#f-energy-ramp-value'];

// split: the beam over two workers (200 000 particles, the pool's SPLIT_MIN), and the second worker fails.
async function failAndRecover(ctx, url, how, whileRunning, split = false) {
  const page = await ctx.newPage();
  await page.goto(url + (split ? '?debug&workers=2' : '?debug'));
  await waitReady(page);
  await page.fill('#f-rf-systems-0-voltage', '23'); // an edit, so "unchanged" means more than the default
  if (split) await page.fill('#f-beam-particles', '200000');
  await page.waitForTimeout(400); // the link is written 250 ms after the last edit
  await waitReady(page);
  if (split) assert((await page.evaluate(() => window.__phasewellDebug.workers())) === 2, 'the beam should be split');
  await stepTo(page, 20, 20);
  const before = { hash: await page.evaluate(() => location.hash), fields: await Promise.all(FIELDS.map((f) => page.inputValue(f))) };
  if (whileRunning) {
    await page.click('#run');
    await page.waitForFunction(() => Number(document.getElementById('turn').textContent) > 20);
  }
  const t0 = Date.now();
  await page.evaluate(([how, k]) => window.__phasewellDebug.failWorker(how, k), [how, split ? 1 : 0]);
  // 'close' is noticed by the 5 s deadline (or the 2 s idle heartbeat plus its deadline), 'throw' by the error event.
  await page.waitForFunction(() => document.getElementById('notice')?.textContent.includes('restarted'), null, { timeout: 15000 });
  const noticed = Date.now() - t0;
  await page.waitForFunction(() => document.getElementById('turn')?.textContent === '0', null, { timeout: 20000 });
  await waitReady(page);
  const after = { hash: await page.evaluate(() => location.hash), fields: await Promise.all(FIELDS.map((f) => page.inputValue(f))) };
  const notice = await page.textContent('#notice');
  console.log(`     ${split ? 'second worker of a split beam, ' : ''}${how}${whileRunning ? ' while tracking' : ' while idle'}: restart noticed after ${noticed} ms; notice: ${notice.slice(0, 120)}`);
  assert(after.hash === before.hash, 'the link must not change');
  assert(after.fields.every((v, i) => v === before.fields[i]), `fields ${before.fields} → ${after.fields}`);
  assert(/turn 0/.test(notice), 'the notice must say the beam starts again from turn 0');
  // The new worker tracks.
  await stepTo(page, 10, 10);
  return noticed;
}

/** Supervision tests (registered in run.mjs). */
export const faultTests = [
  {
    name: 'a tracking worker that closes itself while tracking is restarted with the same setup',
    async fn({ ctx, url }) {
      const ms = await failAndRecover(ctx, url, 'close', true);
      assert(ms < 12000, `noticed after ${ms} ms (deadline 5 s)`);
    },
  },
  {
    name: 'a tracking worker that throws while idle is restarted with the same setup',
    async fn({ ctx, url }) {
      await failAndRecover(ctx, url, 'throw', false);
    },
  },
  {
    name: 'the second worker of a split beam that closes itself while tracking is restarted with the same setup',
    async fn({ ctx, url }) {
      const ms = await failAndRecover(ctx, url, 'close', true, true);
      assert(ms < 12000, `noticed after ${ms} ms (deadline 5 s)`);
    },
  },
  {
    name: 'a tracking worker that hangs is restarted after the 5 s deadline',
    async fn({ ctx, url }) {
      const ms = await failAndRecover(ctx, url, 'hang', true);
      assert(ms >= 4000, `a hang must be noticed by the deadline, not earlier (${ms} ms)`);
    },
  },
];
