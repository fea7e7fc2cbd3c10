import type { ReactNode, TdHTMLAttributes, ThHTMLAttributes } from 'react';

export type Align = 'left' | 'right' | 'center';
const alignCls: Record<Align, string> = { left: 'text-left', right: 'text-right', center: 'text-center' };

/**
 * The box a table sits in. It does not scroll by itself: the page scrolls, and the header row sticks
 * to the top of the window, so a long list or an opened row is never trapped in a box inside the
 * page. Tables fit their width instead (long columns wrap or move to a second line, see DataTable);
 * only on a phone-narrow screen does the box scroll sideways.
 */
export function TableFrame({ children, label, busy = false }: { children: ReactNode; label?: string; busy?: boolean }) {
  return (
    <div
      className={`min-h-32 transition-opacity max-md:overflow-x-auto ${busy ? 'opacity-60' : ''}`}
      aria-busy={busy}
      role={label ? 'region' : undefined}
      aria-label={label}
    >
      {children}
    </div>
  );
}

export function Table({ children, caption }: { children: ReactNode; caption?: string }) {
  return (
    <table className="w-full border-separate border-spacing-0 text-[0.925rem] floor:text-base">
      {caption && <caption className="sr-only">{caption}</caption>}
      {children}
    </table>
  );
}

export const THead = ({ children }: { children: ReactNode }) => <thead>{children}</thead>;
export const TBody = ({ children }: { children: ReactNode }) => <tbody>{children}</tbody>;

export function TR({ children, muted = false }: { children: ReactNode; muted?: boolean }) {
  return <tr className={`hover:bg-sunk/60 ${muted ? 'text-ink-soft' : ''}`}>{children}</tr>;
}

/** `wideOnly` cells give way below 1280 px (DataTable moves them to a second line) and come back on a wide screen. */
type CellOwn = { align?: Align; mono?: boolean; nowrap?: boolean; wideOnly?: boolean };

export function TH({
  align = 'left',
  wideOnly = false,
  children,
  ...rest
}: CellOwn & ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th
      scope="col"
      className={`sticky top-0 z-10 whitespace-nowrap border-b border-rule-strong bg-sunk px-2.5 py-2 text-xs font-semibold uppercase tracking-wide text-ink-soft first:pl-5 last:pr-5 ${alignCls[align]} ${wideOnly ? 'hidden xl:table-cell' : ''}`}
      {...rest}
    >
      {children}
    </th>
  );
}

export function TD({
  align = 'left',
  mono = false,
  nowrap = false,
  wideOnly = false,
  className = '',
  children,
  ...rest
}: CellOwn & TdHTMLAttributes<HTMLTableCellElement>) {
  const cls = [
    className,
    'border-b border-rule px-2.5 py-2 align-middle first:pl-5 last:pr-5 floor:py-3',
    alignCls[align],
    mono ? 'font-mono text-[0.875rem] floor:text-[0.95rem]' : '',
    align === 'right' ? 'tabular-nums' : '',
    nowrap ? 'whitespace-nowrap' : '',
    wideOnly ? 'hidden xl:table-cell' : '',
  ].join(' ');
  return (
    <td className={cls} {...rest}>
      {children}
    </td>
  );
}

/** The one row that says why a table has nothing in it. */
export function EmptyRow({ colSpan, children }: { colSpan: number; children: ReactNode }) {
  return (
    <tr>
      <td colSpan={colSpan} className="px-5 py-8 text-center text-ink-soft">
        {children}
      </td>
    </tr>
  );
}
