// Page helpers: wait for the app to be ready, read plot traces and summary numbers.

/** Open the app (optionally with a fragment) and wait until the beam is generated and drawn. */
export async function openApp(ctx, url) {
  const page = await ctx.newPage();
  await page.goto(url);
  await waitReady(page);
  return page;
}

/** Wait for a generated beam, an idle tracker and a drawn phase-space plot with a separatrix. */
export async function waitReady(page, timeout = 20000) {
  await page.waitForFunction(() => {
    const s = document.getElementById('status')?.textContent ?? '';
    const top = document.getElementById('plot-phase')?.data ?? [];
    const beam = document.getElementById('plot-phase-beam')?.data ?? [];
    const density = Number(document.getElementById('plot-phase-density')?.dataset.counts ?? 0);
    return s === 'ready' && top.some((t) => t.name === 'separatrix' && t.x?.length > 0) && (density > 0 || beam.some((t) => t.name === 'particles'));
  }, null, { timeout });
}

/** Particles counted in the density picture now on screen (its canvas layer records the sum of its cells). */
export function densityCounts(page) {
  return page.evaluate(() => Number(document.getElementById('plot-phase-density')?.dataset.counts ?? 0));
}

/** Trace summaries of a Plotly plot: name, type, point count, and the sum of a heatmap's z. */
export function traces(page, id) {
  return page.evaluate((id) => {
    const el = document.getElementById('plot-' + id);
    return (el?.data ?? []).map((t) => {
      let zsum = 0;
      if (Array.isArray(t.z)) for (const row of t.z) for (const v of row) zsum += v ?? 0;
      return { name: t.name, type: t.type, n: t.x ? t.x.length : 0, zsum, x: t.x ? Array.from(t.x) : [], y: t.y ? Array.from(t.y) : [] };
    });
  }, id);
}

/** Full-precision number of a summary item (#sum-<id>). */
export async function summary(page, id) {
  return Number(await page.getAttribute('#sum-' + id, 'data-value'));
}

/** Step n turns and wait until the turn counter shows `until`. */
export async function stepTo(page, n, until, timeout = 30000) {
  await page.fill('#step-n', String(n));
  await page.click('#step');
  await page.waitForFunction((u) => document.getElementById('turn')?.textContent === String(u) && document.getElementById('run')?.textContent === 'Run', until, { timeout });
}
