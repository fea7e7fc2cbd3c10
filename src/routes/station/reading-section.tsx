import { useId, type CSSProperties, type ReactNode } from 'react';
import { Badge } from '../../components/ui/badge';
import { Icon } from '../../components/ui/icon';
import type { FormCharacteristic } from '../../api/station/types';
import { CheckTiles, DerivedValue, ReadingBox } from './boxes';
import {
  headerOf,
  shortLabel,
  shortName,
  type CylinderCard,
  type DerivedCell,
  type GroupCard,
  type Section,
} from './layout';
import { alternativesOf, convertDecimal } from '../../../shared/domain/units';
import { limitsOf } from '../../../shared/domain/tolerance';
import { useFormState } from './form-state';
import { limitsText, nominalText, type Slot } from './readings';
import { t } from '../../lib/i18n';

function Limits({ char }: { char: FormCharacteristic }) {
  if (char.kind === 'attribute') return <span className="text-ink-soft">{t('form.passOrFail')}</span>;
  if (!char.rule) {
    return (
      <span className="inline-flex items-center gap-1 font-semibold text-hold">
        <Icon name="hold" size={18} />
        No approved rule in force
      </span>
    );
  }
  const nominal = nominalText(char);
  return (
    <span>
      <span className="font-mono text-lg font-semibold text-ink">{limitsText(char)}</span>
      {nominal && <span className="ml-2 font-mono text-sm text-ink-soft">({nominal})</span>}
      <LimitsIn char={char} />
    </span>
  );
}

/**
 * The limits again in the unit being typed, for reading the gauge against: judged still in the
 * rule's unit, after conversion (NIST SP 811 factors), so these are a guide, not the limits.
 */
function LimitsIn({ char }: { char: FormCharacteristic }) {
  const { units } = useFormState();
  const unit = units[char.code];
  if (!char.rule || !unit || unit === char.unit) return null;
  const { lower, upper } = limitsOf(char.rule);
  const f = (v: number) =>
    convertDecimal(v, char.rule?.unit ?? char.unit, unit)
      ?.toSignificantDigits(7)
      .toString();
  const text =
    lower !== null && upper !== null
      ? `${f(lower)}–${f(upper)}`
      : lower !== null
        ? `≥ ${f(lower)}`
        : upper !== null
          ? `≤ ${f(upper)}`
          : null;
  if (!text) return null;
  return (
    <span className="ml-2 font-mono text-base text-ink-soft">
      (≈ {text} {unit})
    </span>
  );
}

/** Which unit the readings of a measured characteristic are typed in: its own, or another of its quantity. */
function UnitChoice({ char }: { char: FormCharacteristic }) {
  const id = useId();
  const { units, setUnit } = useFormState();
  const others = alternativesOf(char.unit);
  if (char.kind !== 'variable' || !char.unit || !others.length) return null;
  return (
    <span className="inline-flex items-center gap-2">
      <label htmlFor={id} className="text-base text-ink-soft">
        {t('form.typeIn')}
      </label>
      <select
        id={id}
        value={units[char.code] ?? char.unit}
        onChange={(e) => setUnit(char.code, e.target.value)}
        className="h-11 rounded-control border-2 border-rule-strong bg-field px-2 font-mono text-lg text-ink hover:border-ink-soft floor:h-12"
      >
        <option value={char.unit}>{t('form.rulesUnit', { unit: char.unit })}</option>
        {others.map((u) => (
          <option key={u.symbol} value={u.symbol}>
            {u.symbol}
          </option>
        ))}
      </select>
    </span>
  );
}

function DerivedList({ cells, within, source }: { cells: DerivedCell[]; within: string; source?: FormCharacteristic }) {
  if (!cells.length) return null;
  return (
    <div className="flex flex-wrap gap-x-6 gap-y-1">
      {cells.map((d) => (
        <DerivedValue
          key={`${d.char.code}@${d.position.code}`}
          cell={d}
          label={
            within && within === d.position.label
              ? source
                ? shortName(d.char, source)
                : d.char.name
              : within
                ? `${d.char.name}, ${shortLabel(d.position, within)}`
                : d.position.code === ''
                  ? d.char.name
                  : `${d.char.name}, ${d.position.label}`
          }
        />
      ))}
    </div>
  );
}

// a card narrower than 27rem (two banks on a portrait tablet) puts its derived values under each row

