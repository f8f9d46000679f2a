// The local fake mail server (maildev, run as a child process because it installs its own
// signal handlers): catches every e-mail Soundings sends, on loopback, with a web inbox
// for developers and a REST API (GET /email) that tests read.
import { spawn } from "node:child_process";
import { createRequire } from "node:module";
import path from "node:path";
import { portInUse } from "./postgres";

export interface FakeMail {
  smtpPort: number;
  webPort: number;
  webUrl: string;
  /** Every message received so far, as maildev's JSON. */
  messages: () => Promise<MailDevMessage[]>;
  close: () => Promise<void>;
}

export interface MailDevMessage {
  id: string;
  subject: string;
  text: string;
  html?: string;
  to: { address: string; name?: string }[];
  date: string;
}

const require = createRequire(import.meta.url);

/** Starts maildev on 127.0.0.1 and resolves once its SMTP and web ports answer. */
export async function startFakeMail(smtpPort: number, webPort: number): Promise<FakeMail> {
  const bin = path.join(path.dirname(require.resolve("maildev/package.json")), "bin", "maildev");
  const child = spawn(process.execPath, [bin, "--smtp", String(smtpPort), "--web", String(webPort), "--ip", "127.0.0.1", "--silent"], {
    stdio: ["ignore", "ignore", "pipe"],
  });
  let stderr = "";
  child.stderr.on("data", (d) => (stderr += d));
  const exited = new Promise<void>((r) => child.once("exit", () => r()));
  for (let i = 0; i < 100; i++) {
    if (child.exitCode !== null) throw new Error(`maildev exited: ${stderr}`);
    if ((await portInUse(smtpPort)) && (await portInUse(webPort))) break;
    await new Promise((r) => setTimeout(r, 100));
  }
  const webUrl = `http://127.0.0.1:${webPort}`;
  return {
    smtpPort,
    webPort,
    webUrl,
    messages: async () => (await (await fetch(`${webUrl}/email`)).json()) as MailDevMessage[],
    close: async () => {
      if (child.exitCode === null) child.kill("SIGTERM");
      await exited;
    },
  };
}
