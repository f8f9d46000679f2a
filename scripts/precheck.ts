// `npm run precheck -- <file>...`: one line of JSON per file with the image pre-check metrics and
// hints (README "Other commands"); DICOM files are decoded first and their calibrated depth is
// given in cm, compared with an application's typical depth with `--application <code>`; an unreadable file gives a line with "error" and the
// process exits 1 after all files are done.
import { precheckFile } from "../server/media/precheck";
import { DEFAULT_CATALOGUE, TRANSDUCERS, type Transducer } from "../shared/catalogue";

const args = process.argv.slice(2);
let transducer: Transducer | undefined;
let typicalDepthCm: [number, number] | undefined;
const files: string[] = [];
for (let i = 0; i < args.length; i++) {
  const a = args[i];
  if (a === "--transducer") {
    const t = args[++i] as Transducer;
    if (!TRANSDUCERS.includes(t)) {
      console.error(`--transducer must be one of ${TRANSDUCERS.join(", ")}`);
      process.exit(2);
    }
    transducer = t;
  } else if (a === "--application") {
    // The starting catalogue's typical depth (a program's own edits live in its database).
    const code = args[++i];
    const app = DEFAULT_CATALOGUE.find((c) => c.code === code);
    if (!app) {
      console.error(`--application must be one of ${DEFAULT_CATALOGUE.map((c) => c.code).join(", ")}`);
      process.exit(2);
    }
    typicalDepthCm = app.typicalDepthCm;
  } else files.push(a);
}
if (files.length === 0) {
  console.error("usage: npm run precheck -- [--transducer linear|curvilinear|phased|endocavitary] [--application <code>] <file>...");
  process.exit(2);
}

let failed = false;
for (const file of files) {
  try {
    const r = await precheckFile(file, { ...(transducer ? { transducer } : {}), typicalDepthCm });
    console.log(JSON.stringify({ file, ...r }));
  } catch (err) {
    failed = true;
    const e = err as NodeJS.ErrnoException;
    const message = e.code === "ENOENT" ? "no such file" : e.message;
    console.log(JSON.stringify({ file, error: message }));
  }
}
process.exitCode = failed ? 1 : 0;
