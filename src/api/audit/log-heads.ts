import type { SignedHeadJson } from '../../../shared/schemas/audit';
import { http } from '../../lib/http';

type HeadsPage = {
  format: string;
  key: { keyId: string; publicKey: string } | null;
  heads: (SignedHeadJson & { publicKey: string })[];
};

/** Every signed head, oldest first, page by page: the history a plant hands to another system. */
export async function fetchAllHeads(): Promise<HeadsPage> {
  let after = -1;
  const all: HeadsPage = { format: 'coretrail-log-heads/1', key: null, heads: [] };
  for (;;) {
    const page = await http<HeadsPage>('/api/audit/log/heads', { query: { after, limit: 10_000 } });
    all.key = page.key;
    all.heads.push(...page.heads);
    if (page.heads.length < 10_000) return all;
    after = page.heads[page.heads.length - 1]!.treeSize;
  }
}
