import { parseRunSpec } from '../spec';
import { HISTORY_CAPACITY, HISTORY_FIELDS } from './flow-history';
import { ProfileTarget } from './profile-target';
import { restoreFlowRun, SCALAR_COUNT_V2, SCALAR_NAMES, type FlowRun, type FlowScalars } from './flow-run';

/**
 * Versioned binary checkpoint of a run (docs/checkpoint-format.md has the byte
 * layout for readers in other languages). Little-endian throughout:
 *
 *   header (32 bytes): magic "KILNCKPT", u32 version, u32 header length (32),
 *                      u32 spec length L, u32 scalar count S, u32 array count A, u32 0
 *   spec:   L bytes of UTF-8 JSON (the normalized run spec), zero-padded to a multiple of 8
 *   scalars: S float64 in the order of SCALAR_NAMES
 *   arrays: A × { u32 element count, u32 array id, count float64 }   (ids: 0 r, 1 h, 2 history;
 *           version 2 adds 3 target h, 4 target f, 5 target z: the knots of an uploaded
 *           `profile` target, so the checkpoint resumes without the upload)
 *   version 3: 31 scalars (adds the normalized flow's re-centring record and σ at t = 0;
 *           versions 1 and 2 have 26 and are read with the defaults s = 1, the rest 0)
 *   trailer (8 bytes): u32 byte length of everything before the trailer, u32 CRC-32 of it
 *
 * Undrained diagnostic samples are not part of it: drain them before saving.
 */
export const CHECKPOINT_MAGIC = 'KILNCKPT';
export const CHECKPOINT_VERSION = 3;
/** Versions this engine reads: 1 (no target knots), 2 and 3 (normalized-flow scalars). */
export const CHECKPOINT_READABLE_VERSIONS: readonly number[] = [1, 2, 3];
export const CHECKPOINT_HEADER_BYTES = 32;
export const CHECKPOINT_ARRAY_IDS = { r: 0, h: 1, history: 2, targetH: 3, targetF: 4, targetZ: 5 } as const;

/** Error for a checkpoint that cannot be read; the message says why. */
export class CheckpointError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'CheckpointError';
  }
}

let crcTable: Uint32Array | null = null;

/** CRC-32 (IEEE 802.3, reflected, polynomial 0xEDB88320), as zlib.crc32 computes it. */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  if (crcTable === null) {
    crcTable = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c >>> 0;
    }
  }
  let crc = 0xffffffff;
  for (let i = start; i < end; i++) crc = crcTable[(crc ^ bytes[i]!) & 0xff]! ^ (crc >>> 8);
  return (crc ^ 0xffffffff) >>> 0;
}

/** Serializes the full state of a run (spec, stepper, controller, refinement, history). */
export function serializeCheckpoint(run: FlowRun): Uint8Array {
  const specBytes = new TextEncoder().encode(JSON.stringify(run.spec));
  const specPadded = Math.ceil(specBytes.length / 8) * 8;
  const arrays: [number, Float64Array][] = [
    [CHECKPOINT_ARRAY_IDS.r, run.r],
    [CHECKPOINT_ARRAY_IDS.h, run.h],
    [CHECKPOINT_ARRAY_IDS.history, run.history],
  ];
  const target = run.model.target;
  if (target instanceof ProfileTarget) {
    arrays.push(
      [CHECKPOINT_ARRAY_IDS.targetH, target.knotsH],
      [CHECKPOINT_ARRAY_IDS.targetF, target.knotsF],
      [CHECKPOINT_ARRAY_IDS.targetZ, target.knotsZ],
    );
  }
  let size = CHECKPOINT_HEADER_BYTES + specPadded + 8 * SCALAR_NAMES.length;
  for (const [, a] of arrays) size += 8 + 8 * a.length;
  const body = size;
  size += 8;
  const bytes = new Uint8Array(size);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < 8; i++) bytes[i] = CHECKPOINT_MAGIC.charCodeAt(i);
  view.setUint32(8, CHECKPOINT_VERSION, true);
  view.setUint32(12, CHECKPOINT_HEADER_BYTES, true);
  view.setUint32(16, specBytes.length, true);
  view.setUint32(20, SCALAR_NAMES.length, true);
  view.setUint32(24, arrays.length, true);
  view.setUint32(28, 0, true);
  bytes.set(specBytes, CHECKPOINT_HEADER_BYTES);
  let o = CHECKPOINT_HEADER_BYTES + specPadded;
  for (const name of SCALAR_NAMES) {
    view.setFloat64(o, run.s[name], true);
    o += 8;
  }
  for (const [id, a] of arrays) {
    view.setUint32(o, a.length, true);
    view.setUint32(o + 4, id, true);
    o += 8;
    for (let i = 0; i < a.length; i++) {
      view.setFloat64(o, a[i]!, true);
      o += 8;
    }
  }
  view.setUint32(body, body, true);
  view.setUint32(body + 4, crc32(bytes, 0, body), true);
  return bytes;
}

/**
 * Reads a checkpoint back into a run that continues bit for bit. Refuses (throws
 * {@link CheckpointError}) wrong magic, unknown versions, truncated buffers and
 * checksum mismatches.
 */
