import { createServer } from "node:net";

/**
 * A TCP port free on 127.0.0.1 right now (the OS picks it). For servers we start ourselves we
 * pass port 0 instead; this is for programs that need a number up front (mariadbd, the app).
 */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const addr = srv.address();
      srv.close(() => (addr && typeof addr === "object" ? resolve(addr.port) : reject(new Error("no port"))));
    });
  });
}
