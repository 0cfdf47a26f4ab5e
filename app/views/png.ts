// PNG export of one plot or of stacked plot layers (drawn in order onto one canvas).
import Plotly from '../plotly.ts';

/** Save the given Plotly divs and canvases, bottom layer first, as one PNG at twice the screen size. */
export async function savePng(layers: (HTMLElement | null)[], filename: string): Promise<void> {
  const els = layers.filter((e): e is HTMLElement => e !== null && ('data' in e || e instanceof HTMLCanvasElement));
  if (!els.length) return;
  if (els.length === 1) {
    const el = els[0];
    await Plotly.downloadImage(el, { format: 'png', filename, width: el.clientWidth * 2, height: el.clientHeight * 2 });
    return;
  }
  const w = els[0].clientWidth * 2, h = els[0].clientHeight * 2;
  const canvas = document.createElement('canvas');
  canvas.width = w;
  canvas.height = h;
  const g = canvas.getContext('2d')!;
  for (const el of els) {
    if (el instanceof HTMLCanvasElement) {
      g.drawImage(el, 0, 0, w, h); // a canvas layer covers the same box as the plot layers
      continue;
    }
    const url = await Plotly.toImage(el, { format: 'png', width: w, height: h });
    const img = new Image();
    img.src = url;
    await img.decode();
    g.drawImage(img, 0, 0);
  }
  const a = document.createElement('a');
  a.href = canvas.toDataURL('image/png');
  a.download = filename + '.png';
  a.click();
}
