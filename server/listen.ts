// Puts the app on the network: binds config.host (loopback by default) and config.port,
// resolves once listening, and gives the address in words for the start-up message.
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { Express } from "express";
import type { Config } from "./config";

/** Listens on config.host:config.port; rejects with a plain message when the port is taken. */
export function listen(app: Express, config: Pick<Config, "host" | "port">): Promise<Server> {
  return new Promise((resolve, reject) => {
    const server = app.listen(config.port, config.host);
    server.once("listening", () => resolve(server));
    server.once("error", (err: NodeJS.ErrnoException) => {
      if (err.code === "EADDRINUSE")
        reject(new Error(`Port ${config.port} on ${config.host} is already in use: stop that program or choose another port with PORT=<port>`));
      else if (err.code === "EADDRNOTAVAIL") reject(new Error(`HOST=${config.host} is not an address of this machine`));
      else reject(err);
    });
  });
}

/** The URL to open in a browser for a listening server (loopback when it binds every address). */
export function localUrl(server: Server): string {
  const { address, port } = server.address() as AddressInfo;
  const host = address === "0.0.0.0" || address === "::" ? "127.0.0.1" : address.includes(":") ? `[${address}]` : address;
  return `http://${host}:${port}`;
}

/** Closes the server: idle keep-alive connections at once, busy ones after `graceMs`. */
export function closeServer(server: Server, graceMs = 3000): Promise<void> {
  return new Promise((resolve) => {
    const timer = setTimeout(() => server.closeAllConnections(), graceMs);
    timer.unref();
    server.close(() => {
      clearTimeout(timer);
      resolve();
    });
    server.closeIdleConnections();
  });
}
