import { fileURLToPath } from 'node:url';
import vue from '@vitejs/plugin-vue';
import { defineConfig, loadEnv } from 'vite';

const repoRoot = fileURLToPath(new URL('..', import.meta.url));

export default defineConfig(({ mode }) => {
  // The repository's .env (and the process environment) hold the ports; nothing is exposed to the client.
  const env = loadEnv(mode, repoRoot, '');
  const apiTarget = `http://127.0.0.1:${env.API_PORT ?? '4101'}`;
  const proxy = Object.fromEntries(['/api', '/healthz', '/readyz'].map((p) => [p, { target: apiTarget, changeOrigin: false }]));

  return {
    root: fileURLToPath(new URL('.', import.meta.url)),
    plugins: [vue()],
    server: { host: '127.0.0.1', port: Number(env.APP_PORT ?? 4100), strictPort: true, proxy },
    preview: { host: '127.0.0.1', proxy },
    build: {
      outDir: 'dist',
      emptyOutDir: true,
      // The server's CSP is `default-src 'self'`: data: URLs for fonts or images would be blocked.
      assetsInlineLimit: 0,
      sourcemap: true,
    },
  };
});
