// The one naming scheme of stored media. Keys are generated here from ids, never from what a
// user sent: a clip's original upload, and the outputs of each processing version (a newer
// version never overwrites an older one's files, so a player mid-stream keeps its bytes).
export type ProcessedName = "video.mp4" | "poster.jpg" | "strip.jpg" | "thumb.jpg" | "image.png" | "image.jpg" | "object.dcm";

/** Where an upload is kept as it arrived, until it is processed (and, by default, the exam is submitted). */
export const originalKey = (programId: string, clipId: string) => `programs/${programId}/clips/${clipId}/original`;

/** Where one output of processing version `version` of a clip is stored. */
export const processedKey = (programId: string, clipId: string, version: number, name: ProcessedName) =>
  `programs/${programId}/clips/${clipId}/v${version}/${name}`;

/** The media type a processed output is served with, from its key's name. */
export const mediaTypeOfKey = (key: string) => (key.endsWith(".mp4") ? "video/mp4" : key.endsWith(".png") ? "image/png" : "image/jpeg");

/** Every media type mediaTypeOfKey gives, for the route's declared answer. */
export const SERVED_MEDIA_TYPES = "video/mp4, image/jpeg, image/png";
