import { useId, useState } from 'react';
import { decodeInclusionCode } from '../../../shared/ledger/code';
import { headExtendsTo, verifyCode, verifyDocument, type VerifyResult } from '../../../shared/ledger/document';
import { attachedDocument, isPdf } from '../../../shared/ledger/pdf-file';
import { fetchConsistency, usePublishedHead } from '../../api/audit/published-head';
import { Button } from '../../components/ui/button';
import { Notice } from '../../components/ui/notice';
import { Wordmark } from '../../components/wordmark';
import { usePlant } from '../../api/plant/plant';

/** zlib data (a PDF's FlateDecode stream) through the browser's own decompressor. */
async function inflate(data: Uint8Array): Promise<Uint8Array> {
  const stream = new Blob([data as BlobPart]).stream().pipeThrough(new DecompressionStream('deflate'));
  return new Uint8Array(await new Response(stream).arrayBuffer());
}

const VERDICT: Record<VerifyResult['verdict'], { tone: 'ok' | 'bad' | 'hold'; title: string }> = {
  intact: { tone: 'ok', title: 'Intact: this record is in the plant’s log, as issued' },
  altered: { tone: 'bad', title: 'Altered: this record was changed after the plant logged it' },
  not_in_log: { tone: 'bad', title: 'Not in the log: the plant’s log does not hold this record' },
  unknown: { tone: 'hold', title: 'Unknown: not signed by this plant' },
  unreadable: { tone: 'hold', title: 'Not a code or file this page can read' },
};

/**
 * Anyone, without signing in, checks a document's code or file against the plant's latest signed log
 * head. Everything is computed here in the browser; the server gives only its public key, its latest
 * head and, where the document's log was smaller, a consistency proof up to the latest.
 */
export function VerifyPage() {
  const published = usePublishedHead();
  const plantName = usePlant().data?.name ?? '';
  const codeId = useId();
  const fileId = useId();
  const [code, setCode] = useState('');
  const [file, setFile] = useState<File | null>(null);
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<VerifyResult | null>(null);
  const key = published.data?.key ?? null;
  const head = published.data?.head ?? null;

  const check = async () => {
    if (!key || !head) return;
    setBusy(true);
    setResult(null);
    try {
      if (file) {
        let doc: unknown;
        const bytes = new Uint8Array(await file.arrayBuffer());
        const pdf = isPdf(bytes);
        try {
          doc = pdf ? await attachedDocument(bytes, inflate) : JSON.parse(new TextDecoder().decode(bytes));
        } catch {
          doc = null;
        }
        if (doc === null) {
          setResult({
            verdict: 'unreadable',
            reason: pdf
              ? `${file.name} carries no checkable data (a draft, or not issued by this plant)`
              : `${file.name} is not a JSON document`,
          });
          return;
        }
        let r = verifyDocument(doc, [key]);
        const own = doc as { treeSize: number; rootHash: string };
        if (r.verdict === 'intact' && own.treeSize < head.treeSize) {
          const cons = await fetchConsistency(own.treeSize, head.treeSize);
          if (!headExtendsTo(own, head, cons.proof)) {
            r = {
              ...r,
              verdict: 'altered',
              reason: 'the plant’s log no longer agrees with the head this document carries',
            };
          } else r = { ...r, reason: `${r.reason}; the log has only grown since (now ${head.treeSize} entries)` };
        }
        // the pages themselves are compared with the data by npm run verify, which can draw them again
        if (pdf && r.verdict === 'intact') {
          r = {
            ...r,
            reason: `${r.reason}. This checks the data attached to the PDF; npm run verify also checks its pages`,
          };
        }
        setResult(r);
      } else {
        let size = 0;
        try {
          size = decodeInclusionCode(code).treeSize;
        } catch (err) {
          setResult({ verdict: 'unreadable', reason: (err as Error).message });
          return;
        }
        const proof = size < head.treeSize ? (await fetchConsistency(size, head.treeSize)).proof : [];
        setResult(verifyCode(code, head, [key], proof));
      }
    } catch (err) {
      setResult({ verdict: 'unreadable', reason: (err as Error).message });
    } finally {
      setBusy(false);
    }
  };

  const shown = result ? VERDICT[result.verdict] : null;
  return (
    <main className="flex min-h-screen items-start justify-center px-4 py-[8vh]">
      <div className="w-full max-w-[40rem]">
        <div className="mb-5 flex flex-col items-center gap-1 text-center">
          <Wordmark large />
          <p className="text-ink-soft">{plantName}</p>
        </div>
        <section
          aria-labelledby="verify-heading"
          className="rounded-card border border-rule bg-card px-6 py-6 shadow-card"
        >
          <h1 id="verify-heading" className="mb-2 text-xl font-semibold">
            Check a document
          </h1>
          <p className="mb-4 text-sm text-ink-soft">
            Paste the code printed on a document (it starts with CT1:), or choose the document’s file. The check runs in
            this browser against the plant’s signed log; nothing you choose is sent anywhere.
          </p>
          {published.error && (
            <Notice tone="bad">The plant’s log head could not be read: {published.error.message}</Notice>
          )}
          {published.data && (!key || !head) && (
            <Notice tone="hold">
              This plant publishes no signed log head yet, so documents cannot be checked here.
            </Notice>
          )}
          <form
            className="flex flex-col gap-4"
            onSubmit={(e) => {
              e.preventDefault();
              void check();
            }}
          >
            <div className="flex flex-col gap-1">
              <label htmlFor={codeId} className="text-sm font-medium">
                Code
              </label>
              <textarea
                id={codeId}
                rows={4}
                value={code}
                spellCheck={false}
                onChange={(e) => {
                  setCode(e.target.value);
                  setFile(null);
                }}
                className="rounded-control border border-rule-strong bg-field p-2 font-mono text-sm"
                placeholder="CT1:…"
              />
            </div>
            <div className="flex flex-col gap-1">
              <label htmlFor={fileId} className="text-sm font-medium">
                Or the document’s file (PDF or JSON)
              </label>
              <input
                id={fileId}
                type="file"
                accept="application/pdf,.pdf,application/json,.json"
                onChange={(e) => setFile(e.target.files?.[0] ?? null)}
                className="text-sm"
              />
            </div>
            <div>
              <Button
                type="submit"
                variant="primary"
                disabled={busy || !key || !head || (!code.trim() && !file)}
                aria-busy={busy}
              >
                Check
              </Button>
            </div>
          </form>
          <div aria-live="polite" className="mt-4">
            {result && shown && (
              <Notice tone={shown.tone} title={shown.title}>
                {result.reason}.
                {result.signedAt && (
                  <span className="block text-sm text-ink-soft">
                    Log head signed {result.signedAt.replace('T', ' ').slice(0, 19)} UTC.
                  </span>
                )}
              </Notice>
            )}
          </div>
          {key && (
            <p className="mt-4 break-all font-mono text-xs text-ink-faint">
              plant key {key.keyId}
              {head && ` · latest head ${head.treeSize} entries`}
            </p>
          )}
        </section>
      </div>
    </main>
  );
}
