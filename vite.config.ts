import { defineConfig } from 'vitest/config'; // vitest's defineConfig knows the `test` key
import react from '@vitejs/plugin-react';

export default defineConfig({
  base: './', // the built folder works from any sub-path
  plugins: [react()],
  worker: { format: 'es' },
  define: { global: 'globalThis' }, // plotly's dependencies expect `global`
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
