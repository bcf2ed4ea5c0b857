import { fileURLToPath } from 'node:url';
import tailwindcss from '@tailwindcss/vite';
import react from '@vitejs/plugin-react';
import { FontaineTransform } from 'fontaine';
import { defineConfig } from 'vite';

const root = fileURLToPath(new URL('.', import.meta.url));

export default defineConfig({
  root,
  plugins: [
    react(),
    tailwindcss(),
    // Until Inter arrives, text is set in a local font adjusted to Inter's measurements, so lines
    // break alike and little moves when it swaps in.
    FontaineTransform.vite({
      fallbacks: ['Roboto', 'Helvetica Neue', 'Arial', 'Liberation Sans'],
      resolvePath: (id) => new URL(`../../node_modules/${id}`, import.meta.url),
    }),
  ],
  resolve: {
    alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) },
  },
  server: {
    // In development the API runs as its own process; the proxy keeps cookies same-origin.
    proxy: {
      '/api': { target: process.env.UNDERFOOT_API_URL ?? 'http://127.0.0.1:3000' },
    },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    sourcemap: true,
    rolldownOptions: {
      output: {
        // Stable, named vendor chunks: they change less often than our code, so browsers keep them cached.
        codeSplitting: {
          groups: [
            { name: 'vendor-react', test: /node_modules[\\/](react|react-dom|scheduler|react-router|react-router-dom)[\\/]/ },
            { name: 'vendor-query', test: /node_modules[\\/](@tanstack|sonner)[\\/]/ },
            { name: 'vendor-forms', test: /node_modules[\\/](react-hook-form|@hookform)[\\/]/ },
            { name: 'vendor-zod', test: /node_modules[\\/]zod[\\/]/ },
          ],
        },
      },
    },
  },
});
