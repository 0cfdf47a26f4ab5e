// Browser tests of the hardening work: bad values and warnings next to their fields, the memory estimate and the
// refusal of a count over the budget, autosave across reloads (and a corrupted autosave), and the Content
// Security Policy (present, no violation by the app, a request to another origin blocked). The harness probe
// fails every test on a request that leaves the page's origin (see harness.mjs).
import { readFileSync } from 'node:fs';
import { assert } from './harness.mjs';
import { openApp, stepTo, summary, waitReady } from './page.mjs';

const ROOT = new URL('../../', import.meta.url).pathname;
const birch = JSON.parse(readFileSync(ROOT + 'examples/birch-transition.json', 'utf8'));
const text = async (page, sel) => (await (await page.waitForSelector(sel)).textContent()).trim();

/** Tests for run.mjs. */
export const hardeningTests = [
  {
    name: 'hardening: a bad value is shown next to its field with the allowed range; a warning sits next to run.drift',
    async fn({ ctx, url }) {
      const page = await openApp(ctx, url);
      const area = await summary(page, 'area');
      await page.fill('#f-ring-circumference', '-3');
      assert(/ring\.circumference = -3: must be in \[1, 100000\] m/.test(await text(page, '#f-ring-circumference-error')), 'circumference error');
      await page.fill('#f-rf-systems-0-voltage', 'abc');
      assert(/rf\.systems\[0\]\.voltage = "abc": must be a number in \[0, 1e9\] V/.test(await text(page, '#f-rf-systems-0-voltage-error')), 'voltage error');
      assert((await page.inputValue('#f-rf-systems-0-voltage')) === 'abc', 'the typed text stays in the field');
      assert((await summary(page, 'area')) === area, 'the last valid setup keeps running');
      // A setup near transition with the linear drift runs, with a warning next to the drift field.
      const near = { ...birch, energy: { start: { quantity: 'total', value: 5.49 * 938.272e6 }, ramp: { kind: 'flat' } }, run: { ...birch.run, drift: 'linear' }, beam: { ...birch.beam, particles: 2000 } };
      await page.setInputFiles('#load-setup-file', { name: 'near.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(near)) });
      const w = await text(page, '#f-run-drift-warning');
      assert(/warning: run\.drift = "linear": near transition: \|η0\| = .* use "exact"/.test(w), `drift warning: ${w}`);
      await waitReady(page);
    },
  },
  {
    name: 'hardening: the memory estimate is shown next to the macroparticles and a count over the budget is refused',
    async fn({ ctx, url }) {
      const page = await openApp(ctx, url);
      const est = await text(page, '#memory-estimate');
      assert(/^about [\d.]+ MB in the browser \(budget 512 MB\)$/.test(est), `estimate: ${est}`);
      await page.fill('#f-beam-particles', '200000');
      await page.waitForFunction(() => Number(document.getElementById('memory-estimate').dataset.bytes) > 6.4e6);
      await waitReady(page);
      await page.fill('#f-beam-particles', '20000000');
      const err = await text(page, '#f-beam-particles-error');
      assert(/beam\.particles = 2e7: needs about \d+ MB in the browser, over its 512 MB budget: must be an integer in \[1, \d+\]/.test(err), `refusal: ${err}`);
      assert(/1 problem/.test(await text(page, '#editor-state')), 'the problem is listed on top of the editor');
      await page.waitForTimeout(300);
      assert((await page.textContent('#status')) === 'ready', 'no run is started for a refused count');
      await page.fill('#f-beam-particles', '5000');
      await waitReady(page);
      await stepTo(page, 10, 10);
    },
  },
  {
    name: 'hardening: the autosave brings back the setup and the unfinished draft after a reload',
    async fn({ ctx, url }) {
      const page = await openApp(ctx, url);
      await page.fill('#f-rf-systems-0-voltage', '24');
      await waitReady(page);
      await page.fill('#f-ring-circumference', 'abc'); // an unfinished edit
      await page.waitForTimeout(800); // autosave writes 0.4 s after the last change
      await page.goto(url); // no link: the autosave opens
      await waitReady(page);
      assert((await text(page, '#notice')).includes('Restored the setup autosaved in this browser'), 'restore notice');
      assert((await page.inputValue('#f-rf-systems-0-voltage')) === '24', 'voltage restored');
      assert((await page.inputValue('#f-ring-circumference')) === 'abc', 'the draft value came back');
      assert(/ring\.circumference = "abc"/.test(await text(page, '#f-ring-circumference-error')), 'with its problem next to it');
      assert(page.url().includes('#s1='), 'the link of the restored setup is in the address bar');
      // A broken link opens the autosaved work (not the default) and the link itself is kept.
      await page.goto(url + 'index.html#s1=broken-link-data');
      await waitReady(page);
      const n = await text(page, '#notice.error');
      assert(n.includes('the setup autosaved in this browser is shown instead'), `notice: ${n}`);
      assert((await page.inputValue('#f-rf-systems-0-voltage')) === '24', 'the autosaved setup is shown');
      assert((await page.evaluate(() => localStorage.getItem('phasewell.link.unreadable'))) === '#s1=broken-link-data', 'the broken link is kept');
    },
  },
  {
    name: 'hardening: a corrupted autosave is ignored with a message, kept aside, and the page works',
    async fn({ ctx, url }) {
      const page = await openApp(ctx, url);
      for (const [bad, want] of [
        ['{"format":1,"valid":{"version":1,', /not valid JSON/],
        [JSON.stringify({ format: 1, savedAt: 'x', valid: { ...birch, rf: { systems: [{ harmonic: 10, voltage: -5 }] } }, draft: null }), /valid setup: rf\.systems\[0\]\.voltage = -5: must be in \[0, 1e9\] V/],
        ['"just a string"', /not in format 1/],
      ]) {
        // Written as the page goes away, after the app's own last autosave.
        await page.evaluate((t) => window.addEventListener('pagehide', () => localStorage.setItem('phasewell.autosave', t)), bad);
        await page.goto(url);
        await waitReady(page);
        const n = await text(page, '#notice.error');
        assert(n.includes('The autosaved setup could not be read and was ignored') && want.test(n), `notice: ${n}`);
        assert((await page.evaluate(() => localStorage.getItem('phasewell.autosave.unreadable'))) === bad, 'the unreadable autosave is kept aside');
        await page.evaluate(() => localStorage.removeItem('phasewell.autosave'));
      }
      await stepTo(page, 10, 10);
    },
  },
  {
    name: 'hardening: the Content Security Policy is present, the app causes no violation, and a request to another origin is blocked',
    async fn({ ctx, url, probe }) {
      const watch = () => {
        window.__csp = [];
        document.addEventListener('securitypolicyviolation', (e) => window.__csp.push(`${e.violatedDirective} ${e.blockedURI}`));
      };
      await ctx.addInitScript(watch);
      const page = await openApp(ctx, url);
      const csp = await page.getAttribute('meta[http-equiv="Content-Security-Policy"]', 'content');
      assert(/default-src 'self'/.test(csp) && /'wasm-unsafe-eval'/.test(csp) && /connect-src 'self'/.test(csp), `CSP: ${csp}`);
      await stepTo(page, 50, 50); // worker, WebAssembly kernel and every plot at work
      const [png] = await Promise.all([page.waitForEvent('download'), page.click('section.phase button')]);
      assert((await png.suggestedFilename()).endsWith('.png'), 'PNG export');
      assert((await page.evaluate(() => window.__csp)).length === 0, `violations: ${await page.evaluate(() => window.__csp.join('; '))}`);
      assert(probe.state.requests > 0, 'the probe saw the requests (all on this origin)');
      // In a separate, unprobed context (the refusal logs console errors): a fetch to another origin is refused by the policy.
      const other = await ctx.browser().newContext();
      try {
        await other.addInitScript(watch);
        const p = await other.newPage();
        await p.goto(url);
        const res = await p.evaluate(() => fetch('https://example.invalid/x').then(() => 'fetched', (e) => `refused: ${e.message}`));
        const v = await p.evaluate(() => window.__csp);
        assert(res.startsWith('refused'), `fetch to another origin: ${res}`);
        assert(v.some((s) => s.startsWith('connect-src') && s.includes('example.invalid')), `violation reported: ${v.join('; ')}`);
      } finally {
        await other.close();
      }
    },
  },
];
