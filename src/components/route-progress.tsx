import type { RouteStep } from '../api/items/types';
import { useT } from '../lib/i18n';
import { Icon, type IconName } from './ui/icon';

const STEP: Record<RouteStep['state'], { icon: IconName; word: string; cls: string }> = {
  done: { icon: 'ok', word: 'route.done', cls: 'border border-ok bg-ok-tint text-ok' },
  current: { icon: 'stepNow', word: 'route.here', cls: 'border-2 border-accent bg-accent-tint font-semibold text-ink' },
  todo: { icon: 'wait', word: 'route.todo', cls: 'border border-dashed border-rule-strong bg-card text-ink-soft' },
  skipped: {
    icon: 'off',
    word: 'route.skipped',
    cls: 'border border-dotted border-rule-strong bg-ground text-ink-soft line-through',
  },
};

/**
 * Where an item is on its route, as a row of stages. Each state has its own mark and outline (tick
 * ring, solid arrow in a thick box, dashed ring) and its word, so it reads without colour.
 */
export function RouteProgress({ steps }: { steps: RouteStep[] }) {
  const tr = useT();
  if (steps.length === 0) return <p className="text-ink-soft">{tr('route.none')}</p>;
  const at = steps.findIndex((s) => s.state === 'current');
  const done = steps.filter((s) => s.state === 'done').length;
  return (
    <div>
      <p className="mb-2 text-sm text-ink-soft">
        {at >= 0 ? (
          <>
            {tr('route.stage')} <span className="font-mono text-ink">{at + 1}</span> {tr('common.of')}{' '}
            <span className="font-mono text-ink">{steps.length}</span>:{' '}
            <span className="font-semibold text-ink">{steps[at]!.name}</span>
          </>
        ) : done === steps.length ? (
          tr('route.allDone')
        ) : (
          tr('slot.doneCount', { done, all: steps.length })
        )}
      </p>
      <ol aria-label={tr('route.label')} className="flex flex-wrap gap-1.5">
        {steps.map((s) => {
          const t = STEP[s.state];
          return (
            <li
              key={s.code}
              aria-current={s.state === 'current' ? 'step' : undefined}
              className={`inline-flex min-h-8 items-center gap-1.5 rounded-control px-2 py-1 text-sm ${t.cls}`}
            >
              <Icon name={t.icon} size={16} />
              <span>{s.name}</span>
              {s.state === 'current' ? (
                <span className="text-xs uppercase tracking-wide">· {tr(t.word)}</span>
              ) : (
                <span className="sr-only">({tr(t.word)})</span>
              )}
              {!s.required && <span className="text-xs text-ink-soft">{tr('route.ifNeeded')}</span>}
            </li>
          );
        })}
      </ol>
      <p aria-hidden="true" className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-soft">
        {(
          [
            'done',
            'current',
            'todo',
            ...(steps.some((s) => s.state === 'skipped') ? (['skipped'] as const) : []),
          ] as const
        ).map((k) => (
          <span key={k} className="inline-flex items-center gap-1">
            <Icon name={STEP[k].icon} size={14} /> {tr(STEP[k].word)}
          </span>
        ))}
      </p>
    </div>
  );
}
