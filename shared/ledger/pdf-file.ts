// The checkable data a Coretrail PDF carries as an attached file (an /EmbeddedFile stream, as PDF
// 1.7 §7.11.4 has it). Streams are never inside object streams, so the attached file can be found
// by walking the file's `stream` keywords, whichever program saved the PDF last. Used by
// `npm run verify` (node:zlib) and the /verify page (the browser's DecompressionStream).

const latin1 = (bytes: Uint8Array) => {
  let s = '';
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return s;
};

export const isPdf = (bytes: Uint8Array) => latin1(bytes.subarray(0, 5)) === '%PDF-';

export type Inflate = (data: Uint8Array) => Promise<Uint8Array>;

/** The bodies of every attached file in a PDF, decoded (uncompressed or FlateDecode). */
export async function attachedFiles(bytes: Uint8Array, inflate: Inflate): Promise<Uint8Array[]> {
  const text = latin1(bytes);
  const found: Uint8Array[] = [];
  const re = /stream(\r\n|\n)/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(text))) {
    // the keyword must end a dictionary ("… >> stream"), not sit inside another stream's data
    const before = text.slice(Math.max(0, m.index - 4000), m.index);
    if (!/>>\s*$/.test(before)) continue;
    const objAt = before.lastIndexOf(' obj');
    if (objAt < 0) continue;
    const dict = before.slice(objAt);
    const start = m.index + m[0].length;
    const direct = /\/Length\s+(\d+)(?!\s+\d+\s+R)/.exec(dict);
    let end = direct ? start + Number(direct[1]) : -1;
    if (
      end < 0 ||
      text
        .slice(end, end + 12)
        .trimStart()
        .slice(0, 9) !== 'endstream'
    ) {
      end = text.indexOf('endstream', start);
      if (end < 0) break;
      while (end > start && (text[end - 1] === '\n' || text[end - 1] === '\r')) end--;
    }
    re.lastIndex = end;
    if (!/\/Type\s*\/EmbeddedFile\b/.test(dict)) continue;
    const raw = bytes.subarray(start, end);
    if (/\/Filter\s*\/FlateDecode/.test(dict)) found.push(await inflate(raw));
    else if (!/\/Filter/.test(dict)) found.push(raw);
  }
  return found;
}

/** The first attached file that is a Coretrail checkable document, parsed; null when there is none. */
export async function attachedDocument(bytes: Uint8Array, inflate: Inflate): Promise<unknown> {
  for (const body of await attachedFiles(bytes, inflate)) {
    try {
      const json = JSON.parse(new TextDecoder().decode(body)) as { format?: unknown };
      if (
        json &&
        typeof json === 'object' &&
        typeof json.format === 'string' &&
        json.format.startsWith('coretrail-document/')
      ) {
        return json;
      }
    } catch {
      // another attachment: not ours
    }
  }
  return null;
}
