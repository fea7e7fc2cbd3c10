import type { ItemJson } from '../../api/items/types';
import { partName } from '../../lib/item-status';
import type { LabelStock } from '../../lib/paths';

export const STOCKS: { value: LabelStock; label: string; cls: string }[] = [
  { value: '2x1in', label: '2 × 1 in', cls: 'label-2x1 h-[1in] w-[2in]' },
  { value: '50x25mm', label: '50 × 25 mm', cls: 'label-50x25 h-[25mm] w-[50mm]' },
];

/**
 * One label at its printed size: the QR (which holds the serial and nothing else) on the left,
 * the serial in the largest type that fits on one line beside it. Sizes are in points and inches
 * because this is laid out for the printer, not the screen.
 */
export function LabelCard({ serial, item, stock }: { serial: string; item: ItemJson | undefined; stock: LabelStock }) {
  const size = STOCKS.find((s) => s.value === stock)!;
  const rejected = item?.status === 'rejected';
  const body = (
    <>
      <img
        src={`/api/items/${encodeURIComponent(serial)}/label.svg`}
        alt={`QR code for ${serial}`}
        className="aspect-square h-full shrink-0"
      />
      <div className="flex min-w-0 flex-col justify-center gap-[1.5pt] leading-none">
        <p className="whitespace-nowrap font-mono text-[9pt] font-semibold tracking-tight">{serial}</p>
        <p className="truncate text-[7pt] font-semibold">{item ? partName(item.kindLabel, item.positionLabel) : '…'}</p>
        <p className="truncate font-mono text-[6.5pt]">{item?.family.code ?? ''}</p>
        <p className="font-mono text-[6.5pt]">{item ? item.createdAt.slice(0, 10) : ''}</p>
      </div>
    </>
  );
  if (!rejected) {
    return (
      <article
        aria-label={`Label ${serial}`}
        className={`label flex shrink-0 items-center gap-[3pt] overflow-hidden bg-white p-[3pt] text-black outline outline-1 outline-rule-strong ${size.cls}`}
      >
        {body}
      </article>
    );
  }
  // A rejected core keeps its label (it is still traced) but must never pass for a good one: a
  // solid band across the top with the words and a crossed-circle mark, and a heavy dashed frame,
  // so it reads the same on a one-colour printer as on the screen.
  return (
    <article
      aria-label={`Label ${serial}, rejected`}
      className={`label flex shrink-0 flex-col overflow-hidden border-[1.5pt] border-dashed border-black bg-white text-black ${size.cls}`}
    >
      <p className="flex shrink-0 items-center justify-center gap-[2pt] bg-black px-[2pt] py-[1pt] text-[6.5pt] font-bold leading-none whitespace-nowrap text-white">
        <svg viewBox="0 0 10 10" aria-hidden="true" className="size-[6.5pt] shrink-0">
          <circle cx="5" cy="5" r="4" fill="none" stroke="currentColor" strokeWidth="1.6" />
          <path d="M2.2 7.8 7.8 2.2" stroke="currentColor" strokeWidth="1.6" />
        </svg>
        REJECTED — not for the line
      </p>
      <div className="flex min-h-0 flex-1 items-center gap-[3pt] p-[2pt]">{body}</div>
    </article>
  );
}
