// The phase-space density picture, drawn on a canvas layer: one pixel per histogram cell on a small image, scaled
// into the plot area by the browser (smoothing on). Colours of DENSITY_SCALE, linear between the smallest and the
// largest filled cell; empty cells stay transparent. A Plotly heatmap of the same grid took 10–14 ms a picture
// (it encodes its image as a PNG every time); this takes about 1 ms.
// Coordinates: the layer shares the margins and axis ranges of the phase-space axes (x in ns, y in display units).
import type { ViewWindow } from '../../workers/protocol.ts';

export interface PlotBox {
  /** Margins [CSS px] of the plot area in the layer, as the Plotly layers' layout.margin. */
  margin: { l: number; r: number; t: number; b: number };
  /** Axis ranges: x in ns, y in the display unit of dE. */
  xr: [number, number];
  yr: [number, number];
  /** dE [eV] to the display unit. */
  k: number;
}

/** RGBA of n levels along a colour scale of [position, '#rrggbb'] stops, interpolated linearly in RGB. */
export function colourTable(scale: [number, string][], n = 256): Uint8ClampedArray {
  const rgb = scale.map(([p, c]) => [p, parseInt(c.slice(1, 3), 16), parseInt(c.slice(3, 5), 16), parseInt(c.slice(5, 7), 16)]);
  const out = new Uint8ClampedArray(4 * n);
  for (let i = 0; i < n; i++) {
    const x = i / (n - 1);
    let s = 1;
    while (s < rgb.length - 1 && rgb[s][0] < x) s++;
    const [p0, r0, g0, b0] = rgb[s - 1], [p1, r1, g1, b1] = rgb[s];
    const f = p1 > p0 ? Math.min(1, Math.max(0, (x - p0) / (p1 - p0))) : 0;
    out[4 * i] = r0 + f * (r1 - r0);
    out[4 * i + 1] = g0 + f * (g1 - g0);
    out[4 * i + 2] = b0 + f * (b1 - b0);
    out[4 * i + 3] = 255;
  }
  return out;
}

// The nx × ny image of each layer and its pixels, reused from picture to picture.
const images = new WeakMap<HTMLCanvasElement, { cells: HTMLCanvasElement; img: ImageData }>();

/**
 * Paint counts `hist` (row-major, row 0 at the bottom) as an nx × ny image for layer `canvas`: colours of `lut`
 * linear between the smallest and the largest positive count, other cells transparent. Returns the image and the
 * sum of the counts.
 */
export function cellImage(canvas: HTMLCanvasElement, hist: Float32Array, nx: number, ny: number, lut: Uint8ClampedArray): { image: HTMLCanvasElement; total: number } {
  let im = images.get(canvas);
  if (!im || im.img.width !== nx || im.img.height !== ny) {
    const cells = im?.cells ?? document.createElement('canvas');
    cells.width = nx;
    cells.height = ny;
    im = { cells, img: cells.getContext('2d')!.createImageData(nx, ny) };
    images.set(canvas, im);
  }
  const px = im.img.data, levels = lut.length / 4 - 1;
  px.fill(0);
  let zmin = Infinity, zmax = 0, total = 0;
  for (let i = 0; i < nx * ny; i++) {
    const c = hist[i];
    total += c;
    if (c > 0) { if (c < zmin) zmin = c; if (c > zmax) zmax = c; }
  }
  const scale = zmax > zmin ? levels / (zmax - zmin) : 0;
  for (let j = 0; j < ny; j++) {
    const row = (ny - 1 - j) * nx; // image rows run downwards, data rows upwards
    for (let i = 0; i < nx; i++) {
      const c = hist[j * nx + i];
      if (!(c > 0)) continue; // transparent
      const l = 4 * Math.round((c - zmin) * scale), o = 4 * (row + i);
      px[o] = lut[l]; px[o + 1] = lut[l + 1]; px[o + 2] = lut[l + 2]; px[o + 3] = 255;
    }
  }
  im.cells.getContext('2d')!.putImageData(im.img, 0, 0);
  return { image: im.cells, total };
}

/**
 * Size `canvas` to its box at the device pixel ratio, clear it, and give a context clipped to the plot area of
 * `box` with the maps from axis units to CSS pixels; null if the plot area is empty.
 */
export function plotArea(canvas: HTMLCanvasElement, box: PlotBox): { g: CanvasRenderingContext2D; X: (x: number) => number; Y: (y: number) => number } | null {
  const dpr = window.devicePixelRatio || 1;
  const w = canvas.clientWidth, h = canvas.clientHeight;
  if (canvas.width !== Math.round(w * dpr) || canvas.height !== Math.round(h * dpr)) {
    canvas.width = Math.round(w * dpr);
    canvas.height = Math.round(h * dpr);
  }
  const g = canvas.getContext('2d')!;
  g.restore(); // the previous call's clip (a no-op when there is none)
  g.setTransform(dpr, 0, 0, dpr, 0, 0);
  g.clearRect(0, 0, w, h);
  const { margin: m, xr, yr } = box;
  const W = w - m.l - m.r, H = h - m.t - m.b;
  if (W <= 0 || H <= 0) return null;
  g.save();
  g.beginPath();
  g.rect(m.l, m.t, W, H);
  g.clip();
  g.imageSmoothingEnabled = true;
  return { g, X: (x) => m.l + ((x - xr[0]) / (xr[1] - xr[0])) * W, Y: (y) => m.t + ((yr[1] - y) / (yr[1] - yr[0])) * H };
}

/**
 * Draw counts `hist` (row-major [dE bin][dt bin] over window v) on `canvas` (the size of the plot layer);
 * returns the sum of the counts. `lut` from colourTable.
 */
export function drawDensity(canvas: HTMLCanvasElement, hist: Float32Array, v: ViewWindow, box: PlotBox, lut: Uint8ClampedArray): number {
  const { image, total } = cellImage(canvas, hist, v.nx, v.ny, lut);
  const area = plotArea(canvas, box);
  if (!area) return total;
  const { g, X, Y } = area, k = box.k;
  const x0 = X(v.dtMin * 1e9), x1 = X(v.dtMax * 1e9), y0 = Y(v.dEMax * k), y1 = Y(v.dEMin * k);
  g.drawImage(image, x0, y0, x1 - x0, y1 - y0);
  return total;
}

/** Clear the density layer (when points are shown instead). */
export function clearDensity(canvas: HTMLCanvasElement): void {
  canvas.getContext('2d')?.clearRect(0, 0, canvas.width, canvas.height);
}
