import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';

const r = (p: string) => fileURLToPath(new URL(p, import.meta.url));

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: {
    alias: { '@': r('./src'), '@shared': r('./shared') },
  },
  server: {
    host: '127.0.0.1',
    port: Number(process.env.SOWRIGHT_VITE_PORT ?? 5173),
    proxy: {
      '/api': `http://127.0.0.1:${process.env.SOWRIGHT_PORT ?? 4280}`,
    },
  },
  build: {
    outDir: 'dist',
    sourcemap: false,
    chunkSizeWarningLimit: 900,
  },
});
