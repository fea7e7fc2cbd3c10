import type { ReactNode, Ref } from 'react';
import { useT } from '../lib/i18n';
import { Icon, type IconName } from './ui/icon';

/**
 * A safety caution where the hazardous step is: a thick outline, a mark and few words. It always
 * points back to the plant's own procedure, which it does not replace.
 */
export function Caution({
  title,
  icon = 'alert',
  children,
  ref,
}: {
  title: string;
  icon?: IconName;
  children: ReactNode;
  ref?: Ref<HTMLElement>;
}) {
  const t = useT();
  return (
    <aside
      ref={ref}
      aria-label={t('caution.label', { title })}
      className="flex items-start gap-3 rounded-control border-2 border-hold bg-hold-tint px-4 py-3 text-ink"
    >
      <span className="mt-0.5 flex size-10 shrink-0 items-center justify-center rounded-full border-2 border-hold bg-card text-hold">
        <Icon name={icon} size={24} />
      </span>
      <div>
        <p className="font-semibold text-hold">{t('caution.title', { title })}</p>
        <div className="mt-0.5">{children}</div>
      </div>
    </aside>
  );
}
