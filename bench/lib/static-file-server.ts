// The range benchmark's baseline: a plain, well-known static file server (Express's serve-static,
// which handles Range, ETag and Last-Modified through `send`), in a process of its own like the
// app, serving one directory on 127.0.0.1.
//   node --import tsx bench/lib/static-file-server.ts <directory> <port>
import express from 'express';

const [directory, portText] = process.argv.slice(2);
const port = Number(portText);
if (!directory || !Number.isInteger(port) || port < 1 || port > 65535) {
  console.error('usage: static-file-server.ts <directory> <port>');
  process.exit(2);
}

const app = express();
app.disable('x-powered-by');
app.use(express.static(directory, { index: false, dotfiles: 'deny' }));
const server = app.listen(port, '127.0.0.1', () => console.log(`serving ${directory} on http://127.0.0.1:${port}`));
server.on('error', (error) => {
  console.error(`static file server: ${error.message}`);
  process.exit(1);
});
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    server.close(() => process.exit(0));
    server.closeAllConnections();
  });
}
