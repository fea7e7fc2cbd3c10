import type { ReactNode } from 'react';
import { Icon, type IconName } from './icon';

type NoticeTone = 'ok' | 'bad' | 'info' | 'hold';

const tones: Record<NoticeTone, { cls: string; icon: IconName }> = {
  ok: { cls: 'border-ok bg-ok-tint text-ok', icon: 'ok' },
  bad: { cls: 'border-bad bg-bad-tint text-bad', icon: 'alert' },
  hold: { cls: 'border-hold bg-hold-tint text-hold', icon: 'hold' },
  info: { cls: 'border-accent bg-accent-tint text-accent-strong', icon: 'info' },
};

type NoticeProps = { tone?: NoticeTone; title?: ReactNode; children?: ReactNode; live?: 'alert' | 'status' };

/** A plain-words message with a mark; `live` makes a screen reader say it when it appears. */
export function Notice({ tone = 'info', title, children, live }: NoticeProps) {
  const t = tones[tone];
  return (
    <div role={live} className={`flex items-start gap-2.5 rounded-control border-l-4 px-3.5 py-2.5 ${t.cls}`}>
      <Icon name={t.icon} size={20} className="mt-px shrink-0" />
      <div className="min-w-0 text-[0.95rem]">
        {title && <p className="font-semibold">{title}</p>}
        {children && <div className="text-ink">{children}</div>}
      </div>
    </div>
  );
}
