import type { Transaction } from 'sequelize';

type Read = () => unknown;
type Results<F extends readonly Read[]> = { -readonly [K in keyof F]: Awaited<ReturnType<F[K]>> };

/**
 * Several reads for one answer: at once on the pool when there is no transaction, one after
 * another inside one (a transaction is one connection, and pg stops queueing a second query on a
 * busy client in its next major version).
 */
export async function readsTogether<const F extends readonly Read[]>(
  transaction: Transaction | null | undefined,
  reads: F,
): Promise<Results<F>> {
  if (!transaction) return (await Promise.all(reads.map((read) => read()))) as Results<F>;
  const out: unknown[] = [];
  for (const read of reads) out.push(await read());
  return out as Results<F>;
}