function CylinderCardView({ card, source }: { card: CylinderCard; source: FormCharacteristic }) {
  const derivedCols = [...new Set([...card.rowDerived.values()].flat().map((d) => d.char))];
  const hasRows = card.depths.some(Boolean);
  const inputs = `${hasRows ? '4.25rem ' : ''}repeat(${card.axes.length}, minmax(5.5rem, 1fr))`;
  const style = {
    '--narrow': inputs,
    '--wide': `${inputs}${derivedCols.map(() => ' 7.25rem').join('')}`,
  } as CSSProperties;
  return (
    <div
      role="group"
      aria-label={card.label}
      className="@container rounded-control border border-rule-strong bg-card px-3 py-2.5"
    >
      <div className="mb-1.5 flex flex-wrap items-baseline justify-between gap-x-4">
        <p className="text-lg font-semibold">{card.label}</p>
        {card.derived.map((d) => (
          <DerivedValue key={d.char.code} cell={d} label={shortName(d.char, source)} />
        ))}
      </div>
      <div
        className="grid grid-cols-(--narrow) items-start gap-x-2 gap-y-1 @min-[27rem]:grid-cols-(--wide)"
        style={style}
      >
        {hasRows && <span />}
        {card.axes.map((a) => (
          <span key={a} className="text-sm font-semibold uppercase tracking-wide text-ink-soft">
            {headerOf(a)}
          </span>
        ))}
        {derivedCols.map((c) => (
          <span
            key={c.code}
            className="hidden max-w-24 text-sm font-semibold leading-tight text-ink-soft @min-[27rem]:block"
          >
            {shortName(c, source)}
          </span>
        ))}
        {card.depths.map((depth) => (
          <Row key={depth} card={card} depth={depth} showDepth={hasRows} derivedCols={derivedCols} source={source} />
        ))}
      </div>
    </div>
  );
}

function Row({
  card,
  depth,
  showDepth,
  derivedCols,
  source,
}: {
  card: CylinderCard;
  depth: string;
  showDepth: boolean;
  derivedCols: FormCharacteristic[];
  source: FormCharacteristic;
}) {
  const derived = card.rowDerived.get(depth) ?? [];
  return (
    <>
      {showDepth && <span className="pt-3.5 pr-1 text-base font-medium">{headerOf(depth)}</span>}
      {card.axes.map((axis) => {
        const slot = card.cell(depth, axis);
        return slot ? <ReadingBox key={axis} slot={slot} /> : <span key={axis} />;
      })}
      {derivedCols.map((c) => {
        const cell = derived.find((d) => d.char.code === c.code);
        return (
          <div
            key={c.code}
            className={`col-span-full -mt-1 mb-1 @min-[27rem]:col-span-1 @min-[27rem]:mt-0 @min-[27rem]:mb-0 @min-[27rem]:pt-3 @min-[27rem]:pl-0 ${showDepth ? 'pl-[4.75rem]' : ''}`}
          >
            {cell ? <DerivedValue cell={cell} label={shortName(c, source)} labelClass="@min-[27rem]:hidden" /> : null}
          </div>
        );
      })}
    </>
  );
}

function GroupCardView({ card, source }: { card: GroupCard; source: FormCharacteristic }) {
  const cols = card.slots.length >= 6 ? 'grid-cols-3' : card.slots.length === 4 ? 'grid-cols-2' : 'grid-cols-2';
  return (
    <div role="group" aria-label={card.label} className="rounded-control border border-rule-strong bg-card px-3 py-2.5">
      <p className="mb-1.5 text-lg font-semibold">{card.label}</p>
      <div className={`grid gap-x-2 gap-y-1 ${cols}`}>
        {card.slots.map((s) => (
          <ReadingBox key={s.key} slot={s} label={shortLabel(s.position, card.label)} />
        ))}
      </div>
      {card.derived.length > 0 && (
        <div className="mt-1 border-t border-rule pt-2">
          <DerivedList cells={card.derived} within={card.label} source={source} />
        </div>
      )}
    </div>
  );
}

