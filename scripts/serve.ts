// Production HTTP server: static assets from the client build, everything else through React
// Router's request handler. Plain node:http keeps the per-request floor low; WEB_CONCURRENCY>1
// runs that many processes with node:cluster (the app is stateless, so they share nothing).
import cluster from "node:cluster";
import { createServer } from "node:http";
import path from "node:path";
import { pathToFileURL } from "node:url";
import compression from "compression";
import { createRequestListener } from "@mjackson/node-fetch-server";
import pLimit from "p-limit";
import { createRequestHandler, RouterContextProvider, type ServerBuild } from "react-router";
import { CLIENT_ADDRESS_HEADER, clientAddressContext, REQUEST_KIND_HEADER } from "../app/context";
import sirv from "sirv";

const buildDir = path.resolve(process.env.BUILD_DIR ?? "build");
const host = process.env.HOST ?? "127.0.0.1";
const port = Number(process.env.PORT ?? 3000);
const workers = Number(process.env.WEB_CONCURRENCY ?? 1);
/** 6 photos × 20 MB plus form fields. */
const MAX_BODY_BYTES = 125 * 1024 * 1024;

if (cluster.isPrimary && workers > 1) {
  for (let i = 0; i < workers; i++) cluster.fork();
  cluster.on("exit", (worker, code) => {
    console.error(`[serve] worker ${worker.process.pid} exited (${code}); starting another`);
    cluster.fork();
  });
} else {
  const build: ServerBuild = await import(pathToFileURL(path.join(buildDir, "server/index.js")).href);
  const handleRequest = createRequestHandler(build, "production");
  // Fair admission: at most MAX_IN_FLIGHT requests are inside the app at once, the rest wait in
  // arrival order. Without it, node:http under overload serves some connections again and again
  // while others wait for seconds (wrk at 200 connections saw 10 s timeouts even on a bare
  // handler); it also keeps concurrent database work below the pool's size. A slot is held
  // until the response is ready, not while it is written or while a body arrives: small bodies
  // are read before admission, large ones (photo uploads) bypass the queue.
  const admit = pLimit(Number(process.env.MAX_IN_FLIGHT ?? 8));
  const SMALL_BODY_BYTES = 64 * 1024;
  const handler = createRequestListener(async (request, client) => {
    const context = new RouterContextProvider();
    context.set(clientAddressContext, client.address);
    if (request.body) {
      const length = Number(request.headers.get("content-length") ?? Number.NaN);
      if (!(length <= SMALL_BODY_BYTES)) return handleRequest(request, context);
      const body = await request.arrayBuffer();
      request = new Request(request.url, { method: request.method, headers: request.headers, body, signal: request.signal });
    }
    // Each admitted request first lets the event loop poll for I/O once: without that yield the
    // queue drains in one burst of promise callbacks and the unfairness comes back.
    return admit(async () => {
      await new Promise((resolve) => setImmediate(resolve));
      return handleRequest(request, context);
    });
  });
  // Fingerprinted assets never change: cache for a year. Other public files: an hour.
  const assets = sirv(path.join(buildDir, "client"), {
    etag: true,
    gzip: false,
    setHeaders(res, pathname) {
      res.setHeader("X-Content-Type-Options", "nosniff");
      res.setHeader("Cache-Control", pathname.startsWith("/assets/") ? "public, max-age=31536000, immutable" : "public, max-age=3600");
    },
  });
  const compress = compression();

  const server = createServer((req, res) => {
    // The socket's address, for per-address limits. Set here, overwriting anything the client
    // sent under that name, so the app can trust it (the router context can also carry it, but
    // its key object is not shared when this file and the build load separate router copies).
    // React Router's Request is built from rawHeaders, so that is where it must go.
    // The same for the request's kind (see app/context.ts): only this server can tell a page
    // from React Router's data request for it.
    const raw: string[] = [];
    for (let i = 0; i < req.rawHeaders.length; i += 2) {
      const name = req.rawHeaders[i].toLowerCase();
      if (name !== CLIENT_ADDRESS_HEADER && name !== REQUEST_KIND_HEADER) raw.push(req.rawHeaders[i], req.rawHeaders[i + 1]);
    }
    const kind = (req.method === "GET" || req.method === "HEAD") && !/\.data(?:\?|$)/.test(req.url ?? "") ? "document" : "other";
    raw.push(CLIENT_ADDRESS_HEADER, req.socket.remoteAddress ?? "", REQUEST_KIND_HEADER, kind);
    req.rawHeaders.splice(0, req.rawHeaders.length, ...raw);
    req.headers[CLIENT_ADDRESS_HEADER] = req.socket.remoteAddress ?? "";
    req.headers[REQUEST_KIND_HEADER] = kind;
    if (Number(req.headers["content-length"] ?? 0) > MAX_BODY_BYTES) {
      res.writeHead(413, { "Content-Type": "application/json" }).end(JSON.stringify({ error: "Request too large." }));
      return;
    }
    compress(req as never, res as never, () => {
      assets(req, res, () => void handler(req, res));
    });
  });
  server.keepAliveTimeout = 65_000;
  server.listen(port, host, () => {
    if (!cluster.isWorker || cluster.worker?.id === 1) console.log(`[serve] Tidewire on http://${host}:${port} (${workers} process${workers > 1 ? "es" : ""})`);
  });
  const stop = () => server.close(() => process.exit(0));
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
}
