/**
 * Builds the browser view into dist-view/ (relative paths, so it can be served from any folder)
 * and carries the demo meshes along as dist-view/demo/*. Also the vitest configuration.
 */
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { Plugin } from 'vite';
import { defineConfig } from 'vitest/config';

const DEMO_MESHES = ['harbour.vtu', 'channel.vtu'];
const meshesDir = fileURLToPath(new URL('./meshes/', import.meta.url));

function demoMeshes(): Plugin {
  return {
    name: 'steplens-demo-meshes',
    configureServer(server) {
      server.middlewares.use((req, res, next) => {
        const m = /^\/demo\/([a-z]+\.vtu)$/.exec((req.url ?? '').split('?')[0] ?? '');
        if (!m || !DEMO_MESHES.includes(m[1]!) || !existsSync(meshesDir + m[1])) { next(); return; }
        res.setHeader('Content-Type', 'application/octet-stream');
        res.end(readFileSync(meshesDir + m[1]));
      });
    },
    generateBundle() {
      for (const name of DEMO_MESHES) {
        const file = meshesDir + name;
        if (existsSync(file)) this.emitFile({ type: 'asset', fileName: `demo/${name}`, source: readFileSync(file) });
        else this.warn(`demo mesh meshes/${name} is missing (run npm run demo-meshes)`);
      }
    },
  };
}

export default defineConfig({
  base: './',
  plugins: [demoMeshes()],
  worker: { format: 'es' },
  build: {
    outDir: 'dist-view',
    emptyOutDir: true,
    chunkSizeWarningLimit: 1200,
    target: 'es2022',
  },
  test: {
    include: ['test/**/*.test.ts'],
    testTimeout: 60000,
    hookTimeout: 120000,
    pool: 'forks',
  },
});
