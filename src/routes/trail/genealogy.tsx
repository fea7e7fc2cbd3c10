import { Link } from 'react-router';
import type { TrailNode } from '../../../shared/schemas/trail';
import { StatusBadge } from '../../components/item-status';
import { formatWhen } from '../../lib/format';
import { partName } from '../../lib/item-status';
import { trailHref } from '../../lib/paths';

/** How a node hangs from the one above it, read from the top: a unit's parts were installed, each came from a core. */
function joinWord(node: TrailNode): string | null {
  if (node.link === 'installed_in' && node.removedAt) return node.kind === 'long_block' ? 'was in' : 'taken out';
  if (node.link === 'installed_in') return node.kind === 'long_block' ? 'installed in' : 'installed';
  if (node.link === 'harvested_from') return node.kind === 'core' ? 'from core' : 'harvested';
  return null;
}

function Node({ node, current }: { node: TrailNode; current: string }) {
  const here = node.serial === current;
  const join = joinWord(node);
  return (
    <li className="relative">
      <div
        className={`flex flex-col gap-0.5 rounded-control px-2 py-1.5 ${here ? 'bg-accent-tint ring-1 ring-accent' : ''}`}
      >
        <div className="flex flex-wrap items-center gap-x-2 gap-y-1">
          {join && (
            <span className="rounded-control border border-rule-strong px-1.5 text-xs font-semibold uppercase tracking-wide text-ink-soft">
              {join}
            </span>
          )}
          <Link
            to={trailHref(node.serial)}
            aria-current={here ? 'page' : undefined}
            className="inline-flex min-h-8 items-center font-mono text-[1.05rem] font-semibold text-accent underline-offset-4 hover:underline floor:min-h-12"
          >
            {node.serial}
          </Link>
          {here && <span className="text-sm font-medium text-accent-strong">· this serial</span>}
        </div>
        <div className="flex flex-wrap items-center gap-x-2 gap-y-1 text-sm">
          <span>{partName(node.kindLabel, node.positionLabel)}</span>
          <span className="font-mono text-ink-soft">{node.familyCode}</span>
          <StatusBadge status={node.status} />
        </div>
        {node.fittedAt && (
          <p className="text-sm text-ink-soft">
            Fitted <time dateTime={node.fittedAt}>{formatWhen(node.fittedAt)}</time>
            {node.removedAt && (
              <>
                {' '}
                · taken out <time dateTime={node.removedAt}>{formatWhen(node.removedAt)}</time>
                {node.removedReason ? `: ${node.removedReason}` : ''}
              </>
            )}
          </p>
        )}
      </div>
      {node.children.length > 0 && (
        <ul className="ml-4 mt-1 flex flex-col gap-1 border-l-2 border-rule-strong pl-3">
          {node.children.map((c) => (
            <Node key={`${c.serial}-${c.fittedAt ?? ''}`} node={c} current={current} />
          ))}
        </ul>
      )}
    </li>
  );
}

/** The unit at the top, what was installed in it, and the core each part came from; every serial opens its own trail. */
export function Genealogy({ tree, current }: { tree: TrailNode; current: string }) {
  return (
    <ul aria-label="Genealogy" className="flex flex-col gap-1">
      <Node node={tree} current={current} />
    </ul>
  );
}

/** Every serial in the tree once (the parts of one core share it), top first, for the results' part filter. */
export function serialsOf(tree: TrailNode): TrailNode[] {
  const seen = new Map<string, TrailNode>();
  const walk = (n: TrailNode) => {
    if (!seen.has(n.serial)) seen.set(n.serial, n);
    n.children.forEach(walk);
  };
  walk(tree);
  return [...seen.values()];
}