function RowView({ slots, unit: own }: { slots: Slot[]; unit: string | null }) {
  const { units } = useFormState();
  const unit = (slots[0] && units[slots[0].char.code]) ?? own;
  if (slots.length === 1 && slots[0]!.position.code === '') {
    return (
      <div className="flex max-w-xs items-start gap-2">
        <div className="flex-1">
          <ReadingBox slot={slots[0]!} />
        </div>
        {unit && <span className="pt-3.5 font-mono text-lg text-ink-soft">{unit}</span>}
      </div>
    );
  }
  return (
    <div className="grid grid-cols-[repeat(auto-fill,minmax(9.5rem,1fr))] gap-x-3 gap-y-1">
      {slots.map((s) => (
        <ReadingBox key={s.key} slot={s} label={s.position.label} />
      ))}
    </div>
  );
}

function Body({ section }: { section: Section }) {
  const { char, layout } = section;
  if (!layout) return null;
  switch (layout.kind) {
    case 'banks': {
      const two = layout.banks.length > 1;
      return (
        <div className="flex flex-col gap-3">
          <div className={`grid gap-4 ${two ? 'md:grid-cols-2' : ''}`}>
            {layout.banks.map((bank) => (
              <div key={bank.label} role={bank.label ? 'group' : undefined} aria-label={bank.label || undefined}>
                {bank.label && (
                  <p className="mb-2 text-lg font-semibold">
                    {bank.label}{' '}
                    <span className="font-normal text-ink-soft">
                      · cylinders {bank.cards[0]!.cylinder}–{bank.cards.at(-1)!.cylinder}
                    </span>
                  </p>
                )}
                <div
                  className={two ? 'flex flex-col gap-3' : 'grid grid-cols-[repeat(auto-fill,minmax(27rem,1fr))] gap-3'}
                >
                  {bank.cards.map((c) => (
                    <CylinderCardView key={c.cylinder} card={c} source={char} />
                  ))}
                </div>
              </div>
            ))}
          </div>
          <DerivedList cells={layout.derived} within="" />
        </div>
      );
    }
    case 'groups':
      return (
        <div className="flex flex-col gap-3">
          <div className="grid grid-cols-[repeat(auto-fill,minmax(19rem,1fr))] gap-3">
            {layout.cards.map((c) => (
              <GroupCardView key={c.label} card={c} source={char} />
            ))}
          </div>
          <DerivedList cells={layout.derived} within="" />
        </div>
      );
    case 'row':
      return (
        <div className="flex flex-col gap-3">
          {layout.slots.length > 0 && <RowView slots={layout.slots} unit={char.unit} />}
          <DerivedList cells={layout.derived} within="" />
        </div>
      );
  }
}

/** One characteristic: its name and limits above, then its boxes laid out like the part. */
export function ReadingSection({ section, slots, gauge }: { section: Section; slots: Slot[]; gauge?: ReactNode }) {
  const id = useId();
  const { char, companions } = section;
  const mine = slots.filter((s) => s.char.code === char.code);
  return (
    <section aria-labelledby={id} className="rounded-card border border-rule bg-card shadow-card">
      <header className="flex flex-col gap-1 border-b border-rule px-5 py-3">
        <div className="flex flex-wrap items-baseline justify-between gap-x-6 gap-y-1">
          <h3 id={id} className="flex flex-wrap items-center gap-2 text-xl font-semibold">
            {char.name}
            {char.critical && <Badge tone="hold">{t('cue.critical')}</Badge>}
            {char.optional && <Badge tone="neutral">{t('cue.optional')}</Badge>}
          </h3>
          <div className="flex flex-wrap items-center gap-x-6 gap-y-2">
            <Limits char={char} />
            <UnitChoice char={char} />
            {gauge}
          </div>
        </div>
        {companions.length > 0 && (
          <p className="flex flex-wrap gap-x-5 text-ink-soft">
            {companions.map((c) => (
              <span key={c.code}>
                {c.name} <span className="font-mono font-semibold text-ink">{limitsText(c) ?? 'no rule'}</span>
              </span>
            ))}
          </p>
        )}
        {'help' in char && typeof char.help === 'string' && char.help && <p className="text-ink-soft">{char.help}</p>}
      </header>
      <div className="px-5 py-4">
        {char.kind === 'attribute' ? (
          <div className="flex flex-col gap-4">
            {mine.map((s) => (
              <CheckTiles key={s.key} slot={s} />
            ))}
          </div>
        ) : (
          <Body section={section} />
        )}
      </div>
    </section>
  );
}
