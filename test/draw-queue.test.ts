// The plot draw queue (app/views/schedule.ts) in Node: MessageChannel and performance are Node's own, the
// animation frame is a 16 ms timer. Drawing tasks are counted where the queue posts them (its channel's port).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

let posts = 0;
const RealChannel = globalThis.MessageChannel;
class CountingChannel extends RealChannel {
  constructor() {
    super();
    const post = this.port2.postMessage.bind(this.port2);
    this.port2.postMessage = (m: unknown) => { posts++; post(m); };
  }
}
const g = globalThis as unknown as { requestAnimationFrame?: (f: () => void) => unknown };
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

let q: typeof import('../app/views/schedule.ts');
let useApp: typeof import('../app/store.ts').useApp;

beforeAll(async () => {
  globalThis.MessageChannel = CountingChannel;
  g.requestAnimationFrame = (f) => setTimeout(f, 16);
  q = await import('../app/views/schedule.ts');
  useApp = (await import('../app/store.ts')).useApp;
});
afterAll(() => {
  globalThis.MessageChannel = RealChannel;
  delete g.requestAnimationFrame;
  useApp.setState({ running: false });
});

describe('draw queue', () => {
  it('while tracking, a plot waiting for its gap is drawn once it is due, and the queue sleeps meanwhile', async () => {
    useApp.setState({ running: true });
    const drawn: number[] = [];
    q.scheduleDraw('slow-plot', () => drawn.push(performance.now()), 150);
    await sleep(40);
    expect(drawn).toHaveLength(1); // never drawn before: due at once
    posts = 0;
    const asked = performance.now();
    q.scheduleDraw('slow-plot', () => drawn.push(performance.now()), 150);
    await sleep(220);
    expect(drawn).toHaveLength(2);
    // Drawn at its gap (start to start), not a frame or more later.
    expect(drawn[1] - drawn[0]).toBeGreaterThanOrEqual(150 - 1);
    expect(drawn[1] - drawn[0]).toBeLessThan(150 + 30);
    expect(drawn[1] - asked).toBeGreaterThan(50);
    // A queue that polled until the plot came due posted a task every few hundred µs here (hundreds in 150 ms).
    expect(posts).toBeLessThanOrEqual(3);
  });

  it('when idle, a request is drawn in the next animation frame', async () => {
    useApp.setState({ running: false });
    let at = NaN;
    const t0 = performance.now();
    q.scheduleDraw('edit-plot', () => { at = performance.now(); });
    expect(Number.isNaN(at)).toBe(true); // not in the caller's task
    await sleep(60);
    expect(at - t0).toBeGreaterThanOrEqual(15);
    expect(at - t0).toBeLessThan(60);
  });
});
