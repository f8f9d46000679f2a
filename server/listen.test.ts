// Where the HTTP server listens: loopback by default, HOST to change it.
import { afterEach, describe, expect, it } from "vitest";
import net from "node:net";
import type { Server } from "node:http";
import express from "express";
import { loadConfig } from "./config";
import { closeServer, listen, localUrl } from "./listen";
import { portInUse } from "../scripts/lib/postgres";

let server: Server | undefined;
afterEach(async () => {
  if (server) await closeServer(server);
  server = undefined;
});

describe("listen", () => {
  it("binds 127.0.0.1 by default, so other addresses of the machine do not answer", async () => {
    const config = loadConfig({ NODE_ENV: "test", PORT: "0" });
    expect(config.host).toBe("127.0.0.1");
    server = await listen(express(), config);
    const { address, port } = server.address() as net.AddressInfo;
    expect(address).toBe("127.0.0.1");
    expect(localUrl(server)).toBe(`http://127.0.0.1:${port}`);
    expect(await portInUse(port, "127.0.0.1")).toBe(true);
    // Linux routes all of 127.0.0.0/8 to the loopback device: a server bound to every
    // address (0.0.0.0) would answer on 127.0.0.2 as well.
    expect(await portInUse(port, "127.0.0.2")).toBe(false);
  });

  it("binds the address HOST names", async () => {
    server = await listen(express(), loadConfig({ NODE_ENV: "test", PORT: "0", HOST: "127.0.0.2" }));
    const { address, port } = server.address() as net.AddressInfo;
    expect(address).toBe("127.0.0.2");
    expect(await portInUse(port, "127.0.0.2")).toBe(true);
    expect(await portInUse(port, "127.0.0.1")).toBe(false);
  });

  it("says which port is taken instead of failing with a bare EADDRINUSE", async () => {
    server = await listen(express(), loadConfig({ NODE_ENV: "test", PORT: "0" }));
    const { port } = server.address() as net.AddressInfo;
    await expect(listen(express(), loadConfig({ NODE_ENV: "test", PORT: String(port) }))).rejects.toThrow(`Port ${port} on 127.0.0.1 is already in use`);
  });
});
