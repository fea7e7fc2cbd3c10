import type { DefectCode } from '../../api/defect-codes/defect-codes';
import type { Option } from '../../components/ui/select';

const label = (d: DefectCode) => `${d.code} — ${d.description}`;

/** For raising a concern: only the codes still in use. */
export const activeDefectOptions = (codes: DefectCode[]): Option[] =>
  codes.filter((d) => d.active).map((d) => ({ value: d.code, label: label(d) }));

/** For finding NCRs: every code, since old NCRs still name the retired ones. */
export const allDefectOptions = (codes: DefectCode[]): Option[] =>
  codes.map((d) => ({ value: d.code, label: d.active ? label(d) : `${label(d)} (retired)` }));

export const defectDescription = (codes: DefectCode[] | undefined, code: string | null | undefined) =>
  codes?.find((d) => d.code === code)?.description;
