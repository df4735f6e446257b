import { defineConfig } from 'vite';
import { resolve } from 'node:path';

// One config, two builds:
//   `vite build --mode cli`  bundles the command-line tool for Node into dist/cli/lacuna.js
//   `vite build`             builds the web app (root src/view) into dist/app
// Vitest reads the `test` block below.
export default defineConfig(({ mode }) => {
  const root = import.meta.dirname;
  if (mode === 'cli') {
    return {
      root,
      publicDir: false,
      logLevel: 'warn',
      build: {
        ssr: resolve(root, 'src/cli/main.ts'),
        outDir: resolve(root, 'dist/cli'),
        emptyOutDir: true,
        target: 'node20',
        sourcemap: false,
        minify: false,
        rollupOptions: { output: { entryFileNames: 'lacuna.js', format: 'es' } },
      },
    };
  }
  return {
    root: resolve(root, 'src/view'),
    publicDir: resolve(root, 'public'),
    base: './',
    build: {
      outDir: resolve(root, 'dist/app'),
      emptyOutDir: true,
      target: 'es2022',
      sourcemap: false,
    },
    worker: { format: 'es' },
    test: {
      root,
      include: ['tests/**/*.test.ts'],
      testTimeout: 60_000,
      hookTimeout: 120_000,
      pool: 'forks',
    },
  };
});
