// `npm run verify -- FILE [--key KEY]… [--heads HEADS.json]`: checks a document offline against the
// plant's signed log head it carries. FILE is the checkable JSON or a PDF Coretrail issued: the PDF's
// attached data is checked, then its pages are drawn again from that data and must be the same bytes. KEY is the plant's public key: 64 hex digits, base64, a PEM
// file (public or private key) or the JSON of GET /api/audit/log/head; without one, the key in
// .data/audit-signing-key.pem. HEADS is the plant's exported head history (GET /api/audit/log/heads):
// the document's head must be in it. Exit 0 intact, 1 altered or not in the log, 3 unknown, 2 unreadable.
import { createPublicKey } from 'node:crypto';
import fs from 'node:fs';
import { inflateSync } from 'node:zlib';
import type { DocumentContent } from '../../shared/documents/content.js';
import { contentHash } from '../../shared/ledger/entry.js';
import { attachedDocument, isPdf } from '../../shared/ledger/pdf-file.js';
import type { CheckableDocument } from '../../shared/ledger/document.js';
import { KNOWN_LAYOUTS, drawDocument } from '../documents/pdf/draw.js';
import { PAPER_SIZES } from '../documents/pdf/kit.js';
import { verifyDocument, type VerifyResult } from '../../shared/ledger/document.js';
import { fromBase64, keyIdOf, toBase64, type PublishedKey } from '../../shared/ledger/head.js';
import { fromHex } from '../../shared/ledger/merkle.js';
import { rawPublicKey } from '../ledger/signer.js';

function keyFrom(text: string): PublishedKey {
  const t = text.trim();
  let raw: Uint8Array | null = null;
  if (/^[0-9a-fA-F]{64}$/.test(t)) raw = fromHex(t.toLowerCase());
  else if (/^[A-Za-z0-9+/]{43}=$/.test(t)) raw = fromBase64(t);
  else if (fs.existsSync(t)) {
    const body = fs.readFileSync(t, 'utf8');
    if (body.includes('-----BEGIN')) raw = rawPublicKey(createPublicKey(body));
    else {
      const json = JSON.parse(body) as { key?: PublishedKey | null; publicKey?: string };
      const b64 = json.key?.publicKey ?? json.publicKey;
      if (!b64) throw new Error(`${t} holds no publicKey`);
      raw = fromBase64(b64);
    }
  }
  if (!raw || raw.length !== 32) throw new Error(`not an Ed25519 public key: ${t}`);
  return { keyId: keyIdOf(raw), publicKey: toBase64(raw) };
}

/**
 * Do a PDF's pages say what its checked data says? They are drawn again from the data, on each
 * paper size, and compared byte for byte: an edited page, or a page from other data, differs.
 */
export async function pagesMatch(pdf: Buffer, doc: CheckableDocument): Promise<VerifyResult | null> {
  const content = doc.content as DocumentContent;
  if (!KNOWN_LAYOUTS.includes(content.layout)) {
    return { verdict: 'unknown', reason: `its layout ${String(content.layout)} is not one this checker can draw` };
  }
  const receipt = { ...doc, contentHash: contentHash(doc.content) };
  for (const size of PAPER_SIZES) {
    const again = await drawDocument(content, receipt, size);
    if (again.equals(pdf)) return null;
  }
  return { verdict: 'altered', reason: 'its logged data is intact, but its pages are not the ones that data prints' };
}

export async function runVerify(argv: string[]): Promise<{ result: VerifyResult; lines: string[]; exit: number }> {
  const lines: string[] = [];
  const keys: PublishedKey[] = [];
  let file: string | undefined;
  let headsFile: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a === '--key') keys.push(keyFrom(argv[++i] ?? ''));
    else if (a === '--heads') headsFile = argv[++i];
    else file = a;
  }
  if (!file) throw new Error('usage: npm run verify -- FILE [--key KEY]… [--heads HEADS.json]');
  if (!keys.length && fs.existsSync('.data/audit-signing-key.pem')) keys.push(keyFrom('.data/audit-signing-key.pem'));
  if (!keys.length) throw new Error("no plant key: pass --key with the plant's public key");
  let doc: unknown;
  const bytes = fs.readFileSync(file);
  const pdf = isPdf(bytes);
  try {
    doc = pdf ? await attachedDocument(bytes, async (d) => inflateSync(d)) : JSON.parse(bytes.toString('utf8'));
    if (doc === null) throw new Error('it carries no Coretrail document data (a draft, or not issued by Coretrail)');
  } catch (err) {
    const result: VerifyResult = {
      verdict: 'unreadable',
      reason: `${file} is not ${pdf ? 'a checkable PDF' : 'JSON'}: ${(err as Error).message}`,
    };
    return { result, lines: [`UNREADABLE: ${result.reason}`], exit: 2 };
  }
  let result = verifyDocument(doc, keys);
  if (pdf && result.verdict === 'intact') {
    const pages = await pagesMatch(bytes, doc as CheckableDocument);
    if (pages) result = { ...result, ...pages };
    else lines.push('its pages are the ones its logged data prints');
  }
  if (result.verdict === 'intact' && headsFile) {
    const history = JSON.parse(fs.readFileSync(headsFile, 'utf8')) as {
      heads?: { treeSize: number; rootHash: string }[];
    };
    const head = (doc as { head: { treeSize: number; rootHash: string } }).head;
    const published = history.heads?.find((h) => h.treeSize === head.treeSize);
    if (!published) lines.push(`note: the head of size ${head.treeSize} is not in ${headsFile}`);
    else if (published.rootHash !== head.rootHash) {
      result = {
        ...result,
        verdict: 'altered',
        reason: `its head differs from the published head of size ${head.treeSize}`,
      };
    } else lines.push(`its head is the published head of size ${head.treeSize}`);
  }
  const word = {
    intact: 'INTACT',
    altered: 'ALTERED',
    not_in_log: 'NOT IN THE LOG',
    unknown: 'UNKNOWN',
    unreadable: 'UNREADABLE',
  };
  lines.unshift(`${word[result.verdict]}: ${result.reason}`);
  if (result.signedAt) lines.push(`log head signed ${result.signedAt}, ${result.treeSize} entries`);
  const exit = { intact: 0, altered: 1, not_in_log: 1, unknown: 3, unreadable: 2 }[result.verdict];
  return { result, lines, exit };
}

if (process.argv[1]?.endsWith('verify-document.ts')) {
  try {
    const { lines, exit } = await runVerify(process.argv.slice(2));
    for (const l of lines) console.log(l);
    process.exitCode = exit;
  } catch (err) {
    console.error((err as Error).message);
    process.exitCode = 2;
  }
}
