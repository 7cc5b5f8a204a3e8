/**
 * Writes a 2-D float64 array in NumPy's .npy format, version 1.0: the magic
 * "\x93NUMPY", version bytes, a little-endian uint16 header length, a Python-dict
 * header padded with spaces to a multiple of 64 bytes and ending in a newline,
 * then the data in C order as little-endian float64.
 */
export function toNpy(columns: ArrayLike<number>[]): Uint8Array {
  const rows = columns[0]?.length ?? 0;
  const cols = columns.length;
  let header = `{'descr': '<f8', 'fortran_order': False, 'shape': (${rows}, ${cols}), }`;
  const preamble = 10;
  const padding = 64 - ((preamble + header.length + 1) % 64);
  header += ' '.repeat(padding % 64) + '\n';
  const out = new Uint8Array(preamble + header.length + rows * cols * 8);
  out.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0], 0);
  new DataView(out.buffer).setUint16(8, header.length, true);
  for (let i = 0; i < header.length; i++) out[preamble + i] = header.charCodeAt(i);
  const data = new DataView(out.buffer, preamble + header.length);
  for (let r = 0; r < rows; r++) for (let c = 0; c < cols; c++) data.setFloat64((r * cols + c) * 8, columns[c]![r]!, true);
  return out;
}
