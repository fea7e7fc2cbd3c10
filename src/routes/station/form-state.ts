import { createContext, useContext } from 'react';
import type { EntryUnits, Judged, SlotValue } from './readings';

/** What every box of the form reads while the operator types: the live verdicts and the notes on each box. */
export type FormState = {
  judged: Judged;
  values: SlotValue[];
  /** Notes on boxes, keyed `characteristic@position` (also `gauge`, `notes`): from the last submit. */
  problems: Record<string, string>;
  /** A submit was tried: empty boxes now say they are missing. */
  attempted: boolean;
  clearProblem: (key: string) => void;
  /** The unit each measured characteristic is being typed in (its own unless the operator chose another). */
  units: EntryUnits;
  /** Types a characteristic in another unit of its quantity (remembered for the person). */
  setUnit: (code: string, unit: string) => void;
};

export const FormStateContext = createContext<FormState | null>(null);

export function useFormState(): FormState {
  const s = useContext(FormStateContext);
  if (!s) throw new Error('useFormState outside the station form');
  return s;
}
