// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import auth from 'auth-astro';

// Host names the server accepts in the Host header. Astro fixes this list at build time;
// without it Auth.js builds wrong callback URLs and rejects sign-in POSTs (see STACK.md).
// A clinic server adds its own name with CRESTLINE_HOSTS=reports.example.clinic at build.
const hosts = ['localhost', '127.0.0.1', ...(process.env.CRESTLINE_HOSTS ?? '').split(',')]
  .map((h) => h.trim())
  .filter(Boolean);

export default defineConfig({
  output: 'server',
  // Middleware mode: scripts/serve.mjs is the HTTP server (static files from a list, the rest to Astro).
  adapter: node({ mode: 'middleware' }),
  integrations: [react(), auth()],
  security: {
    checkOrigin: true,
    allowedDomains: hosts.map((hostname) => ({ hostname })),
  },
  server: { host: '127.0.0.1' },
  devToolbar: { enabled: false },
  vite: {
    plugins: [tailwindcss()],
    // Sequelize loads its dialect driver with a dynamic require; keep the database
    // stack outside the bundle so Node resolves it from node_modules at run time.
    ssr: { external: ['sequelize', 'mariadb', '@node-rs/argon2', 'pino'] },
  },
});
