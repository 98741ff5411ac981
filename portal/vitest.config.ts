import { fileURLToPath } from 'node:url';
import vue from '@vitejs/plugin-vue';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  plugins: [vue()],
  test: {
    name: 'portal',
    root: fileURLToPath(new URL('.', import.meta.url)),
    environment: 'happy-dom',
    include: ['src/**/*.test.ts'],
  },
});
