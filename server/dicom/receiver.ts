// The DICOM receiver: a C-ECHO and C-STORE service (dcmjs-dimse) on its own port, bound to
// the configured host (127.0.0.1 by default; dcmjs-dimse's own listen would bind every
// interface, so the socket server is made here). The called AE title names the program; an
// unknown one is rejected at association ("called AE title not recognized"). Ultrasound
// images, ultrasound multi-frame images and secondary captures are accepted in the transfer
// syntaxes the decoder handles, one per presentation context. A received object is checked and
// de-identified (server/media/dicom) before it is stored in the program's inbox, grouped by
// study; an object Soundings cannot take is answered with a failure status and nothing kept.
import crypto from "node:crypto";
import fsp from "node:fs/promises";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import dimse from "dcmjs-dimse";
import type { association, requests, responses } from "dcmjs-dimse";
import type { Db } from "../db/knex";
import type { Storage } from "../storage/types";
import { MediaError } from "../media/exec";
import { IMAGE_SOP_CLASSES, SUPPORTED_TRANSFER_SYNTAXES, readDicom } from "../media/dicom/read";
import { receiveIntoInbox } from "../services/dicom-inbox";

const { Scp } = dimse;
// dcmjs-dimse logs every PDU at info; associations refused and objects not taken are logged here.
dimse.log.setLevel("warn");
const { CEchoResponse, CStoreResponse } = dimse.responses;
const { Status, PresentationContextResult, RejectResult, RejectSource, RejectReason, SopClass } = dimse.constants;

/** Explicit VR Little Endian first when a machine offers several for one context. */
const PREFERRED = ["1.2.840.10008.1.2.1", ...Object.keys(SUPPORTED_TRANSFER_SYNTAXES).filter((t) => t !== "1.2.840.10008.1.2.1")];

export interface DicomReceiver {
  port: number;
  close(): Promise<void>;
}

export async function startDicomReceiver(
  deps: { db: Db; storage: Storage; log: (e: unknown) => void },
  opts: { host: string; port: number },
): Promise<DicomReceiver> {
  const { db, log } = deps;

  class ProgramScp extends Scp {
    programId: string | null = null;
    callingAe = "";

    override associationRequested(association: association.Association) {
      const called = association.getCalledAeTitle().trim();
      this.callingAe = association.getCallingAeTitle().trim();
      void db("programs")
        .where("dicom_ae_title", called)
        .first("id")
        .then((program) => {
          if (!program) {
            log(`DICOM association from ${this.callingAe} refused: unknown called AE title ${called}`);
            this.sendAssociationReject(RejectResult.Permanent, RejectSource.ServiceUser, RejectReason.CalledAeNotRecognized);
            return;
          }
          this.programId = program.id;
          for (const c of association.getPresentationContexts()) {
            const context = association.getPresentationContext(c.id);
            const abstract = context.getAbstractSyntaxUid();
            if (abstract !== SopClass.Verification && !IMAGE_SOP_CLASSES[abstract]) {
              context.setResult(PresentationContextResult.RejectAbstractSyntaxNotSupported);
              continue;
            }
            const offered = context.getTransferSyntaxUids();
            const chosen = PREFERRED.find((t) => offered.includes(t)) ?? (abstract === SopClass.Verification ? offered[0] : undefined);
            if (chosen) context.setResult(PresentationContextResult.Accept, chosen);
            else context.setResult(PresentationContextResult.RejectTransferSyntaxesNotSupported);
          }
          this.sendAssociationAccept();
        })
        .catch((err) => {
          log(err);
          this.sendAssociationReject(RejectResult.Transient, RejectSource.ServiceProviderPresentation, RejectReason.NoReasonGiven);
        });
    }

    override associationReleaseRequested() {
      this.sendAssociationReleaseResponse();
    }

    override cEchoRequest(request: requests.CEchoRequest, callback: (r: responses.CEchoResponse) => void) {
      const response = CEchoResponse.fromRequest(request);
      response.setStatus(Status.Success);
      callback(response);
    }

    override cStoreRequest(request: requests.CStoreRequest, callback: (r: responses.CStoreResponse) => void) {
      const response = CStoreResponse.fromRequest(request);
      const dataset = request.getDataset();
      void (async () => {
        const dir = await fsp.mkdtemp(path.join(os.tmpdir(), "soundings-dicom-in-"));
        try {
          if (!dataset || !this.programId) throw new MediaError("No data set was sent");
          const file = path.join(dir, "object.dcm");
          await new Promise<void>((resolve, reject) => dataset.toFile(file, (err?: Error) => (err ? reject(err) : resolve())));
          const bytes = await fsp.readFile(file);
          const read = readDicom(bytes); // refuses what Soundings cannot take, before anything is kept
          await receiveIntoInbox(deps, { programId: this.programId, callingAe: this.callingAe, bytes, read });
          response.setStatus(Status.Success);
        } catch (err) {
          log(err instanceof MediaError ? `DICOM object from ${this.callingAe} refused: ${err.message}` : err);
          // 0xA900: data set does not match SOP class (PS3.4 GG.4); 0x0110 processing failure otherwise.
          response.setStatus(err instanceof MediaError ? Status.DataSetSopClassMismatch : Status.ProcessingFailure);
          if (err instanceof MediaError) response.setErrorComment(err.message.slice(0, 64));
        } finally {
          await fsp.rm(dir, { recursive: true, force: true });
          callback(response);
        }
      })();
    }
  }

  const sockets = new Set<net.Socket>();
  const server = net.createServer((socket) => {
    sockets.add(socket);
    socket.on("close", () => sockets.delete(socket));
    new ProgramScp(socket, { associationTimeout: 30_000, pduTimeout: 30_000 });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, opts.host, () => resolve());
  });
  const port = (server.address() as net.AddressInfo).port;
  return {
    port,
    close: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  };
}

/** A keyed hash of an original UID: groups a study's objects without keeping the UID. */
export const studyHash = (secret: string, uid: string) => crypto.createHmac("sha256", secret).update(uid).digest("hex");
