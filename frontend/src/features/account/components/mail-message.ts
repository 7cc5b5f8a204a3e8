/**
 * Just enough of RFC 5322/2045 to show a message as its recipient would read it:
 * unfolded headers, encoded words, quoted-printable or base64 bodies, and the
 * text/plain part of a multipart message.
 */
export interface ParsedMail {
  headers: Record<string, string>;
  text: string;
}

const utf8 = new TextDecoder('utf-8');

function decodeQuotedPrintable(text: string, underscoreIsSpace = false): string {
  const source = text.replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < source.length; i++) {
    const ch = source[i]!;
    const hex = source.slice(i + 1, i + 3);
    if (ch === '=' && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      bytes.push(parseInt(hex, 16));
      i += 2;
    } else if (underscoreIsSpace && ch === '_') {
      bytes.push(0x20);
    } else {
      for (const b of new TextEncoder().encode(ch)) bytes.push(b);
    }
  }
  return utf8.decode(new Uint8Array(bytes));
}

function decodeBase64(text: string): string {
  try {
    const binary = atob(text.replace(/\s+/g, ''));
    return utf8.decode(Uint8Array.from(binary, (c) => c.charCodeAt(0)));
  } catch {
    return text;
  }
}

/** =?utf-8?Q?…?= and =?utf-8?B?…?= words in headers. */
export function decodeEncodedWords(value: string): string {
  return value
    .replace(/(\?=)\s+(?==\?)/g, '$1')
    .replace(/=\?([^?]+)\?([bBqQ])\?([^?]*)\?=/g, (_all, _charset: string, encoding: string, text: string) =>
      encoding.toUpperCase() === 'B' ? decodeBase64(text) : decodeQuotedPrintable(text, true),
    );
}

function splitHeaders(raw: string): { headers: Record<string, string>; body: string } {
  const normalised = raw.replace(/\r\n/g, '\n');
  const end = normalised.indexOf('\n\n');
  const head = end === -1 ? normalised : normalised.slice(0, end);
  const body = end === -1 ? '' : normalised.slice(end + 2);
  const headers: Record<string, string> = {};
  // Unfold: a line starting with white space continues the previous header.
  for (const line of head.replace(/\n[ \t]+/g, ' ').split('\n')) {
    const colon = line.indexOf(':');
    if (colon > 0) headers[line.slice(0, colon).trim().toLowerCase()] = line.slice(colon + 1).trim();
  }
  return { headers, body };
}

function decodeBody(headers: Record<string, string>, body: string): string {
  const encoding = (headers['content-transfer-encoding'] ?? '').toLowerCase();
  if (encoding === 'quoted-printable') return decodeQuotedPrintable(body);
  if (encoding === 'base64') return decodeBase64(body);
  return body;
}

export function parseMail(raw: string): ParsedMail {
  const { headers, body } = splitHeaders(raw);
  const type = headers['content-type'] ?? 'text/plain';
  let text: string;
  const boundary = /multipart\/[^;]+;.*boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (boundary) {
    const parts = body.split(`--${boundary}`).slice(1).filter((part) => !part.startsWith('--'));
    const parsed = parts.map((part) => splitHeaders(part.replace(/^\n/, '')));
    const plain = parsed.find((p) => (p.headers['content-type'] ?? 'text/plain').toLowerCase().startsWith('text/plain')) ?? parsed[0];
    text = plain ? decodeBody(plain.headers, plain.body) : body;
  } else {
    text = decodeBody(headers, body);
  }
  const decoded: Record<string, string> = {};
  for (const [key, value] of Object.entries(headers)) decoded[key] = decodeEncodedWords(value);
  return { headers: decoded, text: text.replace(/\n+$/, '') };
}
