import type { ReactNode } from 'react';
import { Icon, type IconName } from './icon';

export type Tone = 'ok' | 'bad' | 'hold' | 'wait' | 'off' | 'neutral' | 'accent';

// each tone has its own outline pattern as well as its colour and icon
const tones: Record<Tone, { cls: string; icon: IconName | null }> = {
  ok: { cls: 'border border-ok bg-ok-tint text-ok', icon: 'ok' },
  bad: { cls: 'border-[3px] border-double border-bad bg-bad-tint text-bad', icon: 'bad' },
  hold: { cls: 'border-2 border-hold bg-hold-tint text-hold', icon: 'hold' },
  wait: { cls: 'border border-dashed border-wait bg-wait-tint text-wait', icon: 'wait' },
  off: { cls: 'border border-dashed border-ink-soft bg-sunk text-ink-soft', icon: 'off' },
  neutral: { cls: 'border border-rule-strong bg-sunk text-ink-soft', icon: null },
  accent: { cls: 'border border-accent bg-accent-tint text-accent-strong', icon: null },
};

type BadgeProps = { tone?: Tone; icon?: IconName | null; children: ReactNode };

/** A state in a word, a colour and a shape; never the colour alone. */
export function Badge({ tone = 'neutral', icon, children }: BadgeProps) {
  const t = tones[tone];
  const glyph = icon === undefined ? t.icon : icon;
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-control px-1.5 py-0.5 text-sm font-medium ${t.cls}`}
    >
      {glyph && <Icon name={glyph} size={15} />}
      {children}
    </span>
  );
}
