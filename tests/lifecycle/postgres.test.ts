// The private PostgreSQL cluster of `npm start` (scripts/lib/postgres.ts) when its port is
// taken: a message naming the port and PG_PORT with the end of PostgreSQL's own log, and
// a free port chosen (and said) when PG_PORT was not set.
import { afterAll, describe, expect, it } from "vitest";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { chooseClusterPort, startCluster } from "../../scripts/lib/postgres";

const cleanups: (() => unknown)[] = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});

/** Something else listening on a loopback port, as another server would. */
async function occupyPort(): Promise<number> {
  const srv = net.createServer();
  await new Promise<void>((resolve) => srv.listen(0, "127.0.0.1", resolve));
  cleanups.push(() => new Promise((r) => srv.close(r)));
  return (srv.address() as net.AddressInfo).port;
}

function tempClusterDir(): string {
  const dir = fs.mkdtempSync(path.join(process.getuid?.() === 0 ? "/var/tmp" : os.tmpdir(), "soundings-busyport-"));
  fs.chmodSync(dir, 0o755);
  cleanups.push(() => fs.rmSync(dir, { recursive: true, force: true }));
  return dir;
}

describe("the private cluster's port", () => {
  it("names the busy port and PG_PORT, and shows the end of the cluster's log, when the port is taken", async () => {
    const port = await occupyPort();
    const dir = tempClusterDir();
    let message = "";
    try {
      startCluster(dir, port);
    } catch (err) {
      message = (err as Error).message;
    }
    expect(message).toContain(`port ${port} on 127.0.0.1 is already in use`);
    expect(message).toContain("PG_PORT=");
    expect(message).toContain(`Last lines of ${path.join(dir, "postgres.log")}:`);
    // PostgreSQL's own words for a taken port (its postmaster's bind error).
    expect(message).toMatch(/could not bind IPv4 address "127\.0\.0\.1": Address already in use/);
  }, 60_000);

  it("takes a free port, and says so, when the default is taken and PG_PORT is not set", async () => {
    const busy = await occupyPort();
    const dir = tempClusterDir();
    const chosen = await chooseClusterPort(dir, undefined, busy);
    expect(chosen.port).not.toBe(busy);
    expect(chosen.note).toContain(`port ${busy} on 127.0.0.1 is in use`);
    expect(chosen.note).toContain(`free port ${chosen.port}`);
    expect(chosen.note).toContain("PG_PORT");
    // An explicit PG_PORT is taken as given (its failure then says what is wrong).
    expect(await chooseClusterPort(dir, busy, busy)).toEqual({ port: busy });
  });
});