export function deserializeCheckpoint(input: Uint8Array): FlowRun {
  const bytes = input;
  if (!(bytes instanceof Uint8Array)) throw new CheckpointError('checkpoint must be a Uint8Array');
  if (bytes.length < CHECKPOINT_HEADER_BYTES + 8) {
    throw new CheckpointError(`checkpoint truncated: ${bytes.length} bytes is shorter than header and trailer`);
  }
  for (let i = 0; i < 8; i++) {
    if (bytes[i] !== CHECKPOINT_MAGIC.charCodeAt(i)) {
      throw new CheckpointError('not a Kiln flow checkpoint (magic bytes "KILNCKPT" missing)');
    }
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = view.getUint32(8, true);
  if (!CHECKPOINT_READABLE_VERSIONS.includes(version)) {
    throw new CheckpointError(
      `unsupported checkpoint version ${version} (this engine reads versions ${CHECKPOINT_READABLE_VERSIONS.join(', ')})`,
    );
  }
  const body = bytes.length - 8;
  const declared = view.getUint32(body, true);
  if (declared !== body) {
    throw new CheckpointError(
      `checkpoint truncated or padded: trailer says ${declared} bytes of content, buffer has ${body}`,
    );
  }
  const stored = view.getUint32(body + 4, true);
  const actual = crc32(bytes, 0, body);
  if (stored !== actual) {
    throw new CheckpointError(
      `checkpoint corrupted: CRC-32 is ${actual.toString(16).padStart(8, '0')}, stored ${stored.toString(16).padStart(8, '0')}`,
    );
  }
  const headerBytes = view.getUint32(12, true);
  const specLength = view.getUint32(16, true);
  const scalarCount = view.getUint32(20, true);
  const arrayCount = view.getUint32(24, true);
  const arrayCountOk = arrayCount === 3 || (version >= 2 && arrayCount === 6);
  const expectedScalars = version >= 3 ? SCALAR_NAMES.length : SCALAR_COUNT_V2;
  if (headerBytes !== CHECKPOINT_HEADER_BYTES || scalarCount !== expectedScalars || !arrayCountOk) {
    throw new CheckpointError(`checkpoint header does not match format version ${version}`);
  }
  let o = headerBytes;
  const need = (n: number) => {
    if (o + n > body) throw new CheckpointError('checkpoint truncated inside its content');
  };
  need(specLength);
  let specJson: unknown;
  try {
    specJson = JSON.parse(new TextDecoder().decode(bytes.subarray(o, o + specLength)));
  } catch {
    throw new CheckpointError('checkpoint spec is not valid JSON');
  }
  let spec;
  try {
    spec = parseRunSpec(specJson);
  } catch (e) {
    throw new CheckpointError(`checkpoint spec is not a valid run spec: ${(e as Error).message}`);
  }
  o += Math.ceil(specLength / 8) * 8;
  need(8 * scalarCount);
  const scalars = {} as FlowScalars;
  for (const name of SCALAR_NAMES) scalars[name] = 0;
  scalars.recentreS = 1;
  for (const name of SCALAR_NAMES.slice(0, scalarCount)) {
    scalars[name] = view.getFloat64(o, true);
    o += 8;
  }
  const arrays: (Float64Array | undefined)[] = [];
  for (let k = 0; k < arrayCount; k++) {
    need(8);
    const length = view.getUint32(o, true);
    const id = view.getUint32(o + 4, true);
    if (id >= arrayCount || arrays[id] !== undefined) throw new CheckpointError(`checkpoint has an unexpected array id ${id}`);
    o += 8;
    need(8 * length);
    const a = new Float64Array(length);
    for (let i = 0; i < length; i++) {
      a[i] = view.getFloat64(o, true);
      o += 8;
    }
    arrays[id] = a;
  }
  const r = arrays[CHECKPOINT_ARRAY_IDS.r];
  const h = arrays[CHECKPOINT_ARRAY_IDS.h];
  const history = arrays[CHECKPOINT_ARRAY_IDS.history];
  if (!r || !h || !history || r.length !== h.length || r.length < 3 || history.length !== HISTORY_CAPACITY * HISTORY_FIELDS) {
    throw new CheckpointError('checkpoint arrays are missing or have inconsistent lengths');
  }
  if (o !== body) throw new CheckpointError('checkpoint has unexpected bytes after its arrays');
  let target: ProfileTarget | undefined;
  if (spec.target.kind === 'profile') {
    const [kh, kf, kz] = [arrays[CHECKPOINT_ARRAY_IDS.targetH], arrays[CHECKPOINT_ARRAY_IDS.targetF], arrays[CHECKPOINT_ARRAY_IDS.targetZ]];
    if (!kh || !kf || !kz) throw new CheckpointError('checkpoint of a "profile" target run lacks the target knots (arrays 3–5)');
    try {
      target = ProfileTarget.fromKnots(kh, kf, kz);
    } catch (e) {
      throw new CheckpointError(`checkpoint target knots are not a valid profile: ${(e as Error).message}`);
    }
  } else if (arrayCount !== 3) {
    throw new CheckpointError('checkpoint carries target knots but its spec has no "profile" target');
  }
  return restoreFlowRun(spec, scalars, r, h, history, target);
}
