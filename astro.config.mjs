import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'astro/config';

/**
 * In `npm run dev` the websocket endpoints (/ws/...) and the background
 * services (migrations, mail sink, exercise hub) run inside the dev server;
 * in production server/index.ts does the same around the built handler.
 */
function liveServices() {
  let command = 'build';
  return {
    name: 'rungwise-live-services',
    hooks: {
      'astro:config:setup': (options) => {
        command = options.command;
      },
      'astro:server:setup': async ({ server }) => {
        // Astro also makes short-lived Vite servers while building: serve only in `astro dev`.
        if (command !== 'dev') return;
        server.middlewares.use((req, _res, next) => {
          req.headers['x-rungwise-client-ip'] = req.socket.remoteAddress ?? '';
          next();
        });
        const { startServices } = await server.ssrLoadModule('/server/services.ts');
        const { attachSockets } = await server.ssrLoadModule('/server/sockets.ts');
        await startServices();
        if (server.httpServer) attachSockets(server.httpServer);
      },
    },
  };
}

export default defineConfig({
  output: 'server',
  outDir: process.env.RUNGWISE_DIST ?? './dist',
  adapter: node({ mode: 'middleware' }),
  integrations: [react(), liveServices()],
  server: { port: Number(process.env.PORT ?? 4321), host: process.env.HOST ?? 'localhost' },
  // Astro builds each request's URL from the Host header only for allowed domains (else it
  // uses "localhost", and its origin check then refuses form posts behind any real host name).
  // E-mailed links use PUBLIC_URL, never the request's host, so every host may be allowed.
  security: { checkOrigin: true, allowedDomains: [{}] },
  devToolbar: { enabled: false },
  vite: {
    plugins: [tailwindcss()],
    ssr: { external: ['better-sqlite3'] },
  },
});
