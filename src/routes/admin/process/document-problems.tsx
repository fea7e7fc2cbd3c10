import { Notice } from '../../../components/ui/notice';

export type Problem = { path: string; message: string };

/** The lists of a process document, each named as one of its rows. */
const SECTIONS: Record<string, string> = {
  partKinds: 'Part kind',
  families: 'Engine family',
  stages: 'Stage',
  characteristics: 'Characteristic',
  routes: 'Route',
  castingNumbers: 'Casting number',
  steps: 'step',
};

/** A field of the document in words; any other is its camelCase name spelled out. */
const FIELDS: Record<string, string> = {
  partKind: 'part kind',
  castingNumber: 'casting number',
  reworkTo: 'on failure, back to',
  boreMm: 'bore (mm)',
  strokeMm: 'stroke (mm)',
  headsPerEngine: 'heads per engine',
  warrantyMonths: 'warranty (months)',
  warrantyKm: 'warranty distance (km)',
  defectCode: 'defect code',
  gaugeKinds: 'gauge kinds',
  matesWith: 'mates with',
  physicalMin: 'lowest possible value',
  physicalMax: 'highest possible value',
  runTest: 'run test',
  exportedAt: 'time of export',
};
const fieldWords = (f: string) => FIELDS[f] ?? f.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();

type Node = Record<string, unknown> | undefined;

/** How a row of the document names itself: its code, or a route's family and part kind. */
function rowName(section: string, row: Node): string | null {
  if (!row || typeof row !== 'object') return null;
  const text = (v: unknown) => (typeof v === 'string' && v ? v : null);
  if (section === 'routes') return [text(row.family), text(row.partKind)].filter(Boolean).join(' ') || null;
  if (section === 'steps') return text(row.stage);
  if (section === 'characteristics' && text(row.stage) && text(row.code))
    return `${row.stage as string}/${row.code as string}`;
  return text(row.code) ?? text(row.castingNumber);
}

/**
 * A problem's path (`routes.0.steps.1.stage`) in words, with the rows named by their codes when the
 * document has them: "Route 1 (IM-4 oil_pump), step 2 (pump-test), stage".
 */
export function pathWords(path: string, doc: unknown): string {
  if (!path) return 'The document as a whole';
  const parts = path.split('.');
  const words: string[] = [];
  let node = doc as Node;
  for (let i = 0; i < parts.length; i++) {
    const p = parts[i]!;
    const next = parts[i + 1];
    if (SECTIONS[p] && next !== undefined && /^\d+$/.test(next)) {
      const row = (node?.[p] as Node[] | undefined)?.[Number(next)];
      const name = rowName(p, row);
      words.push(`${SECTIONS[p]} ${Number(next) + 1}${name ? ` (${name})` : ''}`);
      node = row;
      i++;
    } else if (/^\d+$/.test(p)) {
      words.push(`item ${Number(p) + 1}`);
      node = (node as unknown as Node[] | undefined)?.[Number(p)];
    } else {
      words.push(fieldWords(p));
      node = node?.[p] as Node;
    }
  }
  const text = words.join(', ');
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** Every problem a document has, each where it is in words and by its path; nothing was kept. */
export function DocumentProblems({ title, problems, doc }: { title: string; problems: Problem[]; doc: unknown }) {
  return (
    <Notice tone="bad" live="alert" title={title}>
      {problems.length > 0 && (
        <ol aria-label="Problems in the document" className="mt-2 flex list-decimal flex-col gap-1.5 pl-5">
          {problems.map((p) => (
            <li key={`${p.path}:${p.message}`}>
              <span className="font-semibold">{pathWords(p.path, doc)}</span>: {p.message}
              {p.path && <span className="ml-2 font-mono text-sm text-ink-soft">{p.path}</span>}
            </li>
          ))}
        </ol>
      )}
      <p className="mt-2">Nothing was kept: the plant’s process is as it was.</p>
    </Notice>
  );
}
