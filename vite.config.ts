import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig, type Plugin } from 'vitest/config'; // vitest's defineConfig knows the `test` key
import react from '@vitejs/plugin-react';

// After the build, list every file of the output folder (relative paths) with a content hash as the version,
// for the hand-written service worker (public/sw.js) to cache on first visit.
function precacheManifest(): Plugin {
  let outDir = 'dist';
  return {
    name: 'phasewell-precache-manifest',
    apply: 'build',
    configResolved(c) {
      outDir = c.build.outDir;
    },
    closeBundle() {
      const files: string[] = [];
      const walk = (d: string) => {
        for (const name of readdirSync(d)) {
          const p = join(d, name);
          if (statSync(p).isDirectory()) walk(p);
          else files.push(relative(outDir, p).split('\\').join('/'));
        }
      };
      walk(outDir);
      const list = files.filter((f) => f !== 'sw.js' && f !== 'precache-manifest.json').sort();
      const hash = createHash('sha256');
      for (const f of list) hash.update(f).update(readFileSync(join(outDir, f)));
      const manifest = { version: hash.digest('hex').slice(0, 16), files: list };
      writeFileSync(join(outDir, 'precache-manifest.json'), JSON.stringify(manifest, null, 1));
    },
  };
}

export default defineConfig({
  base: './', // the built folder works from any sub-path
  plugins: [react(), precacheManifest()],
  worker: { format: 'es' },
  define: { global: 'globalThis' }, // plotly's dependencies expect `global`
  resolve: {
    // The Plotly core imports a map stylesheet (83 kB) that no plot here uses.
    alias: [{ find: /^maplibre-gl\/dist\/maplibre-gl\.css$/, replacement: fileURLToPath(new URL('./app/empty.css', import.meta.url)) }],
  },
  build: {
    target: 'es2022',
    chunkSizeWarningLimit: 2000,
    rolldownOptions: {
      onwarn(w, warn) {
        if (w.code !== 'MODULE_LEVEL_DIRECTIVE') warn(w);
      },
    },
  },
  test: { environment: 'node', include: ['test/**/*.test.ts'], testTimeout: 60000 },
});
